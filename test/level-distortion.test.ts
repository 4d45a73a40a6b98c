// The distortion and compression measures behind the `distortion` and output `compression` events,
// checked on y = x + a·x^3, whose Fourier expansion is known in closed form: for x = A·sin(wt),
// a·x^3 = a·A^3·(3 sin wt - sin 3wt)/4, so the third harmonic has amplitude a·A^3/4 and the
// fundamental grows by 3·a·A^3/4 (trigonometric identity sin^3 = (3 sin - sin 3)/4; any handbook of
// formulas). The fundamental's change is coherent with x (compression); only the third harmonic is
// distortion.
import { describe, expect, it } from 'vitest';
import { ResidualMeter, toneAmplitude } from '../src/engine/level/distortion.ts';

const fs = 48000,
  f = 100,
  n = 48000,
  len = fs / 2; // 50 whole periods

function meanOverLastHalf(meter: ResidualMeter, y: Float64Array, x: Float64Array, res: Float64Array) {
  const ratio = new Float64Array(n),
    loss = new Float64Array(n);
  meter.processBlock(y, x, res, n, 0, ratio, loss);
  let m = 0,
    l = 0;
  for (let k = n - len; k < n; k++) {
    m += ratio[k];
    l += loss[k];
  }
  return { ratio: m / len, lossDb: l / len };
}

describe('residual split into compression and distortion', () => {
  for (const [A, a] of [
    [1, 0.05],
    [0.8, 0.3],
    [2, -0.02],
  ] as const) {
    it(`A = ${A}, a = ${a}`, () => {
      const x = new Float64Array(n),
        y = new Float64Array(n),
        res = new Float64Array(n);
      for (let k = 0; k < n; k++) {
        x[k] = A * Math.sin((2 * Math.PI * f * k) / fs);
        res[k] = a * x[k] ** 3;
        y[k] = x[k] + res[k];
      }
      expect(toneAmplitude(res, n - len, len, 3 * f, fs)).toBeCloseTo((Math.abs(a) * A ** 3) / 4, 9);
      expect(toneAmplitude(y, n - len, len, f, fs)).toBeCloseTo(A + (3 * a * A ** 3) / 4, 9);
      const h1 = (3 * a * A ** 3) / 4,
        h3 = (a * A ** 3) / 4;
      const { ratio, lossDb } = meanOverLastHalf(new ResidualMeter(fs, 0.05), y, x, res);
      // Distortion: the third harmonic's energy over the output's, to 1 %.
      const expected = (h3 * h3) / ((A + h1) ** 2 + h3 * h3);
      expect(ratio / expected).toBeGreaterThan(0.99);
      expect(ratio / expected).toBeLessThan(1.01);
      // Compression: the fundamental's level change (positive = quieter), to 0.01 dB.
      const loss = Math.max(0, -20 * Math.log10((A + h1) / A));
      expect(lossDb).toBeCloseTo(loss, 2);
    });
  }

  it('a pure gain and phase change of a tone is compression, not distortion', () => {
    // y = 0.7·A·sin(wt - 0.6): 3.1 dB down and 34° late; the residual y - x is all coherent.
    const x = new Float64Array(n),
      y = new Float64Array(n),
      res = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      const w = (2 * Math.PI * f * k) / fs;
      x[k] = Math.sin(w);
      y[k] = 0.7 * Math.sin(w - 0.6);
      res[k] = y[k] - x[k];
    }
    const { ratio, lossDb } = meanOverLastHalf(new ResidualMeter(fs, 0.05), y, x, res);
    expect(10 * Math.log10(ratio)).toBeLessThan(-60);
    expect(lossDb).toBeCloseTo(-20 * Math.log10(0.7), 2);
  });

  it('a two-tone signal: the difference tone counts as distortion', () => {
    // x = sin(w1 t) + sin(w2 t), y = x + 0.1·x^2: x^2 holds DC, 2f1, 2f2, f1±f2 (no component at
    // f1 or f2), so the residual is incoherent: its whole energy counts.
    const x = new Float64Array(n),
      y = new Float64Array(n),
      res = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      const t = k / fs;
      x[k] = Math.sin(2 * Math.PI * 100 * t) + Math.sin(2 * Math.PI * 130 * t);
      res[k] = 0.1 * x[k] * x[k];
      y[k] = x[k] + res[k];
    }
    // Energies: x^2 = 1 + (−cos 2w1 − cos 2w2)/2 + cos(w1−w2) − cos(w1+w2): mean square
    // 1 + 1/8 + 1/8 + 1/2 + 1/2 = 2.25, times 0.01; the output's is 1 + 0.0225.
    const expected = 0.0225 / 1.0225;
    const { ratio } = meanOverLastHalf(new ResidualMeter(fs, 0.05), y, x, res);
    expect(ratio / expected).toBeGreaterThan(0.9);
    expect(ratio / expected).toBeLessThan(1.1);
  });
});
