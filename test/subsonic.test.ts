// The optional subsonic high-pass on the woofer's drive (the first version's `highpass_hz`, now the
// woofer way's bw2 high-pass): a 2nd-order Butterworth, which is 3.01 dB
// down at its corner and falls 12 dB per octave below it (Butterworth, "On the Theory of Filter
// Amplifiers", 1930; standard filter tables).
import { describe, expect, it } from 'vitest';
import { analyze } from '../src/engine/response/analyze.ts';
import { respond } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { wayFilterBiquads } from '../src/engine/filters/way-filter.ts';
import { renderBuffer } from '../src/engine/render/index.ts';
import { doc, system, woofer } from './helpers/designs.ts';

const base = doc({ fs_hz: 40, qes: 0.4, qms: 4, vas_l: 30 }, { type: 'vented', vb_l: 30, fb_hz: 38, ports: [{ diameter_cm: 7 }] });
const withHp = { ...base, crossover: { type: 'lr4' as const, fx_hz: 2000, highpass_hz: 30 } };

/** |H(e^jw)| of packed biquads [b0 b1 b2 a1 a2]... */
function digitalGain(coef: Float64Array, f: number, sr: number) {
  const w = (2 * Math.PI * f) / sr;
  let g = 1;
  for (let k = 0; k < coef.length; k += 5) {
    const [b0, b1, b2, a1, a2] = coef.subarray(k, k + 5);
    const num = Math.hypot(b0 + b1 * Math.cos(w) + b2 * Math.cos(2 * w), -(b1 * Math.sin(w) + b2 * Math.sin(2 * w)));
    const den = Math.hypot(1 + a1 * Math.cos(w) + a2 * Math.cos(2 * w), -(a1 * Math.sin(w) + a2 * Math.sin(2 * w)));
    g *= num / den;
  }
  return g;
}

describe('subsonic high-pass', () => {
  it('is 3.01 dB down at its corner and 12 dB/octave below it, in the small-signal curves', () => {
    const a = system(base);
    const b = system(withHp);
    const rel = (f: number) => 20 * Math.log10(abs(respond(b, woofer(b), f, 1).pressure) / abs(respond(a, woofer(a), f, 1).pressure));
    expect(rel(30)).toBeCloseTo(-3.0103, 3);
    expect(rel(7.5)).toBeCloseTo(20 * Math.log10(1 / Math.sqrt(1 + 4 ** 4)), 3);
    expect(rel(300)).toBeCloseTo(0, 2);
  });

  it('cuts the excursion below tuning that a vented box cannot hold back', () => {
    const x = (d: typeof base) => {
      const c = analyze(system(d)).curves;
      return c.excursionMm[c.freqHz.findIndex((f) => f >= 12)];
    };
    expect(x(withHp) / x(base)).toBeLessThan(0.25);
  });

  it("becomes the woofer way's bw2 high-pass, and sits in its digital filter with the same corner, prewarped", () => {
    const withFilter = woofer(system(withHp)).filter;
    const plainFilter = woofer(system(base)).filter;
    expect(withFilter.highpass).toEqual({ shape: 'bw2', hz: 30 });
    expect(plainFilter.highpass).toBeNull();
    const xo = wayFilterBiquads(withFilter, 48000)!;
    const plain = wayFilterBiquads(plainFilter, 48000)!;
    expect(20 * Math.log10(digitalGain(xo, 30, 48000) / digitalGain(plain, 30, 48000))).toBeCloseTo(-3.0103, 3);
    expect(20 * Math.log10(digitalGain(xo, 300, 48000) / digitalGain(plain, 300, 48000))).toBeCloseTo(0, 2);
  });

  it('reduces the rendered excursion of a 15 Hz tone', () => {
    const sr = 48000;
    const tone = Float32Array.from({ length: sr / 2 }, (_, k) => 0.5 * Math.sin((2 * Math.PI * 15 * k) / sr));
    const peak = (d: typeof base) => renderBuffer(system(d), [tone], sr, { voltsFs: 10 }).summary.peak_excursion_mm;
    expect(peak(withHp) / peak(base)).toBeLessThan(0.3);
  });

  // A first-version file keeps its rule; in version 2 the same filters give a warning.
  it('refuses a corner less than two octaves below the crossover', () => {
    expect(() => system({ ...base, crossover: { type: 'lr4', fx_hz: 100, highpass_hz: 40 } })).toThrow(/two octaves below/);
  });
});
