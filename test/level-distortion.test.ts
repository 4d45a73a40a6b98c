// The distortion measure behind the `distortion` stress event, checked on y = x + a·x^3, whose
// Fourier expansion is known in closed form: for x = A·sin(wt), a·x^3 = a·A^3·(3 sin wt - sin 3wt)/4,
// so the third harmonic has amplitude a·A^3/4 and the fundamental grows by 3·a·A^3/4
// (trigonometric identity sin^3 = (3 sin - sin 3)/4; any handbook of formulas).
import { describe, expect, it } from 'vitest';
import { ResidualMeter, toneAmplitude } from '../src/engine/level/distortion.ts';

describe('residual-to-output distortion measure', () => {
  const fs = 48000,
    f = 100,
    n = 48000;
  for (const [A, a] of [
    [1, 0.05],
    [0.8, 0.3],
    [2, -0.02],
  ] as const) {
    it(`A = ${A}, a = ${a}`, () => {
      const y = new Float64Array(n),
        res = new Float64Array(n);
      for (let k = 0; k < n; k++) {
        const x = A * Math.sin((2 * Math.PI * f * k) / fs);
        res[k] = a * x * x * x;
        y[k] = x + res[k];
      }
      const len = fs / 2; // 50 whole periods
      expect(toneAmplitude(res, n - len, len, 3 * f, fs)).toBeCloseTo((Math.abs(a) * A ** 3) / 4, 9);
      expect(toneAmplitude(y, n - len, len, f, fs)).toBeCloseTo(A + (3 * a * A ** 3) / 4, 9);
      // The meter's energy ratio equals the analytic one: residual (3aA^3/4, aA^3/4) over output.
      const h1 = (3 * a * A ** 3) / 4,
        h3 = (a * A ** 3) / 4;
      const expected = (h1 * h1 + h3 * h3) / ((A + h1) ** 2 + h3 * h3);
      const meter = new ResidualMeter(fs, 0.05);
      const ratio = new Float64Array(n);
      meter.processBlock(y, res, n, 0, ratio);
      // Averaged over whole periods the one-pole window ripples; the mean over the last half is exact to 1%.
      let m = 0;
      for (let k = n - len; k < n; k++) m += ratio[k];
      expect(m / len / expected).toBeGreaterThan(0.99);
      expect(m / len / expected).toBeLessThan(1.01);
    });
  }
});
