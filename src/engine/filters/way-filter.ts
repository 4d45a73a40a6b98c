// A way's active filter: a high-pass and a low-pass of Linkwitz-Riley or Butterworth shape, a gain
// and a delay. LR2 = Butterworth-1 squared, LR4 = Butterworth-2 squared, LR8 = Butterworth-4
// squared (Linkwitz, "Active Crossover Networks for Noncoincident Drivers", JAES 24(1), 1976);
// Butterworth of order n has poles on the unit circle at angles (2k + n + 1)·pi/(2n).
import type { ActiveFilter, FilterBand } from '../system.ts';
import { bilinearK, bilinearSection, packSections, type AnalogSection } from './biquad.ts';
import { cx, mul, type Complex } from '../complex.ts';

/** Q of each second-order section of a Butterworth low-pass of order n (odd n adds one first-order section). */
function butterworthQs(n: number): number[] {
  const qs: number[] = [];
  for (let k = 0; k < Math.floor(n / 2); k++) qs.push(1 / (2 * Math.sin(((2 * k + 1) * Math.PI) / (2 * n))));
  return qs;
}

/** Analog sections of one band at w0 rad/s (ascending powers of s), high-pass or low-pass. */
export function bandSections(shape: FilterBand['shape'], w0: number, highPass: boolean): AnalogSection[] {
  const w2 = w0 * w0;
  const num2 = (): [number, number, number] => (highPass ? [0, 0, 1] : [w2, 0, 0]);
  switch (shape) {
    case 'lr2':
      return [{ b: num2(), a: [w2, 2 * w0, 1] }];
    case 'bw2':
      // Q = 1/sqrt 2, written as sqrt 2·w0 so the subsonic filter of the first version is unchanged.
      return [{ b: num2(), a: [w2, w0 * Math.SQRT2, 1] }];
    case 'bw3':
      return [
        { b: highPass ? [0, 1, 0] : [w0, 0, 0], a: [w0, 1, 0] },
        ...butterworthQs(3).map((q): AnalogSection => ({ b: num2(), a: [w2, w0 / q, 1] })),
      ];
    case 'bw4':
      return butterworthQs(4).map((q) => ({ b: num2(), a: [w2, w0 / q, 1] }));
    case 'lr4':
    case 'lr8': {
      const secs: AnalogSection[] = [];
      for (const q of butterworthQs(shape === 'lr4' ? 2 : 4)) for (let r = 0; r < 2; r++) secs.push({ b: num2(), a: [w2, w0 / q, 1] });
      return secs;
    }
  }
}

function bandBiquads(band: FilterBand, sampleRate: number, highPass: boolean): Float64Array {
  const hz = Math.min(band.hz, 0.45 * sampleRate);
  // Prewarped at the corner: the corner lands exactly there, and a Linkwitz-Riley pair stays all-pass.
  const k = bilinearK(sampleRate, hz);
  return packSections(bandSections(band.shape, 2 * Math.PI * hz, highPass).map((s) => bilinearSection(s, k)));
}

/** The filter's biquads (low-pass sections first, then high-pass), or null for no filtering. */
export function wayFilterBiquads(filter: ActiveFilter, sampleRate: number): Float64Array | null {
  const parts: Float64Array[] = [];
  if (filter.lowpass) parts.push(bandBiquads(filter.lowpass, sampleRate, false));
  if (filter.highpass) parts.push(bandBiquads(filter.highpass, sampleRate, true));
  return parts.length ? packSections(parts) : null;
}

/** A pure delay e^(-j w t). */
export const delayAt = (w: number, seconds: number): Complex => (seconds === 0 ? cx(1) : cx(Math.cos(w * seconds), -Math.sin(w * seconds)));

/** The analog sections of a filter, made once per filter object (curves evaluate it at hundreds of points). */
const sectionsOf = new WeakMap<ActiveFilter, AnalogSection[]>();
function analogSections(filter: ActiveFilter): AnalogSection[] {
  let secs = sectionsOf.get(filter);
  if (!secs) {
    secs = [];
    if (filter.lowpass) secs.push(...bandSections(filter.lowpass.shape, 2 * Math.PI * filter.lowpass.hz, false));
    if (filter.highpass) secs.push(...bandSections(filter.highpass.shape, 2 * Math.PI * filter.highpass.hz, true));
    sectionsOf.set(filter, secs);
  }
  return secs;
}

/** The analog filter at w rad/s: both bands, the gain and the delay (not the polarity). */
export function wayFilterAt(filter: ActiveFilter, w: number): Complex {
  // The product of the sections (b0 − b2·w² + j·b1·w)/(a0 − a2·w² + j·a1·w) from h = gain, in real
  // and imaginary parts with exactly the operations of complex.ts's `div` and `mul`, without an
  // object per section: curves and figures evaluate filters some ten thousand times per design.
  let re = filter.gain;
  let im = 0;
  for (const sec of analogSections(filter)) {
    const b = sec.b;
    const a = sec.a;
    const nRe = b[0] - b[2] * w * w;
    const nIm = b[1] * w;
    const dRe = a[0] - a[2] * w * w;
    const dIm = a[1] * w;
    const d = dRe * dRe + dIm * dIm;
    const sRe = (nRe * dRe + nIm * dIm) / d;
    const sIm = (nIm * dRe - nRe * dIm) / d;
    const next = re * sRe - im * sIm;
    im = re * sIm + im * sRe;
    re = next;
  }
  const h = { re, im };
  return filter.delay === 0 ? h : mul(h, delayAt(w, filter.delay));
}
