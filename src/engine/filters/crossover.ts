// Linkwitz-Riley crossover: the woofer gets the low-pass, the flat path the complementary high-pass.
// LR2 = Butterworth-1 squared, LR4 = Butterworth-2 squared, LR8 = Butterworth-4 squared
// (Linkwitz, "Active Crossover Networks for Noncoincident Drivers", JAES 24(1), 1976).
import type { Crossover } from '../system.ts';
import { bilinearK, bilinearSection, packSections, type AnalogSection } from './biquad.ts';

export interface CrossoverFilters {
  /** Packed biquads of the low-pass and the high-pass, or null when the type is 'none'. */
  lp: Float64Array | null;
  hp: Float64Array | null;
  /** Polarity of the high band that makes LP + HP an all-pass: -1 for LR2, +1 otherwise. */
  hpSign: number;
}

/** Q of each second-order section of a Butterworth low-pass of even order n. */
function butterworthQs(n: number): number[] {
  const qs: number[] = [];
  for (let k = 0; k < n / 2; k++) qs.push(1 / (2 * Math.sin(((2 * k + 1) * Math.PI) / (2 * n))));
  return qs;
}

/** Analog sections of a Linkwitz-Riley low-pass (or high-pass) at w0 rad/s. */
export function lrAnalogSections(type: 'lr2' | 'lr4' | 'lr8', w0: number, highPass: boolean): AnalogSection[] {
  const w2 = w0 * w0;
  const num = (): [number, number, number] => (highPass ? [0, 0, 1] : [w2, 0, 0]);
  if (type === 'lr2') return [{ b: num(), a: [w2, 2 * w0, 1] }];
  const qs = butterworthQs(type === 'lr4' ? 2 : 4);
  const secs: AnalogSection[] = [];
  for (const q of qs) for (let r = 0; r < 2; r++) secs.push({ b: num(), a: [w2, w0 / q, 1] });
  return secs;
}

/** The subsonic high-pass, a 2nd-order Butterworth (Q = 1/sqrt 2), prewarped at its corner. */
export function subsonicSection(hz: number, sampleRate: number): Float64Array | null {
  if (!(hz > 0)) return null;
  const f = Math.min(hz, 0.45 * sampleRate);
  const w0 = 2 * Math.PI * f;
  return bilinearSection({ b: [0, 0, 1], a: [w0 * w0, w0 * Math.SQRT2, 1] }, bilinearK(sampleRate, f));
}

export function designCrossover(xo: Crossover, sampleRate: number): CrossoverFilters {
  const subsonic = subsonicSection(xo.highpassHz ?? 0, sampleRate);
  const split = designSplit(xo, sampleRate);
  // The subsonic filter belongs to the woofer's band only: the flat high band carries no bass.
  if (!subsonic) return split;
  return { ...split, lp: packSections(split.lp ? [split.lp, subsonic] : [subsonic]) };
}

function designSplit(xo: Crossover, sampleRate: number): CrossoverFilters {
  if (xo.type === 'none' || !(xo.fx > 0)) return { lp: null, hp: null, hpSign: 1 };
  const fx = Math.min(xo.fx, 0.45 * sampleRate);
  const w0 = 2 * Math.PI * fx;
  // Prewarped at fx: the -6 dB point lands exactly on fx, and LP + HP stays all-pass.
  const k = bilinearK(sampleRate, fx);
  const lp = packSections(lrAnalogSections(xo.type, w0, false).map((s) => bilinearSection(s, k)));
  const hp = packSections(lrAnalogSections(xo.type, w0, true).map((s) => bilinearSection(s, k)));
  return { lp, hp, hpSign: xo.type === 'lr2' ? -1 : 1 };
}
