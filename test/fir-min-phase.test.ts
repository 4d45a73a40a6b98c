// The cepstral minimum-phase spectrum against biquads whose minimum-phase response is known in
// closed form: a peaking and a low-shelf section (RBJ Audio EQ Cookbook formulas) with poles and
// zeros inside the unit circle are minimum phase, so their own phase is the answer.
import { describe, expect, it } from 'vitest';
import { minimumPhaseSpectrum } from '../src/engine/fir/min-phase.ts';

type Biquad = [number, number, number, number, number]; // b0 b1 b2 a1 a2 (a0 = 1)

function peaking(f0: number, q: number, gainDb: number, fs: number): Biquad {
  const a = 10 ** (gainDb / 40);
  const w0 = (2 * Math.PI * f0) / fs;
  const alpha = Math.sin(w0) / (2 * q);
  const a0 = 1 + alpha / a;
  return [(1 + alpha * a) / a0, (-2 * Math.cos(w0)) / a0, (1 - alpha * a) / a0, (-2 * Math.cos(w0)) / a0, (1 - alpha / a) / a0];
}

function lowShelf(f0: number, gainDb: number, fs: number): Biquad {
  const a = 10 ** (gainDb / 40);
  const w0 = (2 * Math.PI * f0) / fs;
  const alpha = Math.sin(w0) / Math.SQRT2; // shelf slope S = 1
  const c = Math.cos(w0);
  const sq = 2 * Math.sqrt(a) * alpha;
  const a0 = a + 1 + (a - 1) * c + sq;
  return [
    (a * (a + 1 - (a - 1) * c + sq)) / a0,
    (2 * a * (a - 1 - (a + 1) * c)) / a0,
    (a * (a + 1 - (a - 1) * c - sq)) / a0,
    (-2 * (a - 1 + (a + 1) * c)) / a0,
    (a + 1 + (a - 1) * c - sq) / a0,
  ];
}

/** H(e^{jw}) of a biquad. */
function response([b0, b1, b2, a1, a2]: Biquad, w: number): [number, number] {
  const zr = (k: number) => Math.cos(-k * w);
  const zi = (k: number) => Math.sin(-k * w);
  const nr = b0 + b1 * zr(1) + b2 * zr(2);
  const ni = b1 * zi(1) + b2 * zi(2);
  const dr = 1 + a1 * zr(1) + a2 * zr(2);
  const di = a1 * zi(1) + a2 * zi(2);
  const d = dr * dr + di * di;
  return [(nr * dr + ni * di) / d, (ni * dr - nr * di) / d];
}

describe('minimum phase by the real cepstrum', () => {
  const fs = 48000;
  const n = 1 << 14;
  for (const [name, bq] of [
    ['peaking +9 dB at 1 kHz, Q 2', peaking(1000, 2, 9, fs)],
    ['peaking -12 dB at 80 Hz, Q 1.4', peaking(80, 1.4, -12, fs)],
    ['low shelf +6 dB at 200 Hz', lowShelf(200, 6, fs)],
  ] as const) {
    it(`${name}: within 0.1 dB and 2° from 20 Hz to 20 kHz`, () => {
      const mag = Float64Array.from({ length: n / 2 + 1 }, (_, k) => Math.hypot(...response(bq, (2 * Math.PI * k) / n)));
      const h = minimumPhaseSpectrum(mag);
      let worstDb = 0;
      let worstDeg = 0;
      for (let k = 1; k <= n / 2; k++) {
        const f = (k * fs) / n;
        if (f < 20 || f > 20000) continue;
        const [re, im] = response(bq, (2 * Math.PI * k) / n);
        worstDb = Math.max(worstDb, Math.abs(20 * Math.log10(Math.hypot(h.re[k], h.im[k]) / Math.hypot(re, im))));
        let d = ((Math.atan2(h.im[k], h.re[k]) - Math.atan2(im, re)) * 180) / Math.PI;
        d = ((d + 540) % 360) - 180;
        worstDeg = Math.max(worstDeg, Math.abs(d));
      }
      expect(worstDb).toBeLessThan(0.1);
      expect(worstDeg).toBeLessThan(2);
      // Not trivially zero: the section really turns the phase.
      const [re, im] = response(
        bq,
        (2 * Math.PI * Math.round((name.includes('1 kHz') ? 900 : name.includes('80') ? 70 : 150) * (n / fs))) / n,
      );
      expect(Math.abs(Math.atan2(im, re))).toBeGreaterThan(0.05);
    });
  }
});
