// The streaming renderer: audio in -> crossover -> amplifier (clipping at twice the rate) -> woofer
// model -> seat pressure + flat high band -> one calibration factor -> true-peak guard -> audio out,
// with stress events and decimated traces. State is carried across calls; no allocation per block.
// The woofer model runs at the audio rate: its own nonlinearities act on the cone and port motion,
// which lie far below the audio band's top; the amplifier's clipping, whose harmonics reach it,
// runs oversampled.
import type { SpeakerSystem } from '../system.ts';
import { BiquadCascade, packSections } from '../filters/biquad.ts';
import { designCrossover } from '../filters/crossover.ts';
import { baffleStepSection, roomGainSection } from '../filters/room.ts';
import { RENDER_HALFBAND } from '../filters/halfband.ts';
import { wooferParams, type WooferParams } from '../sim/params.ts';
import { WooferSim } from '../sim/woofer.ts';
import { LinearRecurrence } from '../sim/linear.ts';
import { thermalStep, type ThermalStep } from '../sim/thermal.ts';
import { TruePeakGuard } from '../level/truepeak.ts';
import { ResidualMeter } from '../level/distortion.ts';
import { OversampledClipper } from './amplifier.ts';
import { EventLog, EV_CLIP, EV_COIL, EV_COMPRESSION, EV_DISTORTION, EV_EXCURSION, EV_PORT, EV_RADIATOR, EV_XLIM } from './events.ts';

export type RenderMode = 'nonlinear' | 'linear' | 'residual';
export type SampleBuffer = Float32Array | Float64Array;

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
}

import { PORT_SPEED_LIMIT } from '../units.ts';
/** The residual within this many dB of the output counts as audible distortion. */
export const DISTORTION_WITHIN_DB = 20;
/** Sliding window of the distortion measure, s (one-pole energy averages). */
export const DISTORTION_WINDOW_S = 0.05;
/** Output below this seat pressure (Pa rms, 40 dB SPL) is not judged for distortion. */
export const DISTORTION_FLOOR_PA = 0.002;
/** Compression event threshold, dB below the cold-coil output. */
export const COMPRESSION_LIMIT_DB = 1;
/** |x| at this fraction of Xlim counts as reaching the end stop. */
export const XLIM_FRACTION = 0.98;

export interface Traces {
  hz: number;
  excursionMm: Float32Array;
  coilTempC: Float32Array;
  portSpeed: Float32Array;
  compressionDb: Float32Array;
  /** Residual level relative to the output, dB (-120 when silent). */
  residualDb: Float32Array;
}

export interface RenderStats {
  frames: number;
  peakExcursionMm: number;
  peakRadiatorMm: number;
  peakCoilTempC: number;
  peakPortSpeed: number;
  ampClipFrames: number;
  maxCompressionDb: number;
  limiterDb: number;
}

/** Frames per internal chunk: every stage runs over a chunk before the next one starts. */
const CHUNK = 256;

/** Highest drive the model takes, peak volts per full-scale sample (far above any real amplifier). */
export const MAX_VOLTS_FS = 1e4;

const driveMessage = (v: number) =>
  `the drive must be above 0 and under ${MAX_VOLTS_FS} V per full-scale sample, got ${Number.isFinite(v) ? Number(v.toPrecision(4)) : v} V`;

class Lane {
  lp: BiquadCascade | null;
  roomN: BiquadCascade | null = null;
  roomL: BiquadCascade | null = null;
  readonly clip: OversampledClipper;
  sim: WooferSim;
  lin: LinearRecurrence;
  readonly th: ThermalStep = { p11: 1, p12: 0, p21: 0, p22: 1, g1: 0, g2: 0 };
  i2 = 0;
  readonly meter: ResidualMeter;
  readonly u = new Float64Array(CHUNK);
  readonly uClip = new Float64Array(CHUNK);
  readonly uDel = new Float64Array(CHUNK);
  readonly pN = new Float64Array(CHUNK);
  readonly pL = new Float64Array(CHUNK);
  readonly x = new Float64Array(CHUNK);
  readonly port = new Float64Array(CHUNK);

  constructor(p: WooferParams, lp: Float64Array | null, sampleRate: number) {
    this.meter = new ResidualMeter(sampleRate, DISTORTION_WINDOW_S);
    this.lp = lp ? new BiquadCascade(lp) : null;
    this.clip = new OversampledClipper(RENDER_HALFBAND);
    this.sim = new WooferSim(p);
    this.lin = new LinearRecurrence(p);
  }
}

class Growable {
  data: Float32Array;
  n = 0;
  constructor(cap: number) {
    this.data = new Float32Array(Math.max(16, cap));
  }
  push(v: number): void {
    if (this.n === this.data.length) {
      const d = new Float32Array(this.data.length * 2);
      d.set(this.data);
      this.data = d;
    }
    this.data[this.n++] = v;
  }
  view(): Float32Array {
    return this.data.subarray(0, this.n);
  }
}

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
  private lanes: Lane[] = [];
  private mono: boolean;
  private hp: BiquadCascade[] | null = null;
  private hpSign = 1;
  private readonly hpBuf: Float64Array[];
  private readonly hpDelay: Float64Array[];
  private hpPos = 0;
  private readonly stageDelay: number;
  private readonly guard: TruePeakGuard;
  private readonly guardLin: TruePeakGuard | null;
  private readonly guardRes: TruePeakGuard | null;
  private readonly outN: Float64Array[];
  private readonly outL: Float64Array[];
  private readonly outR: Float64Array[];
  private readonly ratio = new Float64Array(CHUNK);
  private readonly xAbs = new Float64Array(CHUNK);
  private readonly aux = new Float64Array(CHUNK);
  private readonly dem = new Float64Array(CHUNK);
  private params!: WooferParams;
  private frames = 0;
  private xmax = 0;
  private xlimHit = 0;
  private xmaxP = 0;
  private rail = 0;
  private soft = false;
  private coilMax = 0;
  private ambient = 0;
  private r1dB = 0;
  private rCold = 0;
  private stats: RenderStats = emptyStats();
  readonly traceHz: number;
  private readonly traceEvery: number;
  private traceCount = 0;
  private tX = 0;
  private tP = 0;
  private tR = 0;
  private readonly trX = new Growable(1024);
  private readonly trT = new Growable(1024);
  private readonly trP = new Growable(1024);
  private readonly trC = new Growable(1024);
  private readonly trR = new Growable(1024);

  constructor(sys: SpeakerSystem, opt: RendererOptions) {
    if (!(opt.sampleRate >= 8000 && opt.sampleRate <= 384000))
      throw new RangeError(`the sample rate must be 8000 to 384000 Hz, got ${opt.sampleRate} Hz`);
    if (!(Number.isInteger(opt.channels) && opt.channels >= 1 && opt.channels <= 8))
      throw new RangeError(`the audio must have 1 to 8 channels, got ${opt.channels}`);
    if (!(opt.voltsFs > 0 && opt.voltsFs < MAX_VOLTS_FS)) throw new RangeError(driveMessage(opt.voltsFs));
    this.system = sys;
    this.sampleRate = opt.sampleRate;
    this.channels = opt.channels;
    this.mode = opt.mode ?? 'nonlinear';
    this.voltsFs = opt.voltsFs;
    this.mono = sys.listening.channels === 'mono-sum';
    this.stageDelay = RENDER_HALFBAND.m;
    this.guard = new TruePeakGuard(opt.channels, opt.sampleRate);
    this.guardLin = opt.extraStreams ? new TruePeakGuard(opt.channels, opt.sampleRate) : null;
    this.guardRes = opt.extraStreams ? new TruePeakGuard(opt.channels, opt.sampleRate) : null;
    this.latencyFrames = this.stageDelay + this.guard.latency;
    const bufs = () => Array.from({ length: opt.channels }, () => new Float64Array(CHUNK));
    this.outN = bufs();
    this.outL = bufs();
    this.outR = bufs();
    this.hpBuf = Array.from({ length: opt.channels }, () => new Float64Array(CHUNK));
    this.hpDelay = Array.from({ length: opt.channels }, () => new Float64Array(this.stageDelay + 1));
    this.traceHz = opt.traceHz ?? 100;
    this.traceEvery = Math.max(1, Math.round(opt.sampleRate / this.traceHz));
    this.build(sys, true);
    this.paPerFs = opt.paPerFs ?? 2 * this.params.passbandPaPerV * opt.voltsFs;
  }

  /** (Re)computes every constant from the design. With fresh = false the running state is kept. */
  private build(sys: SpeakerSystem, fresh: boolean): void {
    const fsr = this.sampleRate;
    const p = wooferParams(sys, 1 / fsr);
    this.params = p;
    const xo = designCrossover(sys.crossover, fsr);
    const nLanes = this.mono ? 1 : this.channels;
    if (fresh) {
      this.lanes = [];
      for (let k = 0; k < nLanes; k++) this.lanes.push(new Lane(p, xo.lp, fsr));
    } else {
      for (const lane of this.lanes) {
        lane.sim.setParams(p);
        const lin = new LinearRecurrence(p);
        lin.adoptState(lane.lin);
        lin.rebuild(lane.sim.r);
        lane.lin = lin;
        lane.lp = replaceCascade(lane.lp, xo.lp);
      }
    }
    const roomOnly = roomGainSection(sys.listening.roomGainHz, fsr);
    const baffle = baffleStepSection(sys.listening.baffleWidth ?? 0, fsr);
    const room = roomOnly && baffle ? packSections([roomOnly, baffle]) : (roomOnly ?? baffle);
    // The baffle shapes the whole front, so the flat high band steps with it.
    const hpCoef = xo.hp && baffle ? packSections([xo.hp, baffle]) : xo.hp;
    for (const lane of this.lanes) {
      thermalStep(sys.driver.thermal, CHUNK / fsr, lane.th);
      lane.roomN = replaceCascade(lane.roomN, room);
      lane.roomL = replaceCascade(lane.roomL, room);
    }
    if (fresh || !this.hp || !hpCoef) {
      this.hp = hpCoef ? Array.from({ length: this.channels }, () => new BiquadCascade(hpCoef)) : null;
    } else {
      this.hp = this.hp.map((c) => replaceCascade(c, hpCoef)!);
    }
    this.hpSign = xo.hpSign;
    const d = sys.driver;
    this.xmax = d.xmax;
    this.xlimHit = XLIM_FRACTION * p.xlim;
    this.xmaxP = p.xmaxP;
    this.rail = sys.amplifier.vPeak;
    this.soft = sys.amplifier.clip === 'soft';
    this.coilMax = d.thermal.coilMaxC;
    this.ambient = sys.air.temperatureC;
    this.rCold = d.re + sys.amplifier.rs;
    this.r1dB = this.rCold * Math.pow(10, COMPRESSION_LIMIT_DB / 20);
    const L = this.events.limits;
    L[EV_EXCURSION] = d.xmax * 1000;
    L[EV_XLIM] = p.xlim * 1000;
    L[EV_RADIATOR] = p.xmaxP * 1000;
    L[EV_COIL] = this.coilMax;
    L[EV_PORT] = PORT_SPEED_LIMIT;
    L[EV_CLIP] = this.rail;
    L[EV_COMPRESSION] = COMPRESSION_LIMIT_DB;
    L[EV_DISTORTION] = -DISTORTION_WITHIN_DB;
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
    if (!(v > 0 && v < MAX_VOLTS_FS)) throw new RangeError(driveMessage(v));
    this.voltsFs = v;
  }

  setMode(m: RenderMode): void {
    this.mode = m;
  }

  /** Passband seat pressure per amplifier volt (Pa/V), from the design's sensitivity. */
  get passbandPaPerV(): number {
    return this.params.passbandPaPerV;
  }

  reset(): void {
    this.build(this.system, true);
    this.guard.reset();
    this.guardLin?.reset();
    this.guardRes?.reset();
    for (const d of this.hpDelay) d.fill(0);
    for (const c of this.hp ?? []) c.reset();
    this.frames = 0;
    this.events.reset();
    this.clearTraces();
    this.stats = emptyStats();
  }

  /**
   * One block. inputs[c][0..frames-1] in digital full scale (missing channels repeat the last one;
   * no channels = silence); outputs[c] receive the stream of `mode`. extra.linear / extra.residual
   * receive the other streams when the renderer was made with extraStreams.
   */
  process(
    inputs: ArrayLike<number>[],
    outputs: SampleBuffer[],
    frames: number,
    extra?: { linear?: SampleBuffer[]; residual?: SampleBuffer[] },
  ): void {
    // Chunks end on multiples of CHUNK frames of the renderer's own clock, so the coil's heating
    // (updated there) and every sample come out the same whatever the caller's block size.
    for (let s = 0; s < frames; ) {
      const n = Math.min(CHUNK - (this.frames % CHUNK), frames - s);
      this.chunk(inputs, outputs, s, n, extra);
      s += n;
    }
    this.stats.frames = this.frames;
    this.stats.limiterDb = this.guard.reductionDb();
  }

  private chunk(
    inputs: ArrayLike<number>[],
    outputs: SampleBuffer[],
    s: number,
    n: number,
    extra?: { linear?: SampleBuffer[]; residual?: SampleBuffer[] },
  ): void {
    const nCh = this.channels,
      nIn = inputs.length;
    const lanes = this.lanes,
      nLanes = lanes.length;
    const volts = this.voltsFs,
      rail = this.rail,
      soft = this.soft;
    const p = this.params;
    // 1. Woofer lanes: crossover, amplifier (oversampled clipping), the model, its linear part.
    for (let w = 0; w < nLanes; w++) {
      const lane = lanes[w];
      const u = lane.u;
      if (nIn === 0) u.fill(0, 0, n);
      else if (this.mono) {
        for (let k = 0; k < n; k++) {
          let sum = 0;
          for (let c = 0; c < nCh; c++) sum += inputs[c < nIn ? c : nIn - 1][s + k];
          u[k] = sum / nCh;
        }
      } else {
        const src = inputs[w < nIn ? w : nIn - 1];
        for (let k = 0; k < n; k++) u[k] = src[s + k];
      }
      if (lane.lp) lane.lp.processInPlace(u, 0, n);
      for (let k = 0; k < n; k++) u[k] *= volts;
      lane.clip.process(u, n, rail, soft, lane.uClip, lane.uDel);
      const sim = lane.sim;
      const i2 = sim.processBlock(lane.uClip, n, lane.pN, lane.x, lane.port);
      lane.lin.processBlock(lane.uDel, lane.pL, n);
      if (lane.roomN) {
        lane.roomN.processInPlace(lane.pN, 0, n);
        lane.roomL!.processInPlace(lane.pL, 0, n);
      }
      // Coil heating from the mean i^2 of each CHUNK frames in the hot resistance; the exact two-node step.
      lane.i2 += i2;
      if ((this.frames + n) % CHUNK === 0) {
        const pw = (lane.i2 / CHUNK) * p.re0 * (1 + p.alphaR * sim.riseV);
        const th = lane.th;
        sim.setCoilRise(th.p11 * sim.riseV + th.p12 * sim.riseM + th.g1 * pw, th.p21 * sim.riseV + th.p22 * sim.riseM + th.g2 * pw);
        lane.i2 = 0;
        // The linear part follows the coil's resistance, so heat is not counted as distortion.
        if (((this.frames + n) / CHUNK) % 4 === 0 && Math.abs(sim.r - lane.lin.r) > 1e-4 * lane.lin.r) lane.lin.rebuild(sim.r);
      }
    }
    // 2. The flat high band of each channel, delayed like the woofer path.
    const hpGain = this.hpSign * p.passbandPaPerV * volts;
    if (this.hp) {
      for (let c = 0; c < nCh; c++) {
        const b = this.hpBuf[c];
        if (nIn === 0) b.fill(0, 0, n);
        else {
          const src = inputs[c < nIn ? c : nIn - 1];
          for (let k = 0; k < n; k++) b[k] = src[s + k];
        }
        this.hp[c].processInPlace(b, 0, n);
      }
    }
    // 3. Streams per channel (the high band delayed like the woofer path), distortion meters.
    const inv = 1 / this.paPerFs;
    const mode = this.mode;
    const dl = this.stageDelay + 1;
    const hpPos0 = this.hpPos;
    const outN = this.outN,
      outL = this.outL,
      outR = this.outR;
    for (let c = 0; c < nCh; c++) {
      const lane = lanes[this.mono ? 0 : c];
      const pN = lane.pN,
        pL = lane.pL;
      const on = outN[c],
        ol = outL[c],
        or = outR[c];
      if (this.hp) {
        const line = this.hpDelay[c],
          hb = this.hpBuf[c];
        let pos = hpPos0;
        for (let k = 0; k < n; k++) {
          line[pos] = hb[k];
          pos = pos + 1 === dl ? 0 : pos + 1;
          const hpv = line[pos] * hpGain;
          on[k] = pN[k] + hpv;
          ol[k] = pL[k] + hpv;
        }
      } else {
        for (let k = 0; k < n; k++) {
          on[k] = pN[k];
          ol[k] = pL[k];
        }
      }
      for (let k = 0; k < n; k++) or[k] = pN[k] - pL[k];
    }
    this.hpPos = (hpPos0 + n) % dl;
    const floor2 = DISTORTION_FLOOR_PA * DISTORTION_FLOOR_PA;
    const ratio = this.ratio;
    ratio.fill(0, 0, n);
    for (let w = 0; w < nLanes; w++) lanes[w].meter.processBlock(outN[w], outR[w], n, floor2, ratio);
    // 4. Calibration and the true-peak guard.
    const pick = mode === 'nonlinear' ? outN : mode === 'linear' ? outL : outR;
    this.guard.processBlock(pick, n, inv, outputs, s);
    if (extra?.linear && this.guardLin) this.guardLin.processBlock(outL, n, inv, extra.linear, s);
    if (extra?.residual && this.guardRes) this.guardRes.processBlock(outR, n, inv, extra.residual, s);
    // 5. Stress, worst lane; times refer to the input (the woofer path runs `stageDelay` late).
    this.stress(n, ratio);
    this.frames += n;
  }

  private stress(n: number, ratio: Float64Array): void {
    const lanes = this.lanes,
      nLanes = lanes.length;
    const p = this.params;
    const ev = this.events,
      st = this.stats;
    const fsr = this.sampleRate;
    const t0 = (this.frames - this.stageDelay) / fsr,
      dt = 1 / fsr;
    const vented = p.boxCode === 1,
      radiator = p.boxCode === 2;
    const rail = this.rail,
      xmax = this.xmax,
      xlimHit = this.xlimHit,
      xmaxP = this.xmaxP;
    let rMax = 0,
      riseMax = 0;
    for (let w = 0; w < nLanes; w++) {
      if (lanes[w].sim.r > rMax) rMax = lanes[w].sim.r;
      if (lanes[w].sim.riseV > riseMax) riseMax = lanes[w].sim.riseV;
    }
    const tempC = this.ambient + riseMax;
    const compDb = rMax > this.rCold ? 20 * Math.log10(rMax / this.rCold) : 0;
    if (tempC > st.peakCoilTempC) st.peakCoilTempC = tempC;
    if (compDb > st.maxCompressionDb) st.maxCompressionDb = compDb;
    // Worst lane per frame, and the chunk's maxima.
    const xAbs = this.xAbs,
      aux = this.aux,
      dem = this.dem;
    let peakX = 0,
      peakA = 0,
      peakD = 0,
      peakR = 0;
    for (let w = 0; w < nLanes; w++) {
      const lane = lanes[w];
      const lx = lane.x,
        lp = lane.port,
        ld = lane.uDel;
      const first = w === 0;
      for (let k = 0; k < n; k++) {
        const xv = lx[k] < 0 ? -lx[k] : lx[k];
        const av = lp[k] < 0 ? -lp[k] : lp[k];
        const dv = ld[k] < 0 ? -ld[k] : ld[k];
        if (first || xv > xAbs[k]) xAbs[k] = xv;
        if (first || av > aux[k]) aux[k] = av;
        if (first || dv > dem[k]) dem[k] = dv;
        if (xv > peakX) peakX = xv;
        if (av > peakA) peakA = av;
        if (dv > peakD) peakD = dv;
      }
    }
    for (let k = 0; k < n; k++) if (ratio[k] > peakR) peakR = ratio[k];
    const invSv = vented ? 1 / p.sv : 0;
    const ratioLim = Math.pow(10, -DISTORTION_WITHIN_DB / 10);
    const coilHot = tempC > this.coilMax,
      compHot = rMax > this.r1dB;
    const anyEvent =
      peakX > xmax ||
      (vented && peakA * invSv > PORT_SPEED_LIMIT) ||
      (radiator && peakA > xmaxP) ||
      peakD > rail ||
      coilHot ||
      compHot ||
      peakR > ratioLim;
    if (anyEvent) {
      // Frame by frame only when some limit is crossed in this chunk.
      for (let k = 0; k < n; k++) {
        const t = t0 + k * dt;
        const xk = xAbs[k];
        if (xk > xmax) {
          ev.mark(EV_EXCURSION, t, xk * 1000);
          if (xk >= xlimHit) ev.mark(EV_XLIM, t, xk * 1000);
        }
        const ak = aux[k];
        if (vented) {
          if (ak * invSv > PORT_SPEED_LIMIT) ev.mark(EV_PORT, t, ak * invSv);
        } else if (radiator && ak > xmaxP) ev.mark(EV_RADIATOR, t, ak * 1000);
        if (dem[k] > rail) {
          st.ampClipFrames++;
          ev.mark(EV_CLIP, t, dem[k]);
        }
        if (coilHot) ev.mark(EV_COIL, t, tempC);
        if (compHot) ev.mark(EV_COMPRESSION, t, compDb);
        if (ratio[k] > ratioLim) ev.mark(EV_DISTORTION, t, 10 * Math.log10(ratio[k]));
      }
    }
    if (peakX * 1000 > st.peakExcursionMm) st.peakExcursionMm = peakX * 1000;
    if (vented && peakA * invSv > st.peakPortSpeed) st.peakPortSpeed = peakA * invSv;
    if (radiator && peakA * 1000 > st.peakRadiatorMm) st.peakRadiatorMm = peakA * 1000;
    // Traces at chunk resolution: the worst value of the chunks that end in each interval.
    if (peakX > this.tX) this.tX = peakX;
    if (peakA * invSv > this.tP) this.tP = peakA * invSv;
    if (peakR > this.tR) this.tR = peakR;
    this.traceCount += n;
    while (this.traceCount >= this.traceEvery) {
      this.trX.push(this.tX * 1000);
      this.trT.push(tempC);
      this.trP.push(this.tP);
      this.trC.push(compDb);
      this.trR.push(this.tR > 1e-12 ? 10 * Math.log10(this.tR) : -120);
      this.traceCount -= this.traceEvery;
      this.tX = this.tP = this.tR = 0;
    }
  }

  /** Peaks so far. */
  getStats(): RenderStats {
    return { ...this.stats };
  }

  traces(): Traces {
    return {
      hz: this.sampleRate / this.traceEvery,
      excursionMm: this.trX.view(),
      coilTempC: this.trT.view(),
      portSpeed: this.trP.view(),
      compressionDb: this.trC.view(),
      residualDb: this.trR.view(),
    };
  }

  clearTraces(): void {
    this.trX.n = this.trT.n = this.trP.n = this.trC.n = this.trR.n = 0;
  }

  /** The woofer model of one lane (tests, meters). */
  lane(k = 0): { sim: WooferSim; lin: LinearRecurrence } {
    return { sim: this.lanes[k].sim, lin: this.lanes[k].lin };
  }
}

function emptyStats(): RenderStats {
  return {
    frames: 0,
    peakExcursionMm: 0,
    peakRadiatorMm: 0,
    peakCoilTempC: 0,
    peakPortSpeed: 0,
    ampClipFrames: 0,
    maxCompressionDb: 0,
    limiterDb: 0,
  };
}

function replaceCascade(old: BiquadCascade | null, coef: Float64Array | null): BiquadCascade | null {
  if (!coef) return null;
  if (old && old.coef.length === coef.length) {
    old.coef.set(coef);
    return old;
  }
  return new BiquadCascade(coef);
}

export function createRenderer(sys: SpeakerSystem, opt: RendererOptions): Renderer {
  return new Renderer(sys, opt);
}
