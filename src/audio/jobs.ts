// Offline work of the listening bench, as pure functions over the engine (the Worker in
// render.worker.ts runs them; the Node tests call them directly): the planned level of each design
// for this track, a whole-track render of both designs (summary, stress events and traces), and a
// WAV export of one stream.
import { renderBuffer, resolveVolts, type RenderMode, type RenderSummary, type Traces } from '../engine/render/index.ts';
import { seatLeqCPerVolt } from '../engine/level/calibration.ts';
import { InputProblem } from '../engine/issues.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import type { LaneHelper } from '../engine/render/lane-share.ts';
import { wavFiller, type ExportFormat } from './wav-export.ts';
import type { DesignSlot } from './protocol.ts';

export interface TrackData {
  channels: Float32Array[];
  sampleRate: number;
}

/** Results per design kept for the recent designs only (they come and go with edits), keyed by content. */
class RecentByDesign<T> {
  private readonly map = new Map<string, T>();
  constructor(private readonly most: number) {}

  get(key: string): T | undefined {
    return this.map.get(key);
  }

  set(key: string, value: T): void {
    if (this.map.size >= this.most && !this.map.has(key)) this.map.delete(this.map.keys().next().value as string);
    this.map.set(key, value);
  }
}

/** A design's content as a key: each message to the Worker brings a fresh copy of the designs. */
const designKey = (system: SpeakerSystem) => JSON.stringify(system);

/**
 * The work done on one track, per design, kept: its calibration (its Leq,C at the seat per volt,
 * measured once per design and track; the levels, the render and the export of the same design
 * reuse it, a pass costing about a tenth of a render) and its whole-track render (so after an edit
 * of one design only that design renders again).
 */
export class TrackWork {
  private readonly levels = new RecentByDesign<number | InputProblem>(16);
  private readonly renders = new RecentByDesign<DesignRender>(4);
  /** Calibration passes and whole-track renders run so far (what the tests count). */
  passes = 0;
  renderRuns = 0;
  /** `helper` gives a second thread for the renders and calibrations where there is one (lane-helper.ts). */
  constructor(
    readonly track: TrackData,
    private readonly helper: () => LaneHelper | undefined = () => undefined,
  ) {}

  leqPerVoltDb(system: SpeakerSystem): number {
    const key = designKey(system);
    let l1 = this.levels.get(key);
    if (l1 === undefined) {
      this.passes++;
      try {
        l1 = seatLeqCPerVolt(system, this.track.channels, this.track.sampleRate, this.laneHelper());
      } catch (e) {
        if (!(e instanceof InputProblem)) throw e;
        l1 = e;
      }
      this.levels.set(key, l1);
    }
    if (typeof l1 === 'number') return l1;
    // Silent audio: a drive given in volts still plays (with no SPL), as resolveVolts has it.
    if (system.listening.level.mode === 'volts') return -Infinity;
    throw l1;
  }

  /** The design's whole-track render (summary and traces), kept or made now. */
  render(system: SpeakerSystem, onProgress?: (fraction: number) => void): DesignRender {
    const key = designKey(system);
    const kept = this.renders.get(key);
    if (kept) return kept;
    this.renderRuns++;
    const leqPerVoltDb = this.leqPerVoltDb(system);
    const helper = this.laneHelper();
    const r = renderBuffer(system, this.track.channels, this.track.sampleRate, { leqPerVoltDb, analysisOnly: true, onProgress, helper });
    const made = { summary: r.summary, traces: r.traces, threads: helper ? 2 : 1 };
    this.renders.set(key, made);
    return made;
  }

  /** The second thread, if there is one and it runs. */
  laneHelper(): LaneHelper | undefined {
    return this.helper();
  }

  /** Whether the design's render is kept. */
  hasRender(system: SpeakerSystem): boolean {
    return this.renders.get(designKey(system)) !== undefined;
  }
}

export interface DesignLevel {
  voltsFs: number;
  splDb: number;
}

/** The planned level of each design, resolved for this track (SPL at the seat needs the whole track). */
export function levelsFor(work: TrackWork, systems: Record<DesignSlot, SpeakerSystem>): Record<DesignSlot, DesignLevel> {
  const track = work.track;
  const one = (s: SpeakerSystem) => {
    const r = resolveVolts(s, track.channels, track.sampleRate, { leqPerVoltDb: work.leqPerVoltDb(s) });
    return { voltsFs: r.volts, splDb: r.spl };
  };
  return { a: one(systems.a), b: one(systems.b) };
}

export interface DesignRender {
  summary: RenderSummary;
  traces: Traces;
  /** Threads the render ran on (2 with a lane helper; absent in results kept by older versions). */
  threads?: number;
}

/**
 * Both designs over the whole track at their planned levels, as `preheard render` does. A design
 * rendered before on this track is not rendered again; the progress covers the renders that run.
 */
export function renderBoth(
  work: TrackWork,
  systems: Record<DesignSlot, SpeakerSystem>,
  onProgress?: (fraction: number) => void,
): Record<DesignSlot, DesignRender> {
  // Two equal designs render once.
  const toRun = new Set([systems.a, systems.b].filter((s) => !work.hasRender(s)).map(designKey)).size;
  let done = 0;
  const one = (s: SpeakerSystem): DesignRender => {
    if (work.hasRender(s)) return work.render(s);
    const base = done++ / toRun;
    return work.render(s, onProgress && ((f) => onProgress(base + f / toRun)));
  };
  const a = one(systems.a);
  const b = one(systems.b);
  onProgress?.(1);
  return { a, b };
}

export type ExportStream = RenderMode;

/** One design's stream over the whole track, encoded as a WAV file while it renders (no float copy is held). */
export function exportStream(
  work: TrackWork,
  system: SpeakerSystem,
  mode: ExportStream,
  format: ExportFormat,
  onProgress?: (fraction: number) => void,
): { bytes: Uint8Array; frames: number } {
  const track = work.track;
  const frames = track.channels[0]?.length ?? 0;
  const wav = wavFiller(track.channels.length, track.sampleRate, format, frames);
  renderBuffer(system, track.channels, track.sampleRate, {
    mode,
    onProgress,
    leqPerVoltDb: work.leqPerVoltDb(system),
    helper: work.laneHelper(),
    onAudio: (views, at) => wav.write(views, at),
  });
  return { bytes: wav.bytes, frames };
}
