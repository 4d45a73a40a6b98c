// What the bench says when the planned level cannot be reached on a track: computed afresh from the
// latest levels on every change, so it never outlives the problem, and naming every design that
// cannot reach it (the track is the problem when both fail for the same reason).
import { MAX_VOLTS_FS } from '../engine/render/renderer.ts';

const fmtV = (v: number) => (v >= 1e5 ? v.toExponential(2) : String(Math.round(v)));

/** The message for these drives per full scale, or null when both designs can play the track. */
export function levelProblem(voltsFs: { a: number; b: number }): string | null {
  const out = (['a', 'b'] as const).filter((s) => !(voltsFs[s] > 0 && voltsFs[s] < MAX_VOLTS_FS));
  if (out.length === 0) return null;
  if (out.some((s) => !Number.isFinite(voltsFs[s]))) return SILENT_TRACK;
  const needs = out
    .sort((x, y) => voltsFs[y] - voltsFs[x])
    .map((s) => `design ${s.toUpperCase()} would need ${fmtV(voltsFs[s])} V per full scale`)
    .join(' and ');
  const both = out.length === 2;
  return `This track is too quiet for the planned level: ${needs}, more than the ${MAX_VOLTS_FS} V the model takes. Choose a louder track, or a lower planned level for ${both ? 'both designs' : `design ${out[0].toUpperCase()}`}.`;
}

export const SILENT_TRACK =
  'This track is silent in the band the designs play (there is no bass in it), so no playback level can be set from it. Choose another track.';

/** Words for a failure of the level job: the silent-track case said as such. */
export function levelFailure(e: unknown): string {
  const text = e instanceof Error ? e.message : String(e);
  if (/silent|empty/i.test(text)) return SILENT_TRACK;
  return `The planned level cannot be set for this track: ${text}`;
}
