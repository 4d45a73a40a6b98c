// The streaming renderer: audio in -> each way's chain (way-chain.ts) per channel lane -> the ways
// summed at the seat -> one calibration factor and the true-peak guard (output-guard.ts) -> audio
// out, with stress events (stress-meter.ts) and decimated traces (trace-recorder.ts). State is
// carried across calls; no allocation per block. The driver models run at the audio rate (with
// `driverRate: 'reduced'`, below it where a way's filter leaves nothing above the low rate's band:
// low-rate-model.ts, model-rate.ts); the amplifier's clipping, whose harmonics reach the top of the
// band, runs oversampled.
import { InputProblem } from '../issues.ts';
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { passbandPaPerV } from '../level/calibration.ts';
import { EventLog } from './events.ts';
import { CHUNK, DriverWayChain, FlatWayChain, type LaneSource, offsetDelays, STAGE_DELAY, type DriverLane } from './way-chain.ts';
import { emptyWayStats, OutputDistortion, WayStress, type WayStats } from './stress-meter.ts';
import { TraceRecorder, type Traces } from './trace-recorder.ts';
import { OutputGuard, type RenderMode, type SampleBuffer, type SideStreams } from './output-guard.ts';
import { roomStreamsFor, type RoomStreams } from '../room/stage.ts';
import { lowRateLatency } from './low-rate-model.ts';
import { assignLanes, channelsRead, helperLaneDoubles, LaneSlots, twinsOnHelper } from './lane-share.ts';
import type { SlotRing } from './slot-ring.ts';
import { keepShape } from '../keep-shape.ts';

export type { RenderMode, SampleBuffer } from './output-guard.ts';
export {
  COMPRESSION_LIMIT_DB,
  DISTORTION_FLOOR_PA,
  DISTORTION_WINDOW_S,
  DISTORTION_WITHIN_DB,
  XLIM_FRACTION,
  type WayStats,
} from './stress-meter.ts';
export type { Traces, WayTraces } from './trace-recorder.ts';

export interface RendererOptions {
  sampleRate: number;
  /** Input and output channels (1..8). */
  channels: number;
  /** Amplifier peak volts for a digital full-scale sample. */
  voltsFs: number;
  /** Stream written by process(): the full model (default), its linear part, or the difference. */
  mode?: RenderMode;
  /** Calibration: seat pressure (Pa) of a full-scale output sample. Default: 2× the passband pressure of a full-scale input. */
  paPerFs?: number;
  /** Trace points per second (default 100). */
  traceHz?: number;
  /** Also guard side outputs for the linear and residual streams (process(..., extra)). */
  extraStreams?: boolean;
  /**
   * 'audio' (default): every driver model at the audio rate, sample for sample the first version;
   * 'reduced': each driver way's model at the lowest rate its filter allows (model-rate.ts). Not
   * the default: measured side by side it is within a few per cent of the audio rate's time
   * (`npm run bench -- render`), so it buys nothing yet for its latency and its approximation.
   */
  driverRate?: DriverRate;
  /**
   * The mode is never changed (setMode is not called) and only the heard stream is used (a file
   * render): the room then runs on that stream alone. The heard stream is the same either way.
   */
  fixedMode?: boolean;
}

export type DriverRate = 'reduced' | 'audio';

/** Peaks so far: the top-level fields are the first driver way's, `ways` has every driver way's. */
export interface RenderStats {
  frames: number;
  peakExcursionMm: number;
  peakRadiatorMm: number;
  peakCoilTempC: number;
  peakPortSpeed: number;
  ampClipFrames: number;
  maxCompressionDb: number;
  limiterDb: number;
  /** The summed output's largest coherent compression, dB (level/distortion.ts). */
  outputCompressionDb: number;
  /** The summed output's largest distortion (incoherent residual over output), dB. */
  outputDistortionDb: number;
  ways: WayStats[];
}

type WayChain = DriverWayChain | FlatWayChain;

/** Highest drive the model takes, peak volts per full-scale sample (far above any real amplifier). */
export const MAX_VOLTS_FS = 1e4;

const driveMessage = (v: number) =>
  `the drive must be above 0 and under ${MAX_VOLTS_FS} V per full-scale sample, got ${Number.isFinite(v) ? Number(v.toPrecision(4)) : v} V`;

export class Renderer {
  readonly sampleRate: number;
  readonly channels: number;
  /** Frames from input to output (the clipping stage's filters + the true-peak look-ahead). */
  readonly latencyFrames: number;
  mode: RenderMode;
  voltsFs: number;
  paPerFs: number;
  system: SpeakerSystem;
  readonly events = new EventLog();
  readonly traceHz: number;
  /** The ways in the design's order, and the driver ways among them with their stress meters. */
  private chains: WayChain[] = [];
  private drivers: DriverWayChain[] = [];
  private stress: WayStress[] = [];
  private mono: boolean;
  private readonly distortion: OutputDistortion;
  private readonly recorder: TraceRecorder;
  private readonly guard: OutputGuard;
  private readonly streams: { nonlinear: Float64Array[]; linear: Float64Array[]; residual: Float64Array[] };
  private readonly src: LaneSource = { inputs: [], s: 0, n: 0, channels: 1 };
  private frames = 0;
  private limiterDb = 0;
  /** Models below the audio rate allowed, and the frames every driver way then waits (low-rate-model.ts). */
  private readonly lowRate: boolean;
  private readonly wayDelay: number;
  /** The one stream the room has to run on (a fixed mode without side streams), or undefined: all. */
  private readonly roomOnly: 'nonlinear' | 'linear' | undefined;
  /** The listening room on the summed output (none without a room). */
  private room: { key: string; streams: RoomStreams } | null = null;
  /**
   * Lanes shared with a second thread (lane-share.ts): the helper's lanes[k][w], the ones this
   * renderer runs, and the ring between them.
   */
  private share: {
    role: 'main' | 'helper';
    lanes: boolean[][];
    runs: boolean[][];
    twinsOnHelper: boolean;
    ring: SlotRing;
    slots: LaneSlots;
  } | null = null;

  constructor(sys: SpeakerSystem, opt: RendererOptions) {
    if (!(opt.sampleRate >= 8000 && opt.sampleRate <= 384000))
      throw new InputProblem(`the sample rate must be 8000 to 384000 Hz, got ${opt.sampleRate} Hz`);
    if (!(Number.isInteger(opt.channels) && opt.channels >= 1 && opt.channels <= 8))
      throw new InputProblem(`the audio must have 1 to 8 channels, got ${opt.channels}`);
    if (!(opt.voltsFs > 0 && opt.voltsFs < MAX_VOLTS_FS)) throw new InputProblem(driveMessage(opt.voltsFs));
    keepShape(this);
    this.system = sys;
    this.sampleRate = opt.sampleRate;
    this.channels = opt.channels;
    this.mode = opt.mode ?? 'nonlinear';
    this.voltsFs = opt.voltsFs;
    this.mono = sys.listening.channels === 'mono-sum';
    this.guard = new OutputGuard(opt.channels, opt.sampleRate, opt.extraStreams === true);
    this.lowRate = opt.driverRate === 'reduced';
    this.wayDelay = STAGE_DELAY + lowRateLatency(this.lowRate);
    this.latencyFrames = this.wayDelay + this.guard.latency;
    const heard = opt.fixedMode && !opt.extraStreams ? this.mode : undefined;
    this.roomOnly = heard === 'nonlinear' || heard === 'linear' ? heard : undefined;
    const bufs = () => Array.from({ length: opt.channels }, () => new Float64Array(CHUNK));
    this.streams = { nonlinear: bufs(), linear: bufs(), residual: bufs() };
    this.traceHz = opt.traceHz ?? 100;
    this.recorder = new TraceRecorder(opt.sampleRate, this.traceHz);
    this.distortion = new OutputDistortion(opt.sampleRate);
    this.build(sys, true);
    this.paPerFs = opt.paPerFs ?? 2 * passbandPaPerV(sys) * opt.voltsFs;
  }

  /**
   * What a helper thread would best run (lane-share.ts), or runs given `lanes`: lanes[k][w] for
   * lane w of way k, the doubles per chunk they hand over (0: none) and the input channels they read.
   */
  helperPlan(lanes = assignLanes(this.chains, this.channels)): {
    lanes: boolean[][];
    twinsOnHelper: boolean;
    doubles: number;
    reads: boolean[];
  } {
    return {
      lanes,
      twinsOnHelper: twinsOnHelper(this.chains, lanes, this.channels),
      doubles: helperLaneDoubles(this.chains, lanes),
      reads: channelsRead(this.chains, lanes, this.channels),
    };
  }

  /**
   * Splits the lanes with a second thread through `ring` (lane-share.ts): `lanes` are the helper's.
   * As 'main' this renderer runs the others and takes the helper's from the ring; as 'helper' it
   * runs only those into the ring (its outputs are not written). For fixed renders of whole
   * buffers: the other side must be fed the same blocks, and neither is edited or reset on the way.
   * With `twinsOnHelper` the helper runs its lanes' linear twins too.
   */
  shareLanes(role: 'main' | 'helper', ring: SlotRing, lanes: boolean[][], twinsOnHelper: boolean): void {
    const runs = role === 'helper' ? lanes : lanes.map((l) => l.map((h) => !h));
    this.share = { role, lanes, runs, twinsOnHelper, ring, slots: new LaneSlots(this.chains, lanes) };
  }

  /** Can the running ways take this design's constants while keeping their state? */
  private sameShape(sys: SpeakerSystem): boolean {
    if (sys.ways.length !== this.chains.length) return false;
    return sys.ways.every((way, k) => {
      const chain = this.chains[k];
      if (way.kind === 'flat') return chain instanceof FlatWayChain;
      return chain instanceof DriverWayChain && chain.canTake(way) && chain.monoSum === this.sharesLane(sys, way);
    });
  }

  /** In a mono-sum pair the bass way (the first driver way) plays the channels' mean from one lane. */
  private sharesLane(sys: SpeakerSystem, way: DriverWay): boolean {
    return this.mono && sys.ways.find((w) => w.kind === 'driver') === way;
  }

  /** (Re)computes every constant from the design. With fresh = false the running state is kept where it fits. */
  private build(sys: SpeakerSystem, fresh: boolean): void {
    const fsr = this.sampleRate;
    const offsets = offsetDelays(sys);
    if (fresh || !this.sameShape(sys)) {
      this.chains = sys.ways.map((way, k) =>
        way.kind === 'driver'
          ? new DriverWayChain(sys, way, offsets[k], this.channels, this.sharesLane(sys, way), fsr, this.lowRate)
          : new FlatWayChain(sys, way, offsets[k], this.channels, fsr, this.lowRate),
      );
      fresh = true;
    } else {
      sys.ways.forEach((way, k) => {
        const chain = this.chains[k];
        if (way.kind === 'driver') (chain as DriverWayChain).update(sys, way, offsets[k]);
        else (chain as FlatWayChain).update(sys, way, offsets[k]);
      });
    }
    this.drivers = this.chains.filter((c): c is DriverWayChain => c instanceof DriverWayChain);
    const old = this.stress;
    this.stress = this.drivers.map((chain, k) => {
      const s = old[k]?.stats.name === chain.way.name ? old[k] : new WayStress(chain.way.name);
      s.configure(sys, chain.way, chain.params, this.events);
      return s;
    });
    this.recorder.setWays(this.drivers.map((d) => d.way.name));
    this.room = roomStreamsFor(sys, this.channels, fsr, fresh ? null : this.room);
    // When every driver way is shared, the channels' residuals are one: meter one channel.
    if (fresh) this.distortion.setChannels(this.drivers.every((d) => d.monoSum) ? 1 : this.channels, this.events);
  }

  /** A parameter edit: new constants, while the physical state (cone, air, heat, filters) carries on. */
  update(sys: SpeakerSystem): void {
    const mono = sys.listening.channels === 'mono-sum';
    this.system = sys;
    if (mono !== this.mono) {
      this.mono = mono;
      this.build(sys, true);
    } else this.build(sys, false);
  }

  setVoltsFs(v: number): void {
    if (!(v > 0 && v < MAX_VOLTS_FS)) throw new InputProblem(driveMessage(v));
    this.voltsFs = v;
  }

  setMode(m: RenderMode): void {
    if (this.roomOnly !== undefined && m !== this.mode) throw new Error('setMode on a renderer made with fixedMode');
    this.mode = m;
  }

  /** Passband seat pressure per amplifier volt (Pa/V) of the design (its bass way, with its gain). */
  get passbandPaPerV(): number {
    return passbandPaPerV(this.system);
  }

  reset(): void {
    this.build(this.system, true);
    this.guard.reset();
    this.frames = 0;
    this.limiterDb = 0;
    this.events.reset();
    this.recorder.restart();
    this.stress = this.drivers.map((chain) => {
      const s = new WayStress(chain.way.name);
      s.configure(this.system, chain.way, chain.params, this.events);
      return s;
    });
  }

  /**
   * One block. inputs[c][0..frames-1] in digital full scale (missing channels repeat the last one;
   * no channels = silence); outputs[c] receive the stream of `mode`. extra.linear / extra.residual
   * receive the other streams when the renderer was made with extraStreams.
   */
  process(inputs: ArrayLike<number>[], outputs: SampleBuffer[], frames: number, extra?: SideStreams): void {
    // Chunks end on multiples of CHUNK frames of the renderer's own clock, so the coil's heating
    // (updated there) and every sample come out the same whatever the caller's block size.
    for (let s = 0; s < frames; ) {
      const n = Math.min(CHUNK - (this.frames % CHUNK), frames - s);
      this.chunk(inputs, outputs, s, n, extra);
      s += n;
    }
    this.limiterDb = this.guard.reductionDb();
  }

  /** Step 1 of a chunk: every way's chain, or the lanes `runs` marks (with the twins that can run apart left out: `twinsElsewhere`). */
  private runChains(src: LaneSource, volts: number, frameEnd: number, runs: boolean[][] | undefined, twinsElsewhere = false): void {
    for (let k = 0; k < this.chains.length; k++) {
      const chain = this.chains[k];
      if (chain instanceof DriverWayChain) chain.process(src, volts, frameEnd, runs?.[k], twinsElsewhere);
      else chain.process(src, volts, runs?.[k]);
    }
  }

  private chunk(inputs: ArrayLike<number>[], outputs: SampleBuffer[], s: number, n: number, extra?: SideStreams): void {
    const nCh = this.channels;
    const src = this.src;
    src.inputs = inputs;
    src.s = s;
    src.n = n;
    src.channels = nCh;
    // 1. Every way's chain over the chunk.
    const volts = this.voltsFs;
    const frameEnd = this.frames + n;
    const share = this.share;
    if (share?.role === 'helper') {
      // The helper's lanes write straight into the chunk's slot; a stopped ring wants no more.
      const slot = share.ring.nextFree();
      if (slot) {
        share.slots.attach(slot);
        this.runChains(src, volts, frameEnd, share.runs, !share.twinsOnHelper);
        share.slots.writeCoils(slot);
        share.ring.publish();
      }
      this.frames += n;
      return;
    }
    this.runChains(src, volts, frameEnd, share?.runs);
    if (share) {
      // The helper's lanes of this chunk are read in the ring until the meters are done with them.
      const slot = share.ring.nextFull();
      share.slots.attach(slot);
      share.slots.readCoils(slot);
      // Their linear twins run here unless the helper runs them (whichever evens out the threads' work).
      for (let k = 0; k < this.chains.length && !share.twinsOnHelper; k++) {
        const chain = this.chains[k];
        if (chain instanceof DriverWayChain) chain.runTwins(n, frameEnd, share.lanes[k]);
      }
    }
    // 2. The ways summed per channel: the full model, its linear part, and their difference (which
    // only driver ways have). The first way is copied, so one way passes through unchanged.
    const { nonlinear: outN, linear: outL, residual: outR } = this.streams;
    for (let c = 0; c < nCh; c++) {
      const on = outN[c],
        ol = outL[c],
        or = outR[c];
      let firstWay = true,
        firstDriver = true;
      for (const chain of this.chains) {
        if (chain instanceof DriverWayChain) {
          const lane = chain.laneFor(c);
          addDriverWay(lane.pN, lane.pL, n, on, ol, or, firstWay, firstDriver);
          firstDriver = false;
        } else addFlatWay(chain.out[c], n, on, ol, firstWay);
        firstWay = false;
      }
    }
    // 3. Stress; times refer to the input (the driver ways run `wayDelay` frames late).
    const t0 = (this.frames - this.wayDelay) / this.sampleRate,
      dt = 1 / this.sampleRate;
    this.distortion.measure(outN, outL, outR, n, t0, dt, this.events);
    for (let w = 0; w < this.drivers.length; w++) this.stress[w].measure(this.drivers[w].lanes, n, t0, dt, this.events);
    share?.ring.release();
    this.recorder.advance(n, this.stress, this.distortion);
    // The room changes what the listener hears, not what the drivers do: after the stress meters.
    this.room?.streams.process(this.streams, n, this.roomOnly);
    // 4. Calibration and the true-peak guard.
    this.guard.write(this.mode, this.streams, n, 1 / this.paPerFs, outputs, s, extra);
    this.frames += n;
  }

  /** Peaks so far. */
  getStats(): RenderStats {
    const ways = this.stress.map((s) => ({ ...s.stats }));
    const first = ways[0] ?? emptyWayStats('', null);
    return {
      frames: this.frames,
      peakExcursionMm: first.peakExcursionMm,
      peakRadiatorMm: first.peakRadiatorMm,
      peakCoilTempC: first.peakCoilTempC,
      peakPortSpeed: first.peakPortSpeed,
      ampClipFrames: first.ampClipFrames,
      maxCompressionDb: first.maxCompressionDb,
      limiterDb: this.limiterDb,
      outputCompressionDb: this.distortion.maxCompressionDb,
      outputDistortionDb: this.distortion.maxRatio > 0 ? 10 * Math.log10(this.distortion.maxRatio) : -Infinity,
      ways,
    };
  }

  traces(): Traces {
    return this.recorder.traces();
  }

  clearTraces(): void {
    this.recorder.clear();
  }

  /** The model of one lane of a driver way (default: the first driver way), for tests and meters. */
  lane(k = 0, way = 0): Pick<DriverLane, 'sim' | 'lin'> {
    const lane = this.drivers[way].lanes[k];
    return { sim: lane.sim, lin: lane.lin };
  }
}

/**
 * A driver way's lane into a channel's sums in one pass: the full model's output into `on`, its
 * linear twin's into `ol`, their difference into `or` (each written where the way is the first of
 * its kind, added to otherwise: every element the same additions as three passes made).
 */
function addDriverWay(
  pN: Float64Array,
  pL: Float64Array,
  n: number,
  on: Float64Array,
  ol: Float64Array,
  or: Float64Array,
  firstWay: boolean,
  firstDriver: boolean,
): void {
  if (firstWay) {
    for (let k = 0; k < n; k++) {
      const a = pN[k],
        b = pL[k];
      or[k] = a - b;
      on[k] = a;
      ol[k] = b;
    }
  } else if (firstDriver) {
    for (let k = 0; k < n; k++) {
      const a = pN[k],
        b = pL[k];
      or[k] = a - b;
      on[k] += a;
      ol[k] += b;
    }
  } else {
    for (let k = 0; k < n; k++) {
      const a = pN[k],
        b = pL[k];
      or[k] += a - b;
      on[k] += a;
      ol[k] += b;
    }
  }
}

/** A way without a driver model (its output is its own linear part) into a channel's sums. */
function addFlatWay(p: Float64Array, n: number, on: Float64Array, ol: Float64Array, firstWay: boolean): void {
  if (firstWay) {
    for (let k = 0; k < n; k++) on[k] = ol[k] = p[k];
  } else {
    for (let k = 0; k < n; k++) {
      const a = p[k];
      on[k] += a;
      ol[k] += a;
    }
  }
}

export function createRenderer(sys: SpeakerSystem, opt: RendererOptions): Renderer {
  return new Renderer(sys, opt);
}
