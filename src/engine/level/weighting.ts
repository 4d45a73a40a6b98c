// A- and C-frequency weightings of IEC 61672-1:2013 (Annex E analytic forms), analog and digital.
import { bilinearK, bilinearSection, packSections, BiquadCascade } from '../filters/biquad.ts';

// Pole frequencies, Hz (IEC 61672-1, Annex E: f1, f2, f3, f4).
const F1 = 20.598997;
const F2 = 107.65265;
const F3 = 737.86223;
const F4 = 12194.217;
// Normalisation constants at 1 kHz, dB (IEC 61672-1, E.5).
const C1000 = -0.062;
const A1000 = -2.0;

/** Analytic C-weighting in dB at f Hz. */
export function cWeightingDb(f: number): number {
  const f2 = f * f;
  return 20 * Math.log10((F4 * F4 * f2) / ((f2 + F1 * F1) * (f2 + F4 * F4))) - C1000;
}

/** Analytic A-weighting in dB at f Hz. */
export function aWeightingDb(f: number): number {
  const f2 = f * f;
  return (
    20 * Math.log10((F4 * F4 * f2 * f2) / ((f2 + F1 * F1) * Math.sqrt(f2 + F2 * F2) * Math.sqrt(f2 + F3 * F3) * (f2 + F4 * F4))) - A1000
  );
}

/**
 * The 12.2 kHz double pole w4^2/(s + w4)^2 near the Nyquist frequency: the bilinear transform would
 * bend it, so the poles are matched (z = e^{-w4/fs}) and a double zero at -q is fitted by bisection
 * so the magnitude is right at 0.25·fs; unity gain at 1 kHz.
 */
function highPoleSection(sampleRate: number): Float64Array {
  const w4 = 2 * Math.PI * F4;
  const p = Math.exp(-w4 / sampleRate);
  const dbAt = (q: number, f: number) => {
    const w = (2 * Math.PI * f) / sampleRate;
    const nr = 1 + q * Math.cos(w),
      ni = -q * Math.sin(w),
      dr = 1 - p * Math.cos(w),
      di = p * Math.sin(w);
    return 10 * Math.log10(((nr * nr + ni * ni) / (dr * dr + di * di)) ** 2);
  };
  const analog = (f: number) => 20 * Math.log10((w4 * w4) / ((2 * Math.PI * f) ** 2 + w4 * w4));
  const fFit = 0.25 * sampleRate;
  const err = (q: number) => dbAt(q, fFit) - dbAt(q, 1000) - (analog(fFit) - analog(1000));
  let lo = -0.9,
    hi = 0.99;
  for (let k = 0; k < 80; k++) {
    const mid = 0.5 * (lo + hi);
    if (err(mid) > 0) lo = mid;
    else hi = mid;
  }
  const q = 0.5 * (lo + hi);
  const g = Math.pow(10, (analog(1000) - dbAt(q, 1000)) / 20);
  return Float64Array.of(g, 2 * q * g, q * q * g, -2 * p, p * p);
}

/** Digital C-weighting as biquads (bilinear for the 20.6 Hz poles, matched 12.2 kHz poles). */
export function cWeightingFilter(sampleRate: number): BiquadCascade {
  const w1 = 2 * Math.PI * F1;
  const low = bilinearSection({ b: [0, 0, 1], a: [w1 * w1, 2 * w1, 1] }, bilinearK(sampleRate));
  return new BiquadCascade(packSections([low, highPoleSection(sampleRate)]), Math.pow(10, -C1000 / 20));
}

/** Digital A-weighting as biquads (bilinear below, matched 12.2 kHz poles). */
export function aWeightingFilter(sampleRate: number): BiquadCascade {
  const w1 = 2 * Math.PI * F1,
    w2 = 2 * Math.PI * F2,
    w3 = 2 * Math.PI * F3;
  const k = bilinearK(sampleRate);
  const s1 = bilinearSection({ b: [0, 0, 1], a: [w1 * w1, 2 * w1, 1] }, k);
  const s2 = bilinearSection({ b: [0, 0, 1], a: [w2 * w3, w2 + w3, 1] }, k);
  return new BiquadCascade(packSections([s1, s2, highPoleSection(sampleRate)]), Math.pow(10, -A1000 / 20));
}
