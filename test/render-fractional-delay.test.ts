// The fractional delay behind the ways' acoustic offsets and filter delays: its frequency response
// (DFT of the impulse response) against the ideal delay e^(-j w D). An all-pass keeps every level;
// the delay is accurate in the audio band and drifts only towards the Nyquist frequency.
import { describe, expect, it } from 'vitest';
import { FractionalDelay, thiranCoefficients } from '../src/engine/render/fractional-delay.ts';

function responseAt(delay: FractionalDelay, f: number, fs: number, n = 1 << 14): { mag: number; phaseDelay: number } {
  const h = new Float64Array(n);
  h[0] = 1;
  delay.process(h, n);
  const w = (2 * Math.PI * f) / fs;
  let re = 0,
    im = 0;
  for (let k = 0; k < n; k++) {
    re += h[k] * Math.cos(w * k);
    im -= h[k] * Math.sin(w * k);
  }
  // Phase delay in samples, unwrapped near the nominal delay.
  let phase = -Math.atan2(im, re);
  const nominal = delay.samples * w;
  phase += 2 * Math.PI * Math.round((nominal - phase) / (2 * Math.PI));
  return { mag: Math.hypot(re, im), phaseDelay: phase / w };
}

describe('fractional delay', () => {
  const fs = 48000;
  it('first-order Thiran coefficient is (1 - D)/(1 + D) (Laakso et al. 1996)', () => {
    for (const d of [0.2, 0.5, 0.9, 1.3]) expect(thiranCoefficients(d, 1)[0]).toBeCloseTo((1 - d) / (1 + d), 14);
  });
  // Under 1.5 samples the all-pass is of first order and less exact: 0.04 sample at 8 kHz is 2
  // degrees of phase. From 2.5 samples on it is of third order.
  for (const d of [0.3, 0.5, 1.7, 3.5, 3.49, 12.25, 40.8]) {
    it(`${d} samples: unit magnitude and the delay within 0.002 sample to 2.2 kHz (0.005 under 1.5 samples)`, () => {
      for (const f of [50, 500, 2200, 8000]) {
        const r = responseAt(new FractionalDelay(d), f, fs);
        expect(Math.abs(20 * Math.log10(r.mag))).toBeLessThan(1e-6);
        const tol = d < 1.5 ? (f <= 2200 ? 0.005 : 0.05) : f <= 2200 ? 0.002 : 0.01;
        expect(Math.abs(r.phaseDelay - d), `${f} Hz`).toBeLessThan(tol);
      }
    });
  }
  it('a whole number of samples is an exact copy', () => {
    const x = Float64Array.from({ length: 100 }, (_, k) => Math.sin(k * 0.37) + k / 7);
    const y = x.slice();
    new FractionalDelay(5).process(y, 100);
    for (let k = 0; k < 95; k++) expect(y[k + 5]).toBe(x[k]);
    for (let k = 0; k < 5; k++) expect(y[k]).toBe(0);
  });
  it('rejects impossible delays', () => {
    expect(() => new FractionalDelay(-1)).toThrow(RangeError);
    expect(() => new FractionalDelay(Number.NaN)).toThrow(RangeError);
  });
});
