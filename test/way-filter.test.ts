// A way's active filter against the published forms, analog (the curves) and digital (the render).
// Butterworth of order n (Butterworth, "On the Theory of Filter Amplifiers", 1930):
//   |H_LP(jw)|^2 = 1/(1 + (w/w0)^2n): -3.01 dB at the corner, falling n·6.02 dB per octave far out.
// Linkwitz-Riley of order 2m = Butterworth-m squared (Linkwitz, JAES 24(1), 1976):
//   |H_LP(jw)| = 1/(1 + (w/w0)^2m): -6.02 dB at the corner, and LP + HP (HP inverted for odd m, LR2)
//   is all-pass, so the split itself colours nothing.
// Half-band filters (Kaiser window design, Kaiser 1974): the stopband must be at least 70 dB down.
import { describe, expect, it } from 'vitest';
import { wayFilterAt, wayFilterBiquads } from '../src/engine/filters/way-filter.ts';
import { cascadeResponse } from '../src/engine/filters/biquad.ts';
import { Decimator2, designHalfband, RENDER_HALFBAND, Upsampler2 } from '../src/engine/filters/halfband.ts';
import type { ActiveFilter, FilterBand } from '../src/engine/system.ts';
import { abs } from '../src/engine/complex.ts';

const mag = (c: [number, number]) => Math.hypot(c[0], c[1]);
const dB = (x: number) => 20 * Math.log10(x);
const only = (band: FilterBand, highPass: boolean): ActiveFilter => ({
  type: 'active',
  highpass: highPass ? band : null,
  lowpass: highPass ? null : band,
  gain: 1,
  delay: 0,
});
const analog = (band: FilterBand, highPass: boolean, f: number) => abs(wayFilterAt(only(band, highPass), 2 * Math.PI * f));

describe('Butterworth bands (bw2, bw3, bw4)', () => {
  for (const [shape, n] of [
    ['bw2', 2],
    ['bw3', 3],
    ['bw4', 4],
  ] as const) {
    it(`${shape}: |H|^2 = 1/(1 + x^${2 * n}) both ways, -3.01 dB at the corner, ${6 * n} dB/octave far out`, () => {
      const band = { shape, hz: 800 };
      for (const x of [0.05, 0.3, 0.7, 1, 1.4, 3, 20]) {
        expect(analog(band, false, 800 * x)).toBeCloseTo(1 / Math.sqrt(1 + x ** (2 * n)), 12);
        expect(analog(band, true, 800 * x)).toBeCloseTo(1 / Math.sqrt(1 + x ** (-2 * n)), 12);
      }
      expect(dB(analog(band, false, 800))).toBeCloseTo(-3.0103, 4);
      expect(dB(analog(band, false, 800 * 64) / analog(band, false, 800 * 32))).toBeCloseTo(-6.0206 * n, 3);
      expect(dB(analog(band, true, 800 / 64) / analog(band, true, 800 / 32))).toBeCloseTo(-6.0206 * n, 3);
    });
  }
});

describe('Linkwitz-Riley bands (lr2, lr4, lr8)', () => {
  for (const [shape, m] of [
    ['lr2', 1],
    ['lr4', 2],
    ['lr8', 4],
  ] as const) {
    it(`${shape}: |H| = 1/(1 + x^${2 * m}), -6.02 dB at the corner, LP + HP all-pass`, () => {
      const band = { shape, hz: 1800 };
      const sign = m % 2 === 1 ? -1 : 1;
      for (const x of [0.01, 0.2, 0.5, 1, 2, 5, 100]) {
        const f = 1800 * x;
        expect(analog(band, false, f)).toBeCloseTo(1 / (1 + x ** (2 * m)), 12);
        expect(analog(band, true, f)).toBeCloseTo(1 / (1 + x ** (-2 * m)), 12);
        const lp = wayFilterAt(only(band, false), 2 * Math.PI * f);
        const hp = wayFilterAt(only(band, true), 2 * Math.PI * f);
        expect(Math.hypot(lp.re + sign * hp.re, lp.im + sign * hp.im)).toBeCloseTo(1, 12);
      }
      expect(dB(analog(band, false, 1800))).toBeCloseTo(-6.0206, 4);
    });

    for (const fs of [44100, 96000]) {
      it(`${shape} at ${fs} Hz, digital: -6.02 dB at the corner (prewarped), all-pass sum`, () => {
        const band = { shape, hz: 1800 };
        const lp = wayFilterBiquads(only(band, false), fs)!;
        const hp = wayFilterBiquads(only(band, true), fs)!;
        const sign = m % 2 === 1 ? -1 : 1;
        expect(dB(mag(cascadeResponse(lp, 1, 1800, fs)))).toBeCloseTo(-6.02, 2);
        expect(dB(mag(cascadeResponse(hp, 1, 1800, fs)))).toBeCloseTo(-6.02, 2);
        for (const f of [20, 200, 900, 1800, 3600, 10000, 20000]) {
          const l = cascadeResponse(lp, 1, f, fs);
          const h = cascadeResponse(hp, sign, f, fs);
          expect(Math.hypot(l[0] + h[0], l[1] + h[1])).toBeCloseTo(1, 9);
        }
      });
    }
  }
});

describe('the way filter as a whole', () => {
  it('applies its gain and delay: |H| = gain, phase -w·delay, with both bands in series', () => {
    const f = 300;
    const w = 2 * Math.PI * f;
    const plain: ActiveFilter = {
      type: 'active',
      highpass: { shape: 'bw2', hz: 30 },
      lowpass: { shape: 'lr4', hz: 3000 },
      gain: 1,
      delay: 0,
    };
    const padded = { ...plain, gain: 10 ** (-3 / 20), delay: 0.0005 };
    const a = wayFilterAt(plain, w);
    const b = wayFilterAt(padded, w);
    expect(dB(abs(b) / abs(a))).toBeCloseTo(-3, 9);
    const dPhase = Math.atan2(a.re * b.im - a.im * b.re, a.re * b.re + a.im * b.im);
    expect(dPhase).toBeCloseTo(-w * 0.0005, 9);
    expect(abs(a)).toBeCloseTo(analog({ shape: 'bw2', hz: 30 }, true, f) * analog({ shape: 'lr4', hz: 3000 }, false, f), 12);
    expect(wayFilterBiquads({ ...plain, highpass: null, lowpass: null }, 48000)).toBeNull();
  });
});

describe('half-band oversampling filters', () => {
  it('the design reaches its 70 dB stopband', () => {
    const { odd, m } = RENDER_HALFBAND;
    // Response of the full filter at the high rate: 1/2 + 2·sum h_k cos(k w), k odd.
    const resp = (w: number) => 0.5 + odd.reduce((s, h, j) => s + 2 * h * Math.cos((2 * j + 1) * w), 0);
    for (let f = 0.29; f <= 0.5; f += 0.005) expect(20 * Math.log10(Math.abs(resp(2 * Math.PI * f)))).toBeLessThan(-69.5);
    for (let f = 0; f <= 0.21; f += 0.005) expect(Math.abs(20 * Math.log10(resp(2 * Math.PI * f)))).toBeLessThan(0.003);
    expect(m % 2).toBe(1);
    expect(designHalfband(60, 0.1).m).toBeLessThan(m);
  });
  it('interpolate then decimate is a delay of M samples for a band-limited signal', () => {
    const up = new Upsampler2(),
      down = new Decimator2(),
      buf = new Float64Array(2);
    const M = RENDER_HALFBAND.m;
    const x = (k: number) => Math.sin(0.3 * k) + 0.5 * Math.cos(1.1 * k + 0.2);
    for (let k = 0; k < 2000; k++) {
      up.push(x(k), buf, 0);
      const y = down.push(buf[0], buf[1]);
      if (k > 200) expect(Math.abs(y - x(k - M))).toBeLessThan(1e-3);
    }
  });
});
