// The measured-response FIRs of a design, built on the page and handed to the listening bench's
// audio thread with the design: building them (a few large FFTs, tens of milliseconds) on the audio
// thread would drop out the sound, so the worklet only adopts taps that are ready.
import type { SpeakerSystem } from '../engine/system.ts';
import { measuredCorrection } from '../engine/response/frequency.ts';
import { provideTaps } from '../engine/response/measured.ts';

/** One driver way's correction FIR at a sample rate. */
export interface WayTaps {
  /** Index of the way in the design's ways. */
  way: number;
  sampleRate: number;
  taps: Float64Array;
}

/** Every measured way's taps at `sampleRate` (built once per table and driver, cached in the engine). */
export function measuredTapsFor(system: SpeakerSystem, sampleRate: number): WayTaps[] {
  const out: WayTaps[] = [];
  system.ways.forEach((way, k) => {
    if (way.kind !== 'driver' || !way.measured) return;
    const taps = measuredCorrection(system, way)?.taps(sampleRate);
    if (taps) out.push({ way: k, sampleRate, taps });
  });
  return out;
}

/** Hands ready taps to the engine for this system (those at another rate than `sampleRate` are left out). */
export function adoptMeasuredTaps(system: SpeakerSystem, list: readonly WayTaps[], sampleRate: number): void {
  for (const t of list) {
    const way = system.ways[t.way];
    if (t.sampleRate !== sampleRate || way?.kind !== 'driver' || !way.measured) continue;
    provideTaps(way.measured, sampleRate, t.taps);
  }
}
