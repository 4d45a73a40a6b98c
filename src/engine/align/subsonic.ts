// The subsonic high-pass a vented or passive-radiator design needs when its first limit at the
// planned level is cone excursion below the box tuning: below fb the box no longer holds the cone
// back, and a high-pass on the way's drive is the usual remedy (common practice, no source).
import type { Analysis, WayAnalysis } from '../response/types.ts';
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { analyze } from '../response/analyze.ts';

export interface SubsonicSuggestion {
  /** The way the filter goes on: its index in system.ways (and in the document's ways). */
  wayIndex: number;
  wayName: string;
  /** Corner of the suggested 2nd-order Butterworth high-pass, whole Hz. */
  cornerHz: number;
  /** The box tuning, Hz. */
  fbHz: number;
  xmaxMm: number;
  /** Peak excursion at the planned level, and where, before and with the filter. */
  beforeMm: number;
  beforeHz: number;
  afterMm: number;
}

/** Attempts at raising the corner when the planned level's drive moves with the filter. */
const MAX_TRIES = 8;

/** |H| of a 2nd-order Butterworth high-pass with corner fc at f: 1/sqrt(1 + (fc/f)^4) (Butterworth 1930). */
export const bw2HighpassGain = (f: number, fc: number): number => 1 / Math.sqrt(1 + (fc / f) ** 4);

/**
 * The corner at which a 2nd-order Butterworth high-pass brings every excursion below `fbHz` within
 * `xmaxMm`: at each frequency f below fb where the excursion X(f) passes Xmax, the filter must give
 * |H(f)| <= Xmax/X(f), i.e. fc >= f·((X/Xmax)^2 - 1)^(1/4); the corner is the largest of these,
 * rounded up to a whole Hz. Exact for an active filter ahead of the amplifier (the excursion scales
 * with the drive) while the drive itself is unchanged. 0 when nothing passes Xmax below fb.
 */
export function subsonicCorner(freqHz: ArrayLike<number>, excursionMm: ArrayLike<number>, fbHz: number, xmaxMm: number): number {
  let fc = 0;
  for (let i = 0; i < freqHz.length; i++) {
    const f = freqHz[i];
    const x = excursionMm[i];
    if (!(f < fbHz) || !(x > xmaxMm)) continue;
    fc = Math.max(fc, f * ((x / xmaxMm) ** 2 - 1) ** 0.25);
  }
  return fc > 0 ? Math.ceil(fc) : 0;
}

function tuningOf(way: DriverWay): number | null {
  const box = way.box as { type: string; fb?: number };
  return (box.type === 'vented' || box.type === 'passive-radiator') && typeof box.fb === 'number' ? box.fb : null;
}

/** The planned peak excursion below fb of one way's analysis, mm. */
function worstBelow(wa: WayAnalysis, fbHz: number): number {
  const { freqHz, plannedExcursionMm } = wa.curves;
  let worst = 0;
  for (let i = 0; i < freqHz.length && freqHz[i] < fbHz; i++) worst = Math.max(worst, plannedExcursionMm[i]);
  return worst;
}

/**
 * A subsonic high-pass for the first driver way when its first limit at the planned level is cone
 * excursion below the tuning (an active way in a vented or passive-radiator box, with no high-pass
 * yet); null otherwise. The planned level's drive rises a little once the filter takes bass energy
 * out, so the corner is checked by analysing the filtered design and raised by 5 % steps (whole Hz)
 * until the excursion below fb stays within Xmax.
 */
export function subsonicSuggestion(system: SpeakerSystem, analysis: Analysis): SubsonicSuggestion | null {
  const wa = analysis.ways[0];
  if (!wa) return null;
  const way = system.ways[wa.index];
  if (!way || way.kind !== 'driver' || way.network || way.filter.highpass) return null;
  const fb = tuningOf(way);
  if (fb === null) return null;
  const xmaxMm = way.unit.xmax * 1000;
  const { plannedPeakExcursionMm: beforeMm, plannedPeakExcursionHz: beforeHz } = wa.figures;
  if (!(beforeMm > xmaxMm) || !(beforeHz < fb)) return null;
  let corner = subsonicCorner(wa.curves.freqHz, wa.curves.plannedExcursionMm, fb, xmaxMm);
  for (let k = 0; k < MAX_TRIES && corner > 0 && corner < fb; k++) {
    const filtered: DriverWay = { ...way, filter: { ...way.filter, highpass: { shape: 'bw2', hz: corner } } };
    const ways = system.ways.map((w, j) => (j === wa.index ? filtered : w));
    const after = analyze({ ...system, ways }).ways[0];
    const afterMm = worstBelow(after, fb);
    if (afterMm <= xmaxMm)
      return { wayIndex: wa.index, wayName: way.name, cornerHz: corner, fbHz: fb, xmaxMm, beforeMm, beforeHz, afterMm };
    corner = Math.ceil(corner * 1.05);
  }
  return null;
}
