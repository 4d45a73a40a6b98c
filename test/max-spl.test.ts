// Max SPL vs frequency with every limit: cone Xmax, port air speed (17 m/s, common practice, no
// source), radiator travel, the amplifier's rail, and the coil at its rated temperature, all with
// the coil at its thermal equilibrium at that drive. The reference checks here are independent of
// the code's iteration: the limiting quantity at the reported drive equals its limit once the
// coil's steady-state rise (ΔT = P·(Rtv + Rtm), two-node network, Henricksen 1987 via REFERENCES)
// is put back in, and in the passband the hot coil costs 10·log10(Re_hot/Re) against a cold-coil
// figure at the same coil power (voltage drive: force ∝ current, P = I²·R).
import { describe, expect, it } from 'vitest';
import { maxSine } from '../src/engine/response/analyze.ts';
import { respond } from '../src/engine/response/frequency.ts';
import type { DriverWay } from '../src/engine/system.ts';
import { exampleSystem } from './helpers/audio-bench.ts';

const hot = (way: DriverWay, rise: number): DriverWay => ({
  ...way,
  driver: { ...way.driver, re: way.driver.re * (1 + way.driver.thermal.alphaR * rise) },
});

/** The coil's steady rise at `v` V rms, solved here by bisection on ΔT = P(ΔT)·Rth. */
function riseAt(sys: ReturnType<typeof exampleSystem>, way: DriverWay, f: number, v: number): number {
  const rth = way.driver.thermal.rtv + way.driver.thermal.rtm;
  const g = (t: number) => {
    const w = hot(way, t);
    const i = respond(sys, w, f, v).current;
    return Math.hypot(i.re, i.im) ** 2 * w.driver.re * rth - t;
  };
  let lo = 0,
    hi = 2000;
  for (let k = 0; k < 80; k++) {
    const mid = (lo + hi) / 2;
    if (g(mid) > 0) lo = mid;
    else hi = mid;
  }
  return lo;
}

describe('max SPL vs frequency', () => {
  it('the vented example at fb is limited by its port at 17 m/s, below the old cold-coil thermal figure', () => {
    const sys = exampleSystem('vented');
    const way = sys.ways[0] as DriverWay;
    const m = maxSine(sys, way, 40);
    expect(m.limit).toBe('port');
    const rise = riseAt(sys, way, 40, m.v);
    const r = respond(sys, hot(way, rise), 40, m.v);
    // Port air speed, peak: |U|·√2 / (total port area); the example has one 6 cm port.
    const area = Math.PI * 0.03 ** 2;
    expect((Math.SQRT2 * Math.hypot(r.outletFlow.re, r.outletFlow.im)) / area).toBeCloseTo(17, 1);
    // The seat pressure reported is that drive's, hot coil included.
    expect(m.pa / Math.hypot(r.pressure.re, r.pressure.im)).toBeCloseTo(1, 3);
    // Cone excursion is still under Xmax there.
    expect(Math.SQRT2 * Math.hypot(r.excursion.re, r.excursion.im)).toBeLessThan(way.driver.xmax);
  });

  it('in the passband the coil limits at its rated temperature, hot-coil compression included', () => {
    const sys = exampleSystem('sealed');
    const way = sys.ways[0] as DriverWay;
    const d = way.driver;
    const f = 500;
    const m = maxSine(sys, way, f);
    expect(m.limit).toBe('thermal');
    const riseMax = d.thermal.coilMaxC - sys.air.temperatureC;
    expect(riseAt(sys, way, f, m.v)).toBeCloseTo(riseMax, 1);
    // Against the cold coil holding the same power in its resistance: 10·log10(Re_hot/Re) lower.
    const cold = respond(sys, way, f, 1);
    const pCold = Math.hypot(cold.current.re, cold.current.im) ** 2 * d.re;
    const powerAtRating = riseMax / (d.thermal.rtv + d.thermal.rtm);
    const paCold = Math.hypot(cold.pressure.re, cold.pressure.im) * Math.sqrt(powerAtRating / pCold);
    const compression = 20 * Math.log10(paCold / m.pa);
    expect(compression).toBeCloseTo(10 * Math.log10(1 + d.thermal.alphaR * riseMax), 1);
  });

  it('below the box tuning the cone limits, and every limit holds at the reported drive', () => {
    for (const kind of ['vented', 'sealed'] as const) {
      const sys = exampleSystem(kind);
      const way = sys.ways[0] as DriverWay;
      for (const f of [15, 25, 60, 120, 300]) {
        const m = maxSine(sys, way, f);
        const rise = riseAt(sys, way, f, m.v);
        const r = respond(sys, hot(way, rise), f, m.v);
        const x = Math.SQRT2 * Math.hypot(r.excursion.re, r.excursion.im);
        expect(x).toBeLessThanOrEqual(way.driver.xmax * 1.001);
        expect(rise).toBeLessThanOrEqual(way.driver.thermal.coilMaxC - sys.air.temperatureC + 0.1);
        if (m.limit === 'excursion') expect(x / way.driver.xmax).toBeCloseTo(1, 3);
        if (f === 15) expect(m.limit).toBe('excursion');
      }
    }
  });
});
