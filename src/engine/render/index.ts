// The render API: one engine for the AudioWorklet, a Worker, the CLI and the tests.
//
//   createRenderer(system, { sampleRate, channels, voltsFs, mode?, paPerFs?, oversampling?,
//                            traceHz?, extraStreams?, driverRate? }) -> Renderer
//     renderer.process(inputs, outputs, frames, extra?)   one block (any size, 128-frame quanta
//         included); inputs/outputs are per-channel Float32Array or Float64Array in full scale;
//         state carries across calls; no allocation per block. Output is delayed by
//         renderer.latencyFrames (oversampling filters + true-peak look-ahead).
//         extra = { linear?, residual? } receives the other two streams (needs extraStreams).
//     renderer.setMode('nonlinear' | 'linear' | 'residual')   sample-synchronous switch
//     renderer.update(system)       a parameter edit: new constants, the physical state carries on
//     renderer.setVoltsFs(v)        new drive level
//     renderer.events.list()        stress events so far [{kind, way, start_s, end_s, peak, unit,
//                                   limit}]; `way` is the way's name (absent: the summed output)
//     renderer.traces()             decimated traces (excursion, coil temperature, port speed,
//                                   compression per driver way; the residual level of the sum)
//                                   at renderer.traceHz
//     renderer.getStats()           running peaks (top level: the first driver way; `ways`: each)
//                                   renderer.paPerFs the calibration (Pa per FS)
//     renderer.reset()
//   renderBuffer(system, channels, sampleRate, { voltsFs | splDb, mode?, paPerFs?, extraStreams?,
//                onProgress? }) -> { audio, linear?, residual?, summary, traces }
//     whole files: latency compensated, same length as the input, summary as `render --json`.
//   voltsForSpl(system, channels, sampleRate, splDb) -> volts per full scale for a long-term
//     average C-weighted SPL at the seat, from the design's own sensitivity.
//   findHeadroom(system, channels, sampleRate, { tolDb? }) -> { clean_volts, clean_spl_db,
//     first_limit, first_limit_way, first_limit_s }: bisection to 0.25 dB on "any stress event"
//     of any way.
//
// Every way runs its own chain (way-chain.ts) and the ways are summed at the seat. Calibration:
// output sample = seat pressure / paPerFs. The default paPerFs puts a full-scale input in the bass
// way's passband at -6 dBFS; the true-peak guard keeps the result at or under -0.1 dBTP and its
// action is reported as limiter_db.
import { InputProblem } from '../issues.ts';
import type { SpeakerSystem } from '../system.ts';
import { createRenderer, type DriverRate, MAX_VOLTS_FS, Renderer, type RenderMode, type Traces, type WayStats } from './renderer.ts';
import type { EventKind, StressEvent } from './events.ts';
import { passbandPaPerV, seatLeqCPerVolt, voltsForSpl } from '../level/calibration.ts';
import { linearHeadroomGuess } from './headroom-guess.ts';
import { forEachBlock, type LaneHelper, shareChannels } from './lane-share.ts';
import { SlotRing } from './slot-ring.ts';

export { createRenderer, passbandPaPerV, Renderer, voltsForSpl };
export type { LaneHelper, LaneJob } from './lane-share.ts';
export type { RenderMode, Traces, StressEvent, EventKind };
export type { DriverRate, RendererOptions, RenderStats, WayStats, WayTraces } from './renderer.ts';
export { EVENT_KINDS } from './events.ts';

/** Peaks of one driver way over a render. */
export interface WaySummary {
  name: string;
  peak_excursion_mm: number;
  peak_radiator_mm: number | null;
  peak_coil_temp_c: number;
  peak_port_speed_m_s: number | null;
  amp_clip_s: number;
  max_compression_db: number;
}

export interface RenderSummary {
  duration_s: number;
  sample_rate: number;
  volts_fs: number;
  /** Planned Leq,C at the seat for this track and drive, dB. */
  spl_db: number;
  /** Calibration: seat pressure of a full-scale output sample, Pa. */
  pa_per_fs: number;
  /** The first driver way's peaks (the woofer of a first-version design); every way's in `ways`. */
  peak_excursion_mm: number;
  peak_radiator_mm: number | null;
  peak_coil_temp_c: number;
  peak_port_speed_m_s: number | null;
  amp_clip_s: number;
  max_compression_db: number;
  limiter_db: number;
  /** The summed output's largest compression: the part of the residual coherent with the linear output, dB. */
  output_compression_db: number;
  /** The summed output's largest distortion: the rest of the residual against the output, dB (null: never judged). */
  output_distortion_db: number | null;
  events: StressEvent[];
  realtime_factor: number;
  ways: WaySummary[];
}

export interface RenderBufferOptions extends LevelRequest {
  mode?: RenderMode;
  paPerFs?: number;
  /** Also return the linear and residual streams. */
  extraStreams?: boolean;
  /** The driver models' rate (renderer.ts RendererOptions.driverRate; default 'audio'). */
  driverRate?: DriverRate;
  /** Skip writing audio (headroom search): only the summary. */
  analysisOnly?: boolean;
  /**
   * Where the rendered audio goes as it is made, instead of into the result (whose `audio` is then
   * empty, and no side streams are kept): each call hands views of the next frames, from output
   * frame `at` on (the CLI writes its file during the render, and holds no copy of the output).
   */
  onAudio?: (frames: Float32Array[], at: number) => void;
  /**
   * Stop after the block in which the first stress event starts (with analysisOnly): the summary
   * then covers the track up to there. Events are marked as the frames go by and a start never
   * moves, so the first event (and any other starting in the same frame) is already final.
   */
  stopAtFirstEvent?: boolean;
  blockFrames?: number;
  onProgress?: (fraction: number) => void;
  /** Milliseconds clock for the realtime factor (default performance.now or Date.now). */
  clock?: () => number;
}

export interface RenderResult {
  /** Input frames the render ran through (less than the input's when it stopped at its first event). */
  framesRun: number;
  audio: Float32Array[];
  linear: Float32Array[] | null;
  residual: Float32Array[] | null;
  summary: RenderSummary;
  traces: Traces;
}

const r3 = (v: number) => Number(v.toFixed(3));

function waySummary(w: WayStats, sampleRate: number): WaySummary {
  return {
    name: w.name,
    peak_excursion_mm: r3(w.peakExcursionMm),
    peak_radiator_mm: w.outlet === 'radiator' ? r3(w.peakRadiatorMm) : null,
    peak_coil_temp_c: Number(w.peakCoilTempC.toFixed(2)),
    peak_port_speed_m_s: w.outlet === 'port' ? r3(w.peakPortSpeed) : null,
    amp_clip_s: Number((w.ampClipFrames / sampleRate).toFixed(4)),
    max_compression_db: r3(w.maxCompressionDb),
  };
}

function defaultClock(): () => number {
  const perf = (globalThis as { performance?: { now(): number } }).performance;
  return perf ? () => perf.now() : () => Date.now();
}

/** A drive level: explicit volts, a planned SPL, or the design's own; `leqPerVoltDb` when already measured on this track. */
export interface LevelRequest {
  voltsFs?: number;
  splDb?: number;
  /** The track's Leq,C at the seat per volt (seatLeqCPerVolt), dB: given, the calibration pass is not run again. */
  leqPerVoltDb?: number;
  /** A second thread for a share of the lanes of the calibration and the render (lane-share.ts); same output. */
  helper?: LaneHelper;
}

export function resolveVolts(
  sys: SpeakerSystem,
  channels: ArrayLike<number>[],
  sampleRate: number,
  opt: LevelRequest,
): { volts: number; spl: number; leqPerVoltDb: number } {
  const level = sys.listening.level;
  const explicit = opt.voltsFs ?? (opt.splDb === undefined && level.mode === 'volts' ? level.voltsFs : undefined);
  if (explicit !== undefined) {
    // A drive in volts needs no level from the audio; silent audio then has no SPL (-Infinity).
    let l1 = opt.leqPerVoltDb ?? -Infinity;
    if (opt.leqPerVoltDb === undefined) {
      try {
        l1 = seatLeqCPerVolt(sys, channels, sampleRate, opt.helper);
      } catch (e) {
        if (!(e instanceof InputProblem)) throw e;
      }
    }
    return { volts: explicit, spl: l1 + 20 * Math.log10(explicit), leqPerVoltDb: l1 };
  }
  const l1 = opt.leqPerVoltDb ?? seatLeqCPerVolt(sys, channels, sampleRate, opt.helper);
  if (!Number.isFinite(l1)) throw new InputProblem('the audio is silent in the band the design plays: a level cannot be set from it');
  const target = opt.splDb ?? (level.mode === 'spl' ? level.splDb : 0);
  const volts = Math.pow(10, (target - l1) / 20);
  return { volts, spl: l1 + 20 * Math.log10(volts), leqPerVoltDb: l1 };
}

/** Chunks the helper thread may run ahead of the calling one (64 x 256 frames). */
const HELPER_CHUNKS_AHEAD = 64;

/** A whole-buffer render taken a few blocks at a time (startRender), so its caller can yield between. */
export interface RenderRun {
  /** Renders up to `blocks` more blocks; false once the render has ended (or stopped at its first event). */
  step(blocks: number): boolean;
  /** The result, once step() has returned false (or to end early: the frames so far). */
  finish(): RenderResult;
}

export function renderBuffer(
  sys: SpeakerSystem,
  channels: ArrayLike<number>[],
  sampleRate: number,
  opt: RenderBufferOptions = {},
): RenderResult {
  const run = startRender(sys, channels, sampleRate, opt);
  while (run.step(Number.POSITIVE_INFINITY));
  return run.finish();
}

/**
 * renderBuffer in steps. The CLI gives the event loop a turn between steps, so Ctrl-C is handled
 * while it writes its file during the render (output-files.ts).
 */
export function startRender(
  sys: SpeakerSystem,
  channels: ArrayLike<number>[],
  sampleRate: number,
  opt: RenderBufferOptions = {},
): RenderRun {
  const nCh = channels.length;
  const frames = channels[0]?.length ?? 0;
  if (nCh === 0 || frames === 0) throw new InputProblem('the audio is empty');
  const { volts, spl } = resolveVolts(sys, channels, sampleRate, opt);
  const clock = opt.clock ?? defaultClock();
  const t0 = clock();
  const rendererOptions = {
    sampleRate,
    channels: nCh,
    voltsFs: volts,
    mode: opt.mode,
    extraStreams: opt.extraStreams,
    driverRate: opt.driverRate,
    fixedMode: true,
  };
  const r = createRenderer(sys, { ...rendererOptions, paPerFs: opt.paPerFs });
  const lat = r.latencyFrames;
  const block = opt.blockFrames ?? 4096;
  const keep = !opt.analysisOnly && !opt.onAudio;
  const audio = keep ? Array.from({ length: nCh }, () => new Float32Array(frames)) : [];
  const linear = keep && opt.extraStreams ? Array.from({ length: nCh }, () => new Float32Array(frames)) : null;
  const residual = keep && opt.extraStreams ? Array.from({ length: nCh }, () => new Float32Array(frames)) : null;
  const inB = Array.from({ length: nCh }, () => new Float32Array(block));
  const outB = Array.from({ length: nCh }, () => new Float32Array(block));
  const linB = Array.from({ length: nCh }, () => new Float32Array(block));
  const resB = Array.from({ length: nCh }, () => new Float32Array(block));
  const extra = opt.extraStreams ? { linear: linB, residual: resB } : undefined;
  const total = frames + lat;
  let lastReport = 0;
  const plan = opt.helper ? r.helperPlan() : null;
  const ring = plan && plan.doubles > 0 ? new SlotRing(plan.doubles, HELPER_CHUNKS_AHEAD) : null;
  if (ring && plan) {
    const { lanes, twinsOnHelper } = plan;
    r.shareLanes('main', ring, lanes, twinsOnHelper);
    opt.helper!({
      kind: 'render',
      system: sys,
      sampleRate,
      channels: shareChannels(channels, plan.reads),
      frames,
      ring: ring.buffers,
      renderer: rendererOptions,
      lanes,
      twinsOnHelper,
      total,
      block,
    });
  }
  let ran = 0;
  const runBlock = (views: ArrayLike<number>[], s: number, n: number): boolean => {
    r.process(views, outB, n, extra);
    ran = Math.min(frames, s + n);
    if (opt.stopAtFirstEvent && r.events.count > 0) return false;
    // Drop the first `lat` output frames: the result is aligned with the input.
    const j0 = Math.max(0, lat - s),
      j1 = Math.min(n, frames + lat - s);
    if (opt.onAudio && !opt.analysisOnly && j1 > j0)
      opt.onAudio(
        outB.map((b) => b.subarray(j0, j1)),
        s + j0 - lat,
      );
    if (keep && j1 > j0) {
      for (let c = 0; c < nCh; c++) {
        audio[c].set(outB[c].subarray(j0, j1), s + j0 - lat);
        if (linear) linear[c].set(linB[c].subarray(j0, j1), s + j0 - lat);
        if (residual) residual[c].set(resB[c].subarray(j0, j1), s + j0 - lat);
      }
    }
    if (opt.onProgress && s - lastReport > sampleRate * 5) {
      lastReport = s;
      opt.onProgress(s / total);
    }
    return true;
  };
  // Where the next step starts (a multiple of the block), and whether the render has ended.
  let next = 0,
    ended = false;
  const step = (blocks: number): boolean => {
    if (ended) return false;
    let left = blocks,
      paused = false;
    try {
      forEachBlock(
        channels,
        frames,
        total,
        block,
        inB,
        (views, s, n) => {
          next = s + n;
          if (!runBlock(views, s, n)) return false;
          if (--left > 0 || next >= total) return true;
          paused = true;
          return false;
        },
        undefined,
        next,
      );
    } catch (e) {
      ended = true;
      ring?.stop();
      throw e;
    }
    if (!paused) ended = true;
    return !ended;
  };
  return { step, finish };

  function finish(): RenderResult {
    ended = true;
    ring?.stop();
    opt.onProgress?.(1);
    const seconds = (clock() - t0) / 1000;
    const st = r.getStats();
    const duration = frames / sampleRate;
    const ways = st.ways.map((w) => waySummary(w, sampleRate));
    const { name: _first, ...bass } = ways[0];
    const summary: RenderSummary = {
      duration_s: r3(duration),
      sample_rate: sampleRate,
      volts_fs: r3(volts),
      spl_db: Number(spl.toFixed(2)),
      pa_per_fs: Number(r.paPerFs.toPrecision(6)),
      ...bass,
      limiter_db: r3(st.limiterDb),
      output_compression_db: r3(st.outputCompressionDb),
      output_distortion_db: Number.isFinite(st.outputDistortionDb) ? Number(st.outputDistortionDb.toFixed(2)) : null,
      events: r.events.list(1 / sampleRate),
      realtime_factor: seconds > 0 ? Number((duration / seconds).toFixed(1)) : Infinity,
      ways,
    };
    return { framesRun: ran, audio, linear, residual, summary, traces: r.traces() };
  }
}

/** A render that clips its amplifier for more than this fraction of the track is warned about. */
export const CLIP_WARNING_FRACTION = 0.01;

/** Warnings a render's summary calls for: each way whose amplifier clipped on more than CLIP_WARNING_FRACTION of it. */
export function renderWarnings(s: RenderSummary): string[] {
  if (!(s.duration_s > 0)) return [];
  const several = s.ways.length > 1;
  return s.ways
    .filter((w) => w.amp_clip_s / s.duration_s > CLIP_WARNING_FRACTION)
    .map(
      (w) =>
        `the amplifier clips${several ? ` on the ${w.name} way` : ''} for ${Number(((100 * w.amp_clip_s) / s.duration_s).toFixed(2))}% of the track (over ${100 * CLIP_WARNING_FRACTION}%): the level asks more than it can give`,
    );
}

export interface Headroom {
  clean_volts: number;
  clean_spl_db: number;
  /** The limit that arrives first just above the clean level, or null if none was found. */
  first_limit: EventKind | null;
  /** The way whose limit it is (null: the summed output's distortion, or none found). */
  first_limit_way: string | null;
  first_limit_s: number | null;
  /** Renders it took. */
  renders: number;
  /** How many times over the track those renders ran, together (most stop at their first event). */
  passes: number;
}

export interface HeadroomOptions {
  /** Bisection step, dB (default 0.25). */
  tolDb?: number;
  startVolts?: number;
  /** Called before each probe render. */
  onRender?: () => void;
  /** Called after each probe with the passes over the track so far (Headroom.passes). */
  onPasses?: (passes: number) => void;
  /** The track's Leq,C per volt if already measured (resolveVolts), dB. */
  leqPerVoltDb?: number;
  /** Run every probe to the end of the track (the search as first written; for tests). */
  exact?: boolean;
  /** The driver models' rate in every probe (default 'audio'). */
  driverRate?: DriverRate;
  /** A second thread for every probe (lane-share.ts); same answer. */
  helper?: LaneHelper;
}

/**
 * The highest drive with no stress event on this track: bracket by 6 dB steps, then bisect the
 * gap in dB to tolDb (default 0.25), relying on stress growing with level.
 */
export function findHeadroom(sys: SpeakerSystem, channels: ArrayLike<number>[], sampleRate: number, opt: HeadroomOptions = {}): Headroom {
  const tol = opt.tolDb ?? 0.25;
  const l1 = opt.leqPerVoltDb ?? seatLeqCPerVolt(sys, channels, sampleRate, opt.helper);
  let renders = 0,
    passes = 0;
  const fast = opt.exact !== true;
  // The last clean probe's way summaries: the linear guess scales them.
  let cleanWays: WaySummary[] = [];
  let cleanResidualDb = -Infinity;
  const probe = (v: number) => {
    renders++;
    opt.onRender?.();
    // A probe with an event needs no more of the track: only whether there is one, and the first.
    const res = renderBuffer(sys, channels, sampleRate, {
      voltsFs: v,
      leqPerVoltDb: l1,
      analysisOnly: true,
      stopAtFirstEvent: fast,
      driverRate: opt.driverRate,
      helper: opt.helper,
    });
    passes += res.framesRun / Math.max(1, channels[0]?.length ?? 1);
    opt.onPasses?.(passes);
    if (res.summary.events.length === 0) {
      cleanWays = res.summary.ways;
      cleanResidualDb = -Infinity;
      for (const d of res.traces.residualDb) if (d > cleanResidualDb) cleanResidualDb = d;
    }
    return res.summary.events;
  };
  let peakIn = 0;
  for (const ch of channels) for (let j = 0; j < ch.length; j++) peakIn = Math.max(peakIn, Math.abs(ch[j]));
  if (!(peakIn > 0)) throw new InputProblem('the audio is silent: there is no level to find');
  const step = Math.pow(10, 6 / 20);
  // A very quiet track would need more drive than the model takes: search below that ceiling.
  const ceiling = MAX_VOLTS_FS * 0.999;
  let v = Math.min(opt.startVolts ?? sys.amplifier.vPeak / peakIn, ceiling);
  let ev = probe(v);
  let lo = 0,
    hi = 0,
    hiEvents = ev;
  const stepUp = Math.pow(10, tol / 20);
  // A probe just under a dirty one runs about as far into the track as that one's first event, and
  // a clean probe runs all of it: where walking a gap of `steps` search steps down one step at a
  // time costs less than half a clean probe, the fast search walks down (for a track that overloads
  // in its first seconds, the whole search then costs about one clean probe).
  const seconds = (channels[0]?.length ?? 0) / sampleRate;
  const cheapWalk = (events: StressEvent[], steps: number) =>
    fast && seconds > 0 && (Math.min(...events.map((e) => e.start_s)) / seconds) * steps < 0.5;
  if (ev.length > 0) {
    hi = v;
    for (let k = 0; k < 40 * 24; k++) {
      v = cheapWalk(hiEvents, 6 / tol) ? v / stepUp : v / step;
      ev = probe(v);
      if (ev.length === 0) {
        lo = v;
        break;
      }
      hi = v;
      hiEvents = ev;
    }
  } else {
    lo = v;
    for (let k = 0; k < 12 && v < ceiling; k++) {
      v = Math.min(v * step, ceiling);
      ev = probe(v);
      if (ev.length > 0) {
        hi = v;
        hiEvents = ev;
        break;
      }
      lo = v;
    }
  }
  if (hi === 0)
    return {
      clean_volts: r3(lo),
      clean_spl_db: Number((l1 + 20 * Math.log10(lo)).toFixed(2)),
      first_limit: null,
      first_limit_way: null,
      first_limit_s: null,
      renders,
      passes: Number(passes.toFixed(2)),
    };
  if (lo === 0) throw new InputProblem('no clean level found down to -240 dB: the design overloads at any level');
  // Clean probes run the whole track and probes with an event stop early, so the fast search first
  // tries the linear model's guess and then walks from it in steps that double while the verdict
  // holds (few clean probes when the guess is close); once the verdict turns it bisects as before.
  const wide = (a: number, b: number) => 20 * Math.log10(b / a) > tol * (1 + 1e-9);
  let guess = fast ? linearHeadroomGuess(sys, cleanWays, cleanResidualDb, lo) : null;
  // A guess outside the bracket starts one step inside it (from above, the probes are cheap).
  if (guess !== null) guess = Math.min(Math.max(guess, lo * stepUp), hi / stepUp);
  if (guess !== null && !(guess > lo && guess < hi)) guess = null;
  let walkDb = tol;
  let lastDirty: boolean | null = null;
  while (wide(lo, hi)) {
    const walkDown = cheapWalk(hiEvents, (20 * Math.log10(hi / lo)) / tol);
    if (guess !== null && !(guess > lo && guess < hi)) guess = null;
    const at = walkDown ? hi / stepUp : (guess ?? Math.sqrt(lo * hi));
    ev = probe(at);
    const dirty = ev.length > 0;
    if (dirty) {
      hi = at;
      hiEvents = ev;
    } else lo = at;
    if (walkDown) continue;
    if (guess !== null && (lastDirty === null || lastDirty === dirty)) {
      const next = at * Math.pow(10, ((dirty ? -1 : 1) * walkDb) / 20);
      walkDb *= 2;
      guess = next > lo && next < hi ? next : null;
      lastDirty = dirty;
    } else guess = null;
  }
  const first = hiEvents.reduce((a, b) => (b.start_s < a.start_s ? b : a));
  return {
    clean_volts: Number(lo.toPrecision(5)),
    clean_spl_db: Number((l1 + 20 * Math.log10(lo)).toFixed(2)),
    first_limit: first.kind,
    first_limit_way: first.way ?? null,
    first_limit_s: first.start_s,
    renders,
    passes: Number(passes.toFixed(2)),
  };
}
