// One way of the speaker as the renderer runs it, per channel lane.
// A driver way: its filter -> its own delay -> its gain and the drive level -> its amplifier channel
// (oversampled clipping at the rail) -> its driver-in-box model and that model's linear part -> room
// gain and baffle step -> polarity and acoustic offset. Each lane heats its own coil.
// A flat way (the first version's ideal upper band): its filter and the baffle step at its passband
// pressure per volt, delayed like the driver ways' clipping stage plus its own delay and offset.
import type { DriverWay, FlatWay, SpeakerSystem } from '../system.ts';
import { BiquadCascade, packSections } from '../filters/biquad.ts';
import { wayFilterBiquads } from '../filters/way-filter.ts';
import { baffleStepSection, roomGainSection } from '../filters/room.ts';
import { RENDER_HALFBAND } from '../filters/halfband.ts';
import type { WooferParams } from '../sim/params.ts';
import { LadderSim, LinearBehindLadder, wayParams } from '../sim/ladder.ts';
import { WooferSim } from '../sim/woofer.ts';
import { pairable, processPair } from '../sim/woofer-pair.ts';
import { LinearRecurrence } from '../sim/linear.ts';
import { thermalStep, type ThermalStep } from '../sim/thermal.ts';
import { OversampledClipper } from './amplifier.ts';
import { FractionalDelay } from './fractional-delay.ts';
import { LowRateModel, lowRateLatency } from './low-rate-model.ts';
import { measuredStage, type MeasuredStage } from './measured-stage.ts';
import { type ModelRate, modelRate } from './model-rate.ts';
import { keepShape } from '../keep-shape.ts';
import { copySamples } from './copy-samples.ts';

/** Frames per internal chunk: every stage runs over a chunk before the next one starts. */
export const CHUNK = 256;

/** Frames the clipping stage delays a driver way (its half-band filters). */
export const STAGE_DELAY = RENDER_HALFBAND.m;

/** Where a way's input comes from: one channel, or the mean of all of them (mono sum). */
export interface LaneSource {
  inputs: ArrayLike<number>[];
  /** First frame of the chunk in the inputs. */
  s: number;
  n: number;
  /** Output channels (missing inputs repeat the last one). */
  channels: number;
}

function fillLane(buf: Float64Array, src: LaneSource, lane: number, monoSum: boolean): void {
  const { inputs, s, n, channels } = src;
  const nIn = inputs.length;
  if (nIn === 0) buf.fill(0, 0, n);
  else if (monoSum) {
    for (let k = 0; k < n; k++) {
      let sum = 0;
      for (let c = 0; c < channels; c++) sum += inputs[c < nIn ? c : nIn - 1][s + k];
      buf[k] = sum / channels;
    }
  } else {
    copySamples(buf, inputs[lane < nIn ? lane : nIn - 1], s, n);
  }
}

/**
 * A lane whose linear twin can run apart from its full model: no model below the audio rate (its
 * full pressure takes the twin's) and no measured FIR (it filters both pressures together).
 */
export function separateTwin(lane: DriverLane): boolean {
  return lane.low === null && lane.measured === null;
}

function negate(a: Float64Array, n: number): void {
  for (let k = 0; k < n; k++) a[k] = -a[k];
}

export function replaceCascade(old: BiquadCascade | null, coef: Float64Array | null): BiquadCascade | null {
  if (!coef) return null;
  if (old && old.coef.length === coef.length) {
    old.coef.set(coef);
    return old;
  }
  return new BiquadCascade(coef);
}

/** Delays of each way in the sum, s: the acoustic offsets relative to the shallowest way. */
export function offsetDelays(sys: SpeakerSystem): number[] {
  const front = Math.min(...sys.ways.map((w) => w.offset));
  return sys.ways.map((w) => (w.offset - front) / sys.air.c);
}

/** A delay line, or null when the delay is zero (so a way without one is left bit for bit alone). */
function delayOrNull(old: FractionalDelay | null, samples: number): FractionalDelay | null {
  if (!(samples > 0)) return null;
  return old && old.samples === samples ? old : new FractionalDelay(samples);
}

/** A driver lane's per-chunk results (DriverLane.useBuffers). */
export interface LaneBuffers {
  uDel: Float64Array;
  pN: Float64Array;
  pL: Float64Array;
  x: Float64Array;
  outlet: Float64Array;
}

export class DriverLane {
  filter: BiquadCascade | null = null;
  drive: FractionalDelay | null = null;
  roomN: BiquadCascade | null = null;
  roomL: BiquadCascade | null = null;
  offsetN: FractionalDelay | null = null;
  offsetL: FractionalDelay | null = null;
  readonly clip = new OversampledClipper(RENDER_HALFBAND);
  sim: WooferSim;
  lin: LinearRecurrence;
  /** A passive way's network in front of the driver model, and the linear twin's own copy. */
  net: LadderSim | null = null;
  linNet: LinearBehindLadder | null = null;
  /** A measured response's correction after the driver model (null without one). */
  measured: MeasuredStage | null = null;
  /** Sum of i^2 since the last coil update. */
  i2 = 0;
  /**
   * The model at a low rate (low-rate-model.ts; `sim` is then its model), the delay that brings the
   * demand in line with it, and the wait that brings the lane in line with the renderer's common
   * low-rate delay (null where nothing is needed).
   */
  low: LowRateModel | null = null;
  lowDemand: FractionalDelay | null = null;
  wait: FractionalDelay | null = null;
  readonly u = new Float64Array(CHUNK);
  /** Clipped drive, V (the model's input). */
  readonly uClip = new Float64Array(CHUNK);
  /**
   * What the renderer reads of the lane after each chunk, written by its stages: the demanded
   * drive delayed like the clipped one (V), the seat pressure of the full model and of its linear
   * part (Pa, after polarity and offset), the cone excursion (m) and the outlet's flow (port, m^3/s)
   * or travel (radiator, m). Their own buffers, or views into shared memory when the lane runs on
   * another thread (useBuffers, lane-share.ts).
   */
  uDel: Float64Array = new Float64Array(CHUNK);
  pN: Float64Array = new Float64Array(CHUNK);
  pL: Float64Array = new Float64Array(CHUNK);
  x: Float64Array = new Float64Array(CHUNK);
  outlet: Float64Array = new Float64Array(CHUNK);
  /** Where the low-rate model writes: the residual into pN (the linear part is added after). */
  readonly lowOut: { residual: Float64Array; x: Float64Array; outlet: Float64Array } = {
    residual: this.pN,
    x: this.x,
    outlet: this.outlet,
  };

  /** The lane's results go to (or are read from) these buffers from now on. */
  useBuffers(b: LaneBuffers): void {
    this.uDel = b.uDel;
    this.pN = this.lowOut.residual = b.pN;
    this.pL = b.pL;
    this.x = this.lowOut.x = b.x;
    this.outlet = this.lowOut.outlet = b.outlet;
  }

  constructor(p: WooferParams) {
    keepShape(this);
    this.sim = new WooferSim(p);
    this.lin = new LinearRecurrence(p);
  }

  /**
   * Runs the model at 1/factor of the audio rate (1: the audio rate), from rest with the coil's heat
   * kept when the rate changes; the caller then gives it its constants.
   */
  setRate(rate: ModelRate, p: WooferParams, lowP: WooferParams | null, latency: number): void {
    if (rate.factor > 1 && lowP) {
      const low = new LowRateModel(lowP, rate.factor, rate.band, CHUNK);
      if (this.low?.factor === rate.factor) {
        // Only the drive's band moved: the model carries on (its resamplers start afresh).
        low.sim = this.low.sim;
        low.lin = this.low.lin;
      } else low.sim.setCoilRise(this.sim.riseV, this.sim.riseM);
      low.lin.rebuild(low.sim.r);
      this.low = low;
      this.sim = low.sim;
      this.lowDemand = new FractionalDelay(low.delay);
    } else if (this.low) {
      const sim = new WooferSim(p);
      sim.setCoilRise(this.sim.riseV, this.sim.riseM);
      this.sim = sim;
      this.low = this.lowDemand = null;
    }
    this.wait = delayOrNull(this.wait, latency - (this.low?.delay ?? 0));
  }

  /** Puts the way's passive network (or none) in front of both models; the network starts at rest. */
  wire(way: DriverWay, rs: number, p: WooferParams): void {
    if (!way.network) {
      this.net = this.linNet = null;
      return;
    }
    this.net = new LadderSim(way.network, rs, p.h);
    this.linNet = new LinearBehindLadder(this.lin, way.network, rs, p.h);
  }
}

export class DriverWayChain {
  way: DriverWay;
  params!: WooferParams;
  lanes: DriverLane[] = [];
  /** One lane fed by the mean of all channels (the bass way of a mono-sum pair). */
  readonly monoSum: boolean;
  private gain = 1;
  private polarity = 1;
  private rail = 0;
  private soft = false;
  readonly th: ThermalStep = { p11: 1, p12: 0, p21: 0, p22: 1, g1: 0, g2: 0 };
  /** Each lane's sum of i^2 from a chunk of the two-lane loop. */
  private readonly pairSums = new Float64Array(2);

  constructor(
    sys: SpeakerSystem,
    way: DriverWay,
    offsetS: number,
    channels: number,
    monoSum: boolean,
    private readonly sampleRate: number,
    /** Models may run below the audio rate where the way's filter allows (model-rate.ts). */
    private readonly lowRate = false,
  ) {
    keepShape(this);
    this.way = way;
    this.monoSum = monoSum;
    this.params = wayParams(sys, way, 1 / sampleRate);
    const nLanes = monoSum ? 1 : channels;
    for (let k = 0; k < nLanes; k++) this.lanes.push(new DriverLane(this.params));
    for (const lane of this.lanes) lane.wire(way, sys.amplifier.rs, this.params);
    this.applyRate(sys, way);
    this.configure(sys, way, offsetS);
  }

  /** The factor below the audio rate this way's models run at (1: the audio rate). */
  get rateFactor(): number {
    return this.lanes[0].low?.factor ?? 1;
  }

  /** Each lane's model at the rate the way's filter allows, new constants where the rate stays. */
  private applyRate(sys: SpeakerSystem, way: DriverWay): void {
    const rate = this.lowRate ? modelRate(sys, way, this.sampleRate) : { factor: 1, band: 0.5 };
    const lowP = rate.factor > 1 ? wayParams(sys, way, rate.factor / this.sampleRate) : null;
    const latency = lowRateLatency(this.lowRate);
    for (const lane of this.lanes) {
      const low = lane.low;
      if ((low?.factor ?? 1) !== rate.factor || (low && low.band !== rate.band)) lane.setRate(rate, this.params, lowP, latency);
      else if (lane.low && lowP) {
        lane.low.sim.setParams(lowP);
        const lin = new LinearRecurrence(lowP);
        lin.adoptState(lane.low.lin);
        lin.rebuild(lane.sim.r);
        lane.low.lin = lin;
      } else if (!lane.low) lane.setRate(rate, this.params, null, latency);
    }
  }

  /** Same shape of state (box kind), so an edit can keep the cone, the air and the heat moving. */
  canTake(way: DriverWay): boolean {
    return way.box.type === this.way.box.type;
  }

  /** A parameter edit: new constants, while the physical state carries on. */
  update(sys: SpeakerSystem, way: DriverWay, offsetS: number): void {
    const p = wayParams(sys, way, 1 / this.sampleRate);
    this.params = p;
    this.way = way;
    for (const lane of this.lanes) {
      if (!lane.low) lane.sim.setParams(p);
      const lin = new LinearRecurrence(p);
      lin.adoptState(lane.lin);
      lin.rebuild(lane.sim.r);
      lane.lin = lin;
      lane.wire(way, sys.amplifier.rs, p);
    }
    this.applyRate(sys, way);
    this.configure(sys, way, offsetS);
  }

  private configure(sys: SpeakerSystem, way: DriverWay, offsetS: number): void {
    const fsr = this.sampleRate;
    const filter = wayFilterBiquads(way.filter, fsr);
    const roomOnly = roomGainSection(sys.listening.roomGainHz, fsr);
    const baffle = baffleStepSection(sys.listening.baffleWidth ?? 0, fsr);
    const room = roomOnly && baffle ? packSections([roomOnly, baffle]) : (roomOnly ?? baffle);
    for (const lane of this.lanes) {
      lane.filter = replaceCascade(lane.filter, filter);
      lane.drive = delayOrNull(lane.drive, way.filter.delay * fsr);
      lane.roomN = replaceCascade(lane.roomN, room);
      lane.roomL = replaceCascade(lane.roomL, room);
      lane.offsetN = delayOrNull(lane.offsetN, offsetS * fsr);
      lane.offsetL = delayOrNull(lane.offsetL, offsetS * fsr);
      lane.measured = measuredStage(sys, way, fsr, lane.measured);
    }
    thermalStep(way.driver.thermal, CHUNK / fsr, this.th);
    this.gain = way.filter.gain;
    this.polarity = way.polarity;
    this.rail = sys.amplifier.vPeak;
    this.soft = sys.amplifier.clip === 'soft';
  }

  /**
   * One chunk of every lane, or of the lanes `runs` marks (lane-share.ts runs the others on a
   * second thread; with `twinsElsewhere` the linear twins of those lanes that allow it are left to
   * runTwins there). `frameEnd` is the renderer's frame count at the end of the chunk: the coil
   * heats from the mean i^2 of each CHUNK frames of the renderer's own clock.
   */
  process(src: LaneSource, volts: number, frameEnd: number, runs?: readonly boolean[], twinsElsewhere = false): void {
    const n = src.n;
    // Gain 1 leaves the drive exactly as the first version computed it.
    const drive = volts * this.gain;
    // A stereo pair of lanes that both run here steps its two models together (sim/woofer-pair.ts).
    const pair = this.lanes.length === 2 && (!runs || (runs[0] && runs[1])) && this.pairsLanes();
    for (let w = 0; w < this.lanes.length; w++) {
      if (runs && !runs[w]) continue;
      const lane = this.lanes[w];
      const u = lane.u;
      fillLane(u, src, w, this.monoSum);
      if (lane.wait) lane.wait.process(u, n);
      if (lane.filter) lane.filter.processInPlace(u, 0, n);
      if (lane.drive) lane.drive.process(u, n);
      for (let k = 0; k < n; k++) u[k] *= drive;
      lane.clip.process(u, n, this.rail, this.soft, lane.uClip, lane.uDel);
      if (pair) continue;
      const sim = lane.sim;
      if (separateTwin(lane)) {
        this.afterModel(
          lane,
          sim.processBlock(lane.uClip, n, lane.pN, lane.x, lane.outlet, lane.net ?? undefined),
          n,
          frameEnd,
          twinsElsewhere,
        );
        continue;
      }
      let i2: number;
      if (lane.low) {
        // The residual from the low rate, the linear part at the audio rate on the demand in line with it.
        i2 = lane.low.process(lane.uClip, lane.uDel, n, lane.lowOut);
        lane.lowDemand!.process(lane.uDel, n);
        lane.lin.processBlock(lane.uDel, lane.pL, n);
        const pN = lane.pN,
          pL = lane.pL;
        for (let k = 0; k < n; k++) pN[k] += pL[k];
      } else {
        i2 = sim.processBlock(lane.uClip, n, lane.pN, lane.x, lane.outlet, lane.net ?? undefined);
        if (lane.linNet) lane.linNet.processBlock(lane.uDel, lane.pL, n);
        else lane.lin.processBlock(lane.uDel, lane.pL, n);
      }
      if (lane.roomN) {
        lane.roomN.processInPlace(lane.pN, 0, n);
        lane.roomL!.processInPlace(lane.pL, 0, n);
      }
      lane.measured?.process(lane.pN, lane.pL, n);
      lane.i2 += i2;
      if (this.heatCoil(lane, frameEnd)) this.followCoil(lane, frameEnd);
      if (this.polarity !== 1) {
        negate(lane.pN, n);
        negate(lane.pL, n);
      }
      lane.offsetN?.process(lane.pN, n);
      lane.offsetL?.process(lane.pL, n);
    }
    if (pair) {
      const [a, b] = this.lanes;
      processPair(a.sim, b.sim, a, b, n, this.pairSums);
      this.afterModel(a, this.pairSums[0], n, frameEnd, twinsElsewhere);
      this.afterModel(b, this.pairSums[1], n, frameEnd, twinsElsewhere);
    }
  }

  /**
   * Whether the two lanes' models can step together when both run on one thread: each on its own
   * twin (separateTwin), without a passive network, in a box the two-lane loop knows.
   */
  pairsLanes(): boolean {
    if (this.lanes.length !== 2) return false;
    const [a, b] = this.lanes;
    return separateTwin(a) && separateTwin(b) && !a.net && !b.net && pairable(a.sim, b.sim);
  }

  /** After a lane's model (on its own twin): the heat it made (i2), the room, polarity and offset, then the twin unless it runs elsewhere. */
  private afterModel(lane: DriverLane, i2: number, n: number, frameEnd: number, twinsElsewhere: boolean): void {
    // The full model's path, then the twin's (pN and pL never meet in a lane): one after the other
    // here, or the twin on the thread that sums them.
    lane.i2 += i2;
    lane.roomN?.processInPlace(lane.pN, 0, n);
    this.heatCoil(lane, frameEnd);
    if (this.polarity !== 1) negate(lane.pN, n);
    lane.offsetN?.process(lane.pN, n);
    if (!twinsElsewhere) this.runTwin(lane, n, frameEnd);
  }

  /** The linear twins of the lanes `runs` marks whose twin process() left to this thread (after their coil's R arrived). */
  runTwins(n: number, frameEnd: number, runs: readonly boolean[]): void {
    for (let w = 0; w < this.lanes.length; w++) if (runs[w] && separateTwin(this.lanes[w])) this.runTwin(this.lanes[w], n, frameEnd);
  }

  /** A lane's linear twin over the chunk, after the coil's heat of the chunk: the demand -> pL. */
  private runTwin(lane: DriverLane, n: number, frameEnd: number): void {
    if (lane.linNet) lane.linNet.processBlock(lane.uDel, lane.pL, n);
    else lane.lin.processBlock(lane.uDel, lane.pL, n);
    lane.roomL?.processInPlace(lane.pL, 0, n);
    if (frameEnd % CHUNK === 0) this.followCoil(lane, frameEnd);
    if (this.polarity !== 1) negate(lane.pL, n);
    lane.offsetL?.process(lane.pL, n);
  }

  /**
   * Coil heating from the mean i^2 of each CHUNK frames in the hot resistance (the exact two-node
   * step), at the end of each CHUNK frames of the renderer's clock: true when it stepped.
   */
  private heatCoil(lane: DriverLane, frameEnd: number): boolean {
    if (frameEnd % CHUNK !== 0) return false;
    const p = this.params;
    const sim = lane.sim;
    const pw = (lane.i2 / CHUNK) * p.re0 * (1 + p.alphaR * sim.riseV);
    const th = this.th;
    sim.setCoilRise(th.p11 * sim.riseV + th.p12 * sim.riseM + th.g1 * pw, th.p21 * sim.riseV + th.p22 * sim.riseM + th.g2 * pw);
    lane.i2 = 0;
    return true;
  }

  /**
   * The linear part follows the coil's resistance every fourth step of the heat, so heat is not
   * counted as distortion. Called where a CHUNK of the renderer's clock ends.
   */
  private followCoil(lane: DriverLane, frameEnd: number): void {
    const sim = lane.sim;
    if ((frameEnd / CHUNK) % 4 === 0 && Math.abs(sim.r - lane.lin.r) > 1e-4 * lane.lin.r) {
      lane.lin.rebuild(sim.r);
      lane.low?.lin.rebuild(sim.r);
    }
  }

  /** The lane heard on output channel c. */
  laneFor(c: number): DriverLane {
    return this.lanes[this.monoSum ? 0 : c];
  }
}

export class FlatWayChain {
  way: FlatWay;
  private filters: (BiquadCascade | null)[];
  private delays: FractionalDelay[];
  /** Seat pressure of each channel's band for the current chunk, Pa. */
  readonly out: Float64Array[];
  private paPerV = 0;

  constructor(
    sys: SpeakerSystem,
    way: FlatWay,
    offsetS: number,
    channels: number,
    private readonly sampleRate: number,
    private readonly lowRate = false,
  ) {
    keepShape(this);
    this.way = way;
    this.out = Array.from({ length: channels }, () => new Float64Array(CHUNK));
    this.filters = this.out.map(() => null);
    this.delays = [];
    this.update(sys, way, offsetS);
  }

  update(sys: SpeakerSystem, way: FlatWay, offsetS: number): void {
    const fsr = this.sampleRate;
    this.way = way;
    const filter = wayFilterBiquads(way.filter, fsr);
    // The baffle shapes the whole front, so the flat band steps with it.
    const baffle = baffleStepSection(sys.listening.baffleWidth ?? 0, fsr);
    const coef = filter && baffle ? packSections([filter, baffle]) : (filter ?? baffle);
    this.filters = this.filters.map((f) => replaceCascade(f, coef));
    // Aligned with the driver ways, whose clipping stage delays them by STAGE_DELAY frames (and the
    // common low-rate delay).
    const samples = STAGE_DELAY + lowRateLatency(this.lowRate) + (way.filter.delay + offsetS) * fsr;
    this.delays = this.out.map((_, c) => (this.delays[c]?.samples === samples ? this.delays[c] : new FractionalDelay(samples)));
    this.paPerV = way.paPerV;
  }

  /** One chunk of every channel, or of the channels `runs` marks. */
  process(src: LaneSource, volts: number, runs?: readonly boolean[]): void {
    const n = src.n;
    // The first version's order of operations: polarity·Pa/V·volts, then the way's gain (exact when 1).
    const g = this.way.polarity * this.paPerV * volts * this.way.filter.gain;
    for (let c = 0; c < this.out.length; c++) {
      if (runs && !runs[c]) continue;
      const b = this.out[c];
      fillLane(b, src, c, false);
      this.filters[c]?.processInPlace(b, 0, n);
      this.delays[c].process(b, n);
      for (let k = 0; k < n; k++) b[k] *= g;
    }
  }
}
