// The woofer model against a general-purpose ODE solver: odex (Hairer & Wanner's ODEX,
// Gragg-Bulirsch-Stoer extrapolation, from npm) integrates the same published large-signal
// equations at tight tolerance ("Tutorial: Loudspeaker Nonlinearities", JAES 54 (2006), with the
// box/port of Small 1973 and the port loss of Backman, AES 1995). A tone burst drives the cone to
// twice Xmax; the renderer's fixed-step excursion and seat pressure must agree within 0.5% RMS.
import { describe, expect, it } from 'vitest';
import { wooferParams } from '../src/engine/sim/params.ts';
import { WooferSim } from '../src/engine/sim/woofer.ts';
import { sealedBox, system, ventedBox, radiatorBox, wooferOf } from './sim-fixtures.ts';
import { BOX_KINDS } from '../src/engine/box/index.ts';
import type { Box } from '../src/engine/system.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';
import { rhs, Solver, stateCount } from './sim-odex-model.ts';

function compare(sys: SpeakerSystem, fs: number, f: number, peakVolts: number) {
  const way = wooferOf(sys);
  const p = wooferParams(sys, way, 1 / fs);
  const dur = 0.25;
  // Hann-windowed burst: smooth start and end, so both solvers see the same continuous drive.
  const u = (t: number) => (t < dur ? peakVolts * Math.sin(Math.PI * (t / dur)) ** 2 * Math.sin(2 * Math.PI * f * t) : 0);
  const n = Math.round(fs * 0.3);
  const sim = new WooferSim(p);
  const xs = new Float64Array(n),
    ps = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    ps[k] = sim.step(u(k / fs));
    xs[k] = sim.x;
  }
  const { f: f0, dU } = rhs(sys, way, u);
  const nState = stateCount(way);
  const solver = new Solver(nState);
  solver.absoluteTolerance = 1e-12;
  solver.relativeTolerance = 1e-10;
  solver.denseOutput = true;
  solver.maxSteps = 1e7;
  const xr = new Float64Array(n),
    pr = new Float64Array(n);
  let k = 0;
  solver.solve(
    f0,
    0,
    new Array(nState).fill(0),
    (n - 1) / fs,
    solver.grid(1 / fs, (t: number, y: number[]) => {
      if (k >= n) return;
      const dy = f0(t, y);
      // Seat pressure rho/(Omega r)·dU/dt.
      xr[k] = y[1];
      pr[k] = p.kOut * dU(dy);
      k++;
    }),
  );
  const rmsErr = (a: Float64Array, b: Float64Array) => {
    let e = 0,
      s = 0;
    for (let j = 0; j < n; j++) {
      e += (a[j] - b[j]) ** 2;
      s += b[j] ** 2;
    }
    return Math.sqrt(e / s);
  };
  let peak = 0;
  for (const x of xr) peak = Math.max(peak, Math.abs(x));
  return { xErr: rmsErr(xs, xr), pErr: rmsErr(ps, pr), peakMm: peak * 1000 };
}

/** A bandpass box for the fixture's woofer, built by its kind (rear 18 l, front 12 l at 50 Hz, QL 7). */
function bandpassBox(): Box {
  const { driver } = wooferOf(system(sealedBox(), { d: { leMh: 0.6, xmaxMm: 5, xlimMm: 15 } }));
  const built = BOX_KINDS.bandpass4.build(
    { type: 'bandpass4', vb_rear_l: 18, vb_front_l: 12, fb_hz: 50, ql: 7, ports: [{ diameter_cm: 7 }] },
    { air: system(sealedBox()).air, driver, rs: 0.05 },
    'box',
  );
  if (!built.box) throw new Error(JSON.stringify(built.issues));
  return built.box;
}

describe('large-signal model against odex at tight tolerance', () => {
  const cases = [
    ['sealed', sealedBox(14, 8), 35, 39],
    ['vented', ventedBox(28, 38, 7), 25, 34],
    ['passive radiator', radiatorBox(), 25, 35],
    ['bandpass (4th order)', bandpassBox(), 45, 62],
  ] as const;
  for (const [name, box, f, volts] of cases) {
    it(`${name}: ${f} Hz burst to about twice Xmax, 48 kHz`, () => {
      // Xlim at 3x Xmax so the end stop (not an ODE) stays out of reach.
      const sys = system(box, { d: { leMh: 0.6, xmaxMm: 5, xlimMm: 15 } });
      const r = compare(sys, 48000, f, volts);
      expect(r.peakMm).toBeGreaterThan(9);
      expect(r.peakMm).toBeLessThan(12);
      expect(r.xErr).toBeLessThan(0.005);
      expect(r.pErr).toBeLessThan(0.005);
    });
  }
});
