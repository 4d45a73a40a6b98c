import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { deriveSmallSignal, qesWithSeries } from '../src/engine/driver.ts';
import { airAt } from '../src/engine/air.ts';

const air = airAt(20);

describe('T/S derivation (Thiele 1971, Small 1972 relations)', () => {
  it('derives fs, Qes, Qms and Vas from the mechanical set by the published formulas', () => {
    const re = 6;
    const sd = 0.013;
    const bl = 7;
    const mms = 0.02;
    const cms = 0.8e-3;
    const rms = 1.5;
    const { values, issues } = deriveSmallSignal({ bl, mms, cms, rms }, re, sd, air);
    expect(issues).toEqual([]);
    const ws = 1 / Math.sqrt(mms * cms);
    expect(values!.fs).toBeCloseTo(ws / (2 * Math.PI), 9);
    expect(values!.qes).toBeCloseTo((ws * mms * re) / (bl * bl), 9);
    expect(values!.qms).toBeCloseTo((ws * mms) / rms, 9);
    expect(values!.vas).toBeCloseTo(air.rho * air.c ** 2 * sd * sd * cms, 12);
  });

  it('round-trips random T/S sets through the mechanical parameters (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 15, max: 200, noNaN: true }),
        fc.double({ min: 0.15, max: 2, noNaN: true }),
        fc.double({ min: 1, max: 20, noNaN: true }),
        fc.double({ min: 0.002, max: 0.3, noNaN: true }),
        fc.double({ min: 2, max: 16, noNaN: true }),
        fc.double({ min: 0.002, max: 0.1, noNaN: true }),
        (fs, qes, qms, vas, re, sd) => {
          const a = deriveSmallSignal({ fs, qes, qms, vas }, re, sd, air).values!;
          const b = deriveSmallSignal({ bl: a.bl, mms: a.mms, cms: a.cms, rms: a.rms }, re, sd, air).values!;
          for (const [x, y] of [
            [fs, b.fs],
            [qes, b.qes],
            [qms, b.qms],
            [vas, b.vas],
          ]) {
            expect(Math.abs(y / x - 1)).toBeLessThan(1e-9);
          }
        },
      ),
      { seed: 20261201, numRuns: 300 },
    );
  });

  it('solves mixed subsets that need simultaneous equations (Qes, Bl, Vas, Qms)', () => {
    const full = deriveSmallSignal({ fs: 40, qes: 0.4, qms: 4, vas: 0.03 }, 6, 0.013, air).values!;
    const mixed = deriveSmallSignal({ qes: full.qes, bl: full.bl, vas: full.vas, qms: full.qms }, 6, 0.013, air).values!;
    expect(mixed.fs).toBeCloseTo(40, 9);
  });

  it('refuses an insufficient set and names what to give', () => {
    const r = deriveSmallSignal({ fs: 40, qes: 0.4, qms: 4 }, 6, 0.013, air);
    expect(r.values).toBeNull();
    expect(r.issues[0].message).toMatch(/not enough driver parameters.*fs_hz, qes, qms/);
  });

  it('names the quantities of an over-determined set that disagree, with the size of the disagreement', () => {
    const good = deriveSmallSignal({ fs: 40, qes: 0.4, qms: 4, vas: 0.03 }, 6, 0.013, air).values!;
    const r = deriveSmallSignal({ fs: 40, qes: 0.4, qms: 4, vas: 0.03, bl: good.bl * 1.2 }, 6, 0.013, air);
    expect(r.values).toBeNull();
    const bl = r.issues.find((i) => i.path === 'driver.bl_tm')!;
    expect(bl.severity).toBe('error');
    expect(bl.message).toMatch(/\+20\.0%/);
  });

  it('reconciles datasheet rounding (under 5%) with a warning', () => {
    const good = deriveSmallSignal({ fs: 40, qes: 0.4, qms: 4, vas: 0.03 }, 6, 0.013, air).values!;
    const r = deriveSmallSignal({ fs: 40, qes: 0.4, qms: 4, vas: 0.03, mms: good.mms * 1.02 }, 6, 0.013, air);
    expect(r.values).not.toBeNull();
    expect(r.issues.every((i) => i.severity === 'warning')).toBe(true);
    expect(r.values!.mms / good.mms).toBeGreaterThan(1);
    expect(r.values!.mms / good.mms).toBeLessThan(1.02);
  });

  it('raises Qes with series resistance: Qes·(Re + Rs)/Re (Small 1972)', () => {
    expect(qesWithSeries(0.4, 6, 0.6)).toBeCloseTo(0.44, 12);
  });
});
