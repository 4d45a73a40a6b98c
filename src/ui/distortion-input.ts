// What the Curves screen's distortion section accepts from the user: a list of levels relative to
// the planned level and the two tones of the intermodulation figure. Each answer is either the
// values or one message for the user.
import { checkTonePair } from '../engine/distortion/two-tone.ts';

export const MAX_LEVELS = 4;
export const LEVEL_RANGE_DB = [-40, 10] as const;

export type Parsed<T> = { ok: true; value: T } | { ok: false; message: string };

/** "0, -6, -12": dB from the planned level, separated by commas, semicolons or spaces (a decimal point inside a number). */
export function parseLevelList(text: string): Parsed<number[]> {
  const parts = text
    .split(/[;,\s]+/)
    .map((t) => t.trim().replace('−', '-'))
    .filter(Boolean);
  if (parts.length === 0) return { ok: false, message: 'Give at least one level, e.g. 0 for the planned level.' };
  if (parts.length > MAX_LEVELS) return { ok: false, message: `At most ${MAX_LEVELS} levels at a time (each one is a full sweep).` };
  const out: number[] = [];
  for (const p of parts) {
    const v = /^[+-]?\d+(\.\d+)?$/.test(p) ? Number(p) : Number.NaN;
    if (!Number.isFinite(v)) return { ok: false, message: `“${p.slice(0, 20)}” is not a number of decibels.` };
    if (v < LEVEL_RANGE_DB[0] || v > LEVEL_RANGE_DB[1])
      return { ok: false, message: `Levels go from ${LEVEL_RANGE_DB[0]} to +${LEVEL_RANGE_DB[1]} dB around the planned level (got ${v}).` };
    if (out.includes(v)) return { ok: false, message: `The level ${v} dB is listed twice.` };
    out.push(v);
  }
  return { ok: true, value: out };
}

/** The two tones as typed (Hz). */
export function parseTonePair(low: string, high: string): Parsed<[number, number]> {
  const f1 = Number(low.trim());
  const f2 = Number(high.trim());
  if (low.trim() === '' || high.trim() === '' || !Number.isFinite(f1) || !Number.isFinite(f2))
    return { ok: false, message: 'Give both tones in hertz.' };
  const problem = checkTonePair(f1, f2);
  return problem ? { ok: false, message: `The two tones: ${problem}.` } : { ok: true, value: [Math.round(f1), Math.round(f2)] };
}
