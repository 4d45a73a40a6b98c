// A- and C-weighting against the nominal values of IEC 61672-1:2013 (table given to 0.1 dB).
import { describe, expect, it } from 'vitest';
import { aWeightingDb, aWeightingFilter, cWeightingDb, cWeightingFilter } from '../src/engine/level/weighting.ts';
import { cascadeResponse } from '../src/engine/filters/biquad.ts';

// Nominal band centres; the standard evaluates at the exact base-ten frequencies 1000·10^(n/10).
const F = [-15, -12, -9, -6, -3, 0, 3, 6, 9, 12].map((n) => 1000 * 10 ** (n / 10));
const A = [-39.4, -26.2, -16.1, -8.6, -3.2, 0, 1.2, 1.0, -1.1, -6.6];
const C = [-3.0, -0.8, -0.2, 0.0, 0.0, 0, -0.2, -0.8, -3.0, -8.5];

const digitalDb = (f: (fs: number) => { coef: Float64Array; gain: number }, freq: number, fs: number) => {
  const c = f(fs);
  const [re, im] = cascadeResponse(c.coef, c.gain, freq, fs);
  return 20 * Math.log10(Math.hypot(re, im));
};

describe('frequency weightings (IEC 61672-1)', () => {
  it('analytic C and A match the table to its rounding', () => {
    F.forEach((f, k) => {
      expect(Math.abs(cWeightingDb(f) - C[k])).toBeLessThan(0.06);
      expect(Math.abs(aWeightingDb(f) - A[k])).toBeLessThan(0.06);
    });
  });
  it('digital weightings at 44.1/48 kHz within 0.15 dB of the table to 8 kHz (0.7 dB at 16 kHz); at 96 kHz within 0.15 dB everywhere', () => {
    F.forEach((f, k) => {
      // The table is rounded to 0.1 dB: 0.05 of each tolerance is the table's own.
      const tol = f <= 8100 ? 0.15 : 0.7;
      for (const fs of [44100, 48000]) {
        expect(Math.abs(digitalDb(cWeightingFilter, f, fs) - C[k])).toBeLessThan(tol);
        expect(Math.abs(digitalDb(aWeightingFilter, f, fs) - A[k])).toBeLessThan(tol);
      }
      expect(Math.abs(digitalDb(cWeightingFilter, f, 96000) - C[k])).toBeLessThan(0.15);
      expect(Math.abs(digitalDb(aWeightingFilter, f, 96000) - A[k])).toBeLessThan(0.15);
    });
  });
});
