// The fourth-order bandpass box against our own analytic transfer function of its acoustic circuit
// (driver between a sealed rear chamber Cr and a front chamber Cf vented by a port of mass Map;
// only the port radiates; Thiele/Small lumped elements as in Small, JAES 1972/1973), written here
// with plain complex arithmetic, independent of the engine's code. And the large-signal model at low
// drive against the same curve (0.1 dB).
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../src/engine/design/validate.ts';
import { respond } from '../src/engine/response/frequency.ts';
import { wooferParams } from '../src/engine/sim/params.ts';
import { WooferSim } from '../src/engine/sim/woofer.ts';
import type { DriverWay } from '../src/engine/system.ts';

const design = {
  format: 'preheard-design',
  version: 2,
  name: 'bandpass test',
  ways: [
    {
      kind: 'driver',
      name: 'woofer',
      driver: { fs_hz: 32, qes: 0.4, qms: 4, vas_l: 60, re_ohm: 6, sd_cm2: 210, xmax_mm: 8, xlim_mm: 14, pe_w: 150 },
      box: { type: 'bandpass4', vb_rear_l: 25, vb_front_l: 15, fb_hz: 60, ql: null, ports: [{ diameter_cm: 8 }] },
    },
  ],
  amplifier: { power_w: 200, load_ohm: 8, rs_ohm: 0 },
  listening: { distance_m: 1, space: 'half' },
  air: { temperature_c: 20, pressure_kpa: 101.325 },
};

type C = [number, number];
const cadd = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]];
const cmul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const cdiv = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};
const cabs = (a: C) => Math.hypot(a[0], a[1]);

/** Seat pressure per volt (rms) of the lossless bandpass circuit, derived by hand from T/S values. */
function analytic(f: number): number {
  const rho = 101325 / (287.05 * 293.15);
  const c = 331.3 * Math.sqrt(1 + 20 / 273.15);
  const kappa = rho * c * c;
  const sd = 210e-4,
    fs = 32,
    qes = 0.4,
    qms = 4,
    re = 6;
  const cms = 0.06 / (kappa * sd * sd);
  const mms = 1 / ((2 * Math.PI * fs) ** 2 * cms);
  const bl = Math.sqrt((2 * Math.PI * fs * mms * re) / qes);
  const rms = (2 * Math.PI * fs * mms) / qms;
  const cr = 0.025 / kappa,
    cf = 0.015 / kappa;
  const map = 1 / ((2 * Math.PI * 60) ** 2 * cf);
  const w = 2 * Math.PI * f;
  const jw: C = [0, w];
  const zr = cdiv([1, 0], cmul(jw, [cr, 0]));
  const zf = cdiv([1, 0], cadd(cmul(jw, [cf, 0]), cdiv([1, 0], cmul(jw, [map, 0]))));
  // Mechanical impedance of the cone with both chambers: Zm + Sd^2·(Zr + Zf).
  const zm = cadd([rms, w * mms - 1 / (w * cms)], cmul([sd * sd, 0], cadd(zr, zf)));
  const v = cdiv([bl, 0], cadd(cmul([re, 0], zm), [bl * bl, 0]));
  // Port volume velocity: pf/(jw·Map) with pf = Zf·Sd·v; p = jw·rho·U/(2 pi r).
  const up = cdiv(cmul(zf, cmul([sd, 0], v)), cmul(jw, [map, 0]));
  return cabs(cmul(jw, up)) * (rho / (2 * Math.PI));
}

describe('bandpass4 box', () => {
  const parsed = parseDesign(design);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
  const sys = parsed.system;
  const way = sys.ways[0] as DriverWay;

  it('small-signal SPL equals the analytic circuit within 0.01 dB from 15 Hz to 400 Hz', () => {
    for (const f of [15, 25, 40, 60, 80, 120, 200, 400]) {
      const engine = 20 * Math.log10(Math.hypot(respond(sys, way, f, 1).pressure.re, respond(sys, way, f, 1).pressure.im));
      expect(engine).toBeCloseTo(20 * Math.log10(analytic(f)), 2);
    }
  });

  it('has no cone radiation and a band-pass shape: 12 dB/octave on each side of the passband', () => {
    const r = respond(sys, way, 60, 1);
    expect(Math.hypot(r.conePressure.re, r.conePressure.im)).toBe(0);
    const lo = 20 * Math.log10(analytic(10) / analytic(5));
    const hi = 20 * Math.log10(analytic(1600) / analytic(800));
    expect(lo).toBeCloseTo(12.04, 0);
    expect(hi).toBeCloseTo(-12.04, 0);
  });

  it('large-signal model at low drive matches the small-signal curve within 0.1 dB', () => {
    const rate = 48000;
    for (const f of [30, 60, 110]) {
      const sim = new WooferSim(wooferParams(sys, way, 1 / rate));
      const n = rate * 2;
      const u = new Float64Array(n),
        p = new Float64Array(n),
        x = new Float64Array(n);
      const amp = 0.01 * Math.SQRT2;
      for (let k = 0; k < n; k++) u[k] = amp * Math.sin((2 * Math.PI * f * k) / rate);
      sim.processBlock(u, n, p, x);
      // Steady state: rms over the last whole periods.
      const periods = Math.floor((0.5 * rate * f) / rate);
      const len = Math.round((periods * rate) / f);
      let e = 0;
      for (let k = n - len; k < n; k++) e += p[k] * p[k];
      const rendered = 20 * Math.log10(Math.sqrt(e / len));
      const curve = 20 * Math.log10(0.01 * analytic(f));
      expect(Math.abs(rendered - curve)).toBeLessThan(0.1);
    }
  });
});
