// Offline work of the listening bench, as pure functions over the engine (the Worker in
// render.worker.ts runs them; the Node tests call them directly): the planned level of each design
// for this track, a whole-track render of both designs (summary, stress events and traces), and a
// WAV export of one stream.
import { renderBuffer, resolveVolts, type RenderMode, type RenderSummary, type Traces } from '../engine/render/index.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import { encodeWav, type ExportFormat } from './wav-export.ts';
import type { DesignSlot } from './protocol.ts';

export interface TrackData {
  channels: Float32Array[];
  sampleRate: number;
}

export interface DesignLevel {
  voltsFs: number;
  splDb: number;
}

/** The planned level of each design, resolved for this track (SPL at the seat needs the whole track). */
export function levelsFor(track: TrackData, systems: Record<DesignSlot, SpeakerSystem>): Record<DesignSlot, DesignLevel> {
  const one = (s: SpeakerSystem) => {
    const r = resolveVolts(s, track.channels, track.sampleRate, {});
    return { voltsFs: r.volts, splDb: r.spl };
  };
  return { a: one(systems.a), b: one(systems.b) };
}

export interface DesignRender {
  summary: RenderSummary;
  traces: Traces;
}

/** Both designs over the whole track at their planned levels, as `preheard render` does. */
export function renderBoth(
  track: TrackData,
  systems: Record<DesignSlot, SpeakerSystem>,
  onProgress?: (fraction: number) => void,
): Record<DesignSlot, DesignRender> {
  const one = (s: SpeakerSystem, base: number): DesignRender => {
    const r = renderBuffer(s, track.channels, track.sampleRate, {
      analysisOnly: true,
      onProgress: onProgress && ((f) => onProgress(base + f / 2)),
    });
    return { summary: r.summary, traces: r.traces };
  };
  return { a: one(systems.a, 0), b: one(systems.b, 0.5) };
}

export type ExportStream = RenderMode;

/** One design's stream over the whole track, encoded as a WAV file. */
export function exportStream(
  track: TrackData,
  system: SpeakerSystem,
  mode: ExportStream,
  format: ExportFormat,
  onProgress?: (fraction: number) => void,
): { bytes: Uint8Array; frames: number } {
  const r = renderBuffer(system, track.channels, track.sampleRate, { mode, onProgress });
  return { bytes: encodeWav(r.audio, track.sampleRate, format), frames: r.audio[0].length };
}
