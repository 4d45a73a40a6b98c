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
    20 * Math.log10((F4 * F4 * f2 * f2) / ((f2 + F1 * F1) * Math.sqrt(f2 + F2 * F2) * Math.sqrt(f2 + F3 * F3) * (f2 + F4 * F4))) -
    A1000
  );
}

/** Digital C-weighting as biquads (bilinear transform; the 12.2 kHz pole pair prewarped). */
export function cWeightingFilter(sampleRate: number): BiquadCascade {
  const w1 = 2 * Math.PI * F1, w4 = 2 * Math.PI * F4;
  const kLow = bilinearK(sampleRate);
  const kHigh = bilinearK(sampleRate, Math.min(F4, 0.45 * sampleRate));
  const low = bilinearSection({ b: [0, 0, 1], a: [w1 * w1, 2 * w1, 1] }, kLow);
  const high = bilinearSection({ b: [w4 * w4, 0, 0], a: [w4 * w4, 2 * w4, 1] }, kHigh);
  return new BiquadCascade(packSections([low, high]), Math.pow(10, -C1000 / 20));
}

/** Digital A-weighting as biquads. */
export function aWeightingFilter(sampleRate: number): BiquadCascade {
  const w1 = 2 * Math.PI * F1, w2 = 2 * Math.PI * F2, w3 = 2 * Math.PI * F3, w4 = 2 * Math.PI * F4;
  const k = bilinearK(sampleRate);
  const kHigh = bilinearK(sampleRate, Math.min(F4, 0.45 * sampleRate));
  const s1 = bilinearSection({ b: [0, 0, 1], a: [w1 * w1, 2 * w1, 1] }, k);
  const s2 = bilinearSection({ b: [0, 0, 1], a: [w2 * w3, w2 + w3, 1] }, k);
  const s3 = bilinearSection({ b: [w4 * w4, 0, 0], a: [w4 * w4, 2 * w4, 1] }, kHigh);
  return new BiquadCascade(packSections([s1, s2, s3]), Math.pow(10, -A1000 / 20));
}
