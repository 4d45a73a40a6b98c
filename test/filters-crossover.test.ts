// Crossover and oversampling filters.
// Linkwitz-Riley (Linkwitz, JAES 24(1), 1976): each band is -6.02 dB at the crossover point and
// LP + HP (HP inverted for LR2) is all-pass, so the split itself colours nothing.
// Half-band filters (Kaiser window design, Kaiser 1974): the stopband must be at least 70 dB down.
import { describe, expect, it } from 'vitest';
import { designCrossover } from '../src/engine/filters/crossover.ts';
import { cascadeResponse } from '../src/engine/filters/biquad.ts';
import { Decimator2, designHalfband, RENDER_HALFBAND, Upsampler2 } from '../src/engine/filters/halfband.ts';

const mag = (c: [number, number]) => Math.hypot(c[0], c[1]);

describe('Linkwitz-Riley crossover', () => {
  for (const type of ['lr2', 'lr4', 'lr8'] as const) {
    for (const fs of [44100, 96000]) {
      it(`${type} at ${fs} Hz: -6.02 dB at fx, all-pass sum`, () => {
        const fx = 1800;
        const xo = designCrossover({ type, fx }, fs);
        expect(20 * Math.log10(mag(cascadeResponse(xo.lp!, 1, fx, fs)))).toBeCloseTo(-6.02, 2);
        expect(20 * Math.log10(mag(cascadeResponse(xo.hp!, 1, fx, fs)))).toBeCloseTo(-6.02, 2);
        for (const f of [20, 200, 900, 1800, 3600, 10000, 20000]) {
          const l = cascadeResponse(xo.lp!, 1, f, fs),
            h = cascadeResponse(xo.hp!, xo.hpSign, f, fs);
          expect(Math.hypot(l[0] + h[0], l[1] + h[1])).toBeCloseTo(1, 9);
        }
      });
    }
  }
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
