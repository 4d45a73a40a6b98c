// Offline work of the listening bench, as pure functions over the engine (the Worker in
// render.worker.ts runs them; the Node tests call them directly): the planned level of each design
// for this track, a whole-track render of both designs (summary, stress events and traces), and a
// WAV export of one stream.
import { renderBuffer, resolveVolts, type RenderMode, type RenderSummary, type Traces } from '../engine/render/index.ts';
import { seatLeqCPerVolt } from '../engine/level/calibration.ts';
import { InputProblem } from '../engine/issues.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import { encodeWav, type ExportFormat } from './wav-export.ts';
import type { DesignSlot } from './protocol.ts';

export interface TrackData {
  channels: Float32Array[];
  sampleRate: number;
}

/**
 * The track's calibration (its Leq,C at the seat per volt) for each design, measured once per design
 * and track: the levels, the render and the export of the same design reuse it (a calibration pass
 * costs about a tenth of a render). Keyed by the design's content, since each message to the Worker
 * brings a fresh copy of it.
 */
export class TrackCalibration {
  private readonly byDesign = new Map<string, number | InputProblem>();
  /** Calibration passes run so far (what the tests count). */
  passes = 0;
  constructor(readonly track: TrackData) {}

  leqPerVoltDb(system: SpeakerSystem): number {
    const key = JSON.stringify(system);
    let l1 = this.byDesign.get(key);
    if (l1 === undefined) {
      this.passes++;
      try {
        l1 = seatLeqCPerVolt(system, this.track.channels, this.track.sampleRate);
      } catch (e) {
        if (!(e instanceof InputProblem)) throw e;
        l1 = e;
      }
      // Designs come and go with edits: the cache keeps the recent ones only.
      if (this.byDesign.size >= 16) this.byDesign.delete(this.byDesign.keys().next().value as string);
      this.byDesign.set(key, l1);
    }
    if (typeof l1 === 'number') return l1;
    // Silent audio: a drive given in volts still plays (with no SPL), as resolveVolts has it.
    if (system.listening.level.mode === 'volts') return -Infinity;
    throw l1;
  }
}

export interface DesignLevel {
  voltsFs: number;
  splDb: number;
}

/** The planned level of each design, resolved for this track (SPL at the seat needs the whole track). */
export function levelsFor(cal: TrackCalibration, systems: Record<DesignSlot, SpeakerSystem>): Record<DesignSlot, DesignLevel> {
  const track = cal.track;
  const one = (s: SpeakerSystem) => {
    const r = resolveVolts(s, track.channels, track.sampleRate, { leqPerVoltDb: cal.leqPerVoltDb(s) });
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
  cal: TrackCalibration,
  systems: Record<DesignSlot, SpeakerSystem>,
  onProgress?: (fraction: number) => void,
): Record<DesignSlot, DesignRender> {
  const one = (s: SpeakerSystem, base: number): DesignRender => {
    const r = renderBuffer(s, cal.track.channels, cal.track.sampleRate, {
      leqPerVoltDb: cal.leqPerVoltDb(s),
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
  cal: TrackCalibration,
  system: SpeakerSystem,
  mode: ExportStream,
  format: ExportFormat,
  onProgress?: (fraction: number) => void,
): { bytes: Uint8Array; frames: number } {
  const track = cal.track;
  const r = renderBuffer(system, track.channels, track.sampleRate, { mode, onProgress, leqPerVoltDb: cal.leqPerVoltDb(system) });
  return { bytes: encodeWav(r.audio, track.sampleRate, format), frames: r.audio[0].length };
}
