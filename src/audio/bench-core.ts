// The listening bench's processing core: the track's transport (play, pause, seek, loop, with short
// fades at every jump so no jump clicks), the three lanes (A and B through the engine's block
// renderer, the flat reference) mixed by LaneMixer, the load meter and the reports. Pure: no Web
// Audio and no DOM, so the worklet processor (processor.worklet.ts), the Node tests and the benchmark
// all run this same code. No allocation per block except the reports (a few per second).
import { createRenderer, type Renderer, type StressEvent } from '../engine/render/index.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import { CROSSFADE_S, LANE_IDS, LaneMixer, type BlockRenderer, type LaneId } from './lanes.ts';
import { commonPaPerFs, dbToGain, laneGains, MONITOR_START_DB, passbandPa } from './levels.ts';
import { adoptMeasuredTaps } from './measured-taps.ts';
import type { DesignSlot, FromWorklet, ListenMode, LoopRegion, MeterSample, ToWorklet } from './protocol.ts';

/** Frames per quantum of the Web Audio rendering model. */
export const QUANTUM = 128;
/** Reports of the position and meters per second. */
const POSITION_HZ = 20;
/** Checks for new stress events per second. */
const EVENTS_HZ = 4;
/** Window of the load meter, s. */
const LOAD_WINDOW_S = 0.5;
/** After a pause, the renderers run on this long (their tails ring out) before they idle, s. */
const IDLE_AFTER_S = 1;
/** Shortest loop, s: long enough for a fade out and in. */
export const MIN_LOOP_S = 0.05;

export interface EngineFactory {
  (system: SpeakerSystem, opt: { sampleRate: number; channels: number; voltsFs: number }): Renderer;
}

/** The ideal flat system: the input at the reference's calibration, delayed like the renderers. */
export class FlatReference implements BlockRenderer {
  gain = 0;
  silent = false;
  private readonly lines: Float32Array[];
  private pos = 0;
  constructor(
    channels: number,
    readonly latencyFrames: number,
  ) {
    this.lines = Array.from({ length: channels }, () => new Float32Array(latencyFrames + 1));
  }
  process(input: readonly Float32Array[], output: Float32Array[], frames: number): void {
    const len = this.latencyFrames + 1;
    const g = this.silent ? 0 : this.gain;
    let pos = this.pos;
    for (let c = 0; c < output.length; c++) {
      const line = this.lines[Math.min(c, this.lines.length - 1)];
      const src = input[Math.min(c, input.length - 1)];
      const out = output[c];
      pos = this.pos;
      for (let k = 0; k < frames; k++) {
        line[pos] = src ? src[k] : 0;
        pos = pos + 1 === len ? 0 : pos + 1;
        out[k] = g * line[pos];
      }
    }
    this.pos = pos;
  }
}

/** A design's lane: its renderer once the design is known, silence before. */
class DesignLane implements BlockRenderer {
  r: Renderer | null = null;
  voltsFs = 0;
  /** Events already reported (converted to track time). */
  sent: StressEvent[] = [];
  sentEndSum = -1;
  process(input: readonly Float32Array[], output: Float32Array[], frames: number): void {
    if (this.r) this.r.process(input as Float32Array[], output, frames);
    else for (let c = 0; c < output.length; c++) output[c].fill(0, 0, frames);
  }
}

/** When the mapping from renderer frames to track frames changed: a jump, a pause, a resume. */
const SEG_CAP = 512;

export class BenchCore {
  readonly sampleRate: number;
  readonly outbox: FromWorklet[] = [];
  private channels = 0;
  private track: Float32Array[] = [];
  private length = 0;
  private readonly lanes: Record<DesignSlot, DesignLane> = { a: new DesignLane(), b: new DesignLane() };
  private ref: FlatReference | null = null;
  private mixer: LaneMixer | null = null;
  private input: Float32Array[] = [];
  private mode: ListenMode = 'nonlinear';
  private pendingMode: ListenMode | null = null;
  /** Output envelope for listen-mode changes. */
  private outEnv = 1;
  /** Frames the output stays silent after a mode change: the renderers' look-ahead still holds the old stream. */
  private modeHold = 0;
  private match = true;
  private monitorDb = MONITOR_START_DB;
  private lane: LaneId = 'a';
  latencyFrames = 0;
  // Transport.
  private playing = false;
  private pos = 0;
  private env = 0;
  private readonly envStep: number;
  private readonly fadeFrames: number;
  private pendingJump = -1;
  private loop: LoopRegion | null = null;
  private advancing = false;
  private idleFrames = 0;
  /** Frames fed to the renderers so far (their clock). */
  private engineFrame = 0;
  private readonly segEngine = new Float64Array(SEG_CAP);
  private readonly segTrack = new Float64Array(SEG_CAP);
  private readonly segRate = new Uint8Array(SEG_CAP);
  private segCount = 0;
  // Reports.
  private sincePosition = 0;
  private sinceEvents = 0;
  private busyMs = 0;
  private windowFrames = 0;
  private load = 0;
  private lateBlocks = 0;
  private lastSwitch = -1;
  // Switch measurement.
  private measuring = 0;
  private measure = { from: 'a' as LaneId, to: 'a' as LaneId, maxStep: 0, allowed: 0, worst: 0, blockFrame: 0 };
  private prevOut: Float64Array = new Float64Array(2);
  private readonly prevLane: Record<LaneId, Float64Array> = { a: new Float64Array(2), b: new Float64Array(2), ref: new Float64Array(2) };

  constructor(
    sampleRate: number,
    private readonly factory: EngineFactory = createRenderer,
  ) {
    this.sampleRate = sampleRate;
    this.fadeFrames = Math.max(1, Math.round(CROSSFADE_S * sampleRate));
    this.envStep = 1 / this.fadeFrames;
  }

  private post(m: FromWorklet): void {
    this.outbox.push(m);
  }

  /** Reports produced since the last call. */
  take(): FromWorklet[] {
    return this.outbox.splice(0, this.outbox.length);
  }

  handle(m: ToWorklet): void {
    try {
      this.apply(m);
    } catch (e) {
      this.post({ type: 'error', message: e instanceof Error ? e.message : String(e) });
    }
  }

  private apply(m: ToWorklet): void {
    switch (m.type) {
      case 'track':
        this.setTrack(m.channels);
        return;
      case 'design':
        if (m.measuredTaps) adoptMeasuredTaps(m.system, m.measuredTaps, this.sampleRate);
        this.setDesign(m.slot, m.system, m.voltsFs);
        return;
      case 'level': {
        const l = this.lanes[m.slot];
        l.voltsFs = m.voltsFs;
        l.r?.setVoltsFs(m.voltsFs);
        this.relevel();
        return;
      }
      case 'lane':
        this.lane = m.lane;
        this.mixer?.select(m.lane);
        return;
      case 'mode':
        // Heard through a short dip (out, switch, in): the streams differ too much to cut between.
        if (!this.mixer) this.applyMode(m.mode);
        else if (m.mode !== this.mode || this.pendingMode !== null) this.pendingMode = m.mode;
        return;
      case 'monitor':
        this.monitorDb = m.gainDb;
        if (this.mixer) this.mixer.monitorGain = dbToGain(m.gainDb);
        return;
      case 'match':
        this.match = m.on;
        this.relevel();
        return;
      case 'loop':
        if (m.region) {
          const r = m.region;
          if (r.endFrame > this.length) throw new RangeError(`loop end ${r.endFrame} is past the track's end (${this.length} frames)`);
          if (r.endFrame - r.startFrame < MIN_LOOP_S * this.sampleRate)
            throw new RangeError(
              `a loop must be at least ${MIN_LOOP_S * 1000} ms long, got ${(((r.endFrame - r.startFrame) / this.sampleRate) * 1000).toFixed(1)} ms`,
            );
        }
        this.loop = m.region;
        if (this.loop && (this.pos < this.loop.startFrame || this.pos >= this.loop.endFrame)) this.jump(this.loop.startFrame);
        return;
      case 'seek':
        if (m.frame > this.length) throw new RangeError(`seek to frame ${m.frame} is past the track's end (${this.length} frames)`);
        this.jump(m.frame);
        return;
      case 'play':
        if (m.playing && this.length === 0) throw new RangeError('no track is loaded');
        if (m.playing && this.pos >= this.length) this.jump(this.loop ? this.loop.startFrame : 0);
        this.playing = m.playing;
        return;
    }
  }

  private jump(frame: number): void {
    if (this.env === 0) {
      this.pos = frame;
      this.pendingJump = -1;
      this.segment(this.engineFrame, this.advancing ? 1 : 0);
    } else this.pendingJump = frame;
  }

  private setTrack(channels: Float32Array[]): void {
    const nCh = channels.length;
    this.track = channels;
    this.length = channels[0].length;
    this.pos = 0;
    this.env = 0;
    this.pendingJump = -1;
    this.playing = false;
    this.loop = null;
    if (nCh !== this.channels) {
      this.channels = nCh;
      this.input = Array.from({ length: nCh }, () => new Float32Array(QUANTUM));
      for (const s of ['a', 'b'] as const) {
        const l = this.lanes[s];
        if (l.r) l.r = this.makeRenderer(l.r.system, l.voltsFs);
      }
      this.rebuildMixer();
    } else {
      for (const s of ['a', 'b'] as const) this.lanes[s].r?.reset();
    }
    for (const s of ['a', 'b'] as const) {
      this.lanes[s].sent = [];
      this.lanes[s].sentEndSum = -1;
    }
    this.engineFrame = 0;
    this.segCount = 0;
    this.segment(0, 0);
    this.idleFrames = 0;
  }

  private makeRenderer(system: SpeakerSystem, voltsFs: number): Renderer {
    const r = this.factory(system, { sampleRate: this.sampleRate, channels: this.channels, voltsFs });
    r.setMode(this.pendingMode ?? this.mode);
    return r;
  }

  private setDesign(slot: DesignSlot, system: SpeakerSystem, voltsFs: number): void {
    if (this.channels === 0) throw new RangeError('load a track before the designs');
    const l = this.lanes[slot];
    l.voltsFs = voltsFs;
    if (l.r) {
      l.r.update(system);
      l.r.setVoltsFs(voltsFs);
      // Stress of the edited design starts afresh: the old events belong to the old design.
      l.r.events.reset();
      l.sent = [];
      l.sentEndSum = -1;
      this.post({ type: 'events', slot, from: 0, events: [] });
    } else {
      l.r = this.makeRenderer(system, voltsFs);
      // Events of the new lane start from the current renderer clock.
      l.sent = [];
      l.sentEndSum = -1;
      if (this.latencyFrames !== l.r.latencyFrames) {
        this.latencyFrames = l.r.latencyFrames;
        this.rebuildMixer();
        this.post({ type: 'ready', sampleRate: this.sampleRate, latencyFrames: this.latencyFrames });
      }
      // A renderer made now has not heard the track so far: keep both lanes' clocks equal.
      this.alignClocks();
    }
    this.relevel();
  }

  /** A freshly made renderer counts frames from zero; the other may be ahead. Make both start afresh. */
  private alignClocks(): void {
    const a = this.lanes.a.r,
      b = this.lanes.b.r;
    if (a && b && a.getStats().frames !== b.getStats().frames) {
      a.reset();
      b.reset();
      for (const s of ['a', 'b'] as const) {
        this.lanes[s].sent = [];
        this.lanes[s].sentEndSum = -1;
      }
      this.engineFrame = 0;
      this.segCount = 0;
      this.segment(0, this.advancing ? 1 : 0);
    }
  }

  private rebuildMixer(): void {
    if (this.channels === 0) return;
    this.ref = new FlatReference(this.channels, this.latencyFrames);
    this.ref.silent = this.mode === 'residual';
    this.mixer = new LaneMixer({ a: this.lanes.a, b: this.lanes.b, ref: this.ref }, this.channels, this.sampleRate, QUANTUM);
    this.mixer.select(this.lane);
    this.mixer.monitorGain = dbToGain(this.monitorDb);
    this.prevOut = new Float64Array(Math.max(2, this.channels));
    for (const id of LANE_IDS) this.prevLane[id] = new Float64Array(Math.max(2, this.channels));
    this.lastSwitch = -1;
    this.relevel();
  }

  /** One calibration for both designs, the match gains and the reference level (levels.ts). */
  private relevel(): void {
    const a = this.lanes.a,
      b = this.lanes.b;
    if (!a.r || !b.r || !this.mixer || !this.ref) return;
    const la = { passbandPaPerV: a.r.passbandPaPerV, voltsFs: a.voltsFs };
    const lb = { passbandPaPerV: b.r.passbandPaPerV, voltsFs: b.voltsFs };
    const paPerFs = commonPaPerFs(la, lb);
    a.r.paPerFs = paPerFs;
    b.r.paPerFs = paPerFs;
    const g = laneGains(la, lb, this.match);
    this.ref.gain = g.referencePa / paPerFs;
    for (const id of LANE_IDS) this.mixer.laneGain[id] = g.gains[id];
    this.post({ type: 'levels', paPerFs, gains: { ...g.gains }, passbandPa: { a: passbandPa(la), b: passbandPa(lb) } });
  }

  private segment(engineFrame: number, rate: number): void {
    const i = this.segCount % SEG_CAP;
    this.segEngine[i] = engineFrame;
    this.segTrack[i] = this.pos;
    this.segRate[i] = rate;
    this.segCount++;
  }

  /** Track time of a renderer time (s): the input frame it refers to, through the segments. */
  private trackTime(t: number): number {
    const e = t * this.sampleRate;
    const n = Math.min(this.segCount, SEG_CAP);
    for (let j = 0; j < n; j++) {
      const i = (this.segCount - 1 - j) % SEG_CAP;
      if (this.segEngine[i] <= e || j === n - 1) {
        const f = this.segTrack[i] + (this.segRate[i] ? Math.max(0, e - this.segEngine[i]) : 0);
        return Math.min(f, this.length) / this.sampleRate;
      }
    }
    return 0;
  }

  /** Fills this.input with the next frames of the track (faded at jumps, pauses and the loop's end). */
  private readTrack(frames: number): void {
    const nCh = this.channels;
    const track = this.track,
      input = this.input,
      len = this.length;
    const fade = this.fadeFrames,
      step = this.envStep;
    for (let k = 0; k < frames; k++) {
      let wantOn = this.playing && this.pendingJump < 0;
      const loop = this.loop;
      if (wantOn && loop && this.pos >= loop.endFrame - fade) {
        this.pendingJump = loop.startFrame;
        wantOn = false;
      }
      if (wantOn) this.env = this.env + step >= 1 ? 1 : this.env + step;
      else this.env = this.env - step <= 0 ? 0 : this.env - step;
      const adv = this.env > 0;
      if (adv !== this.advancing) {
        this.advancing = adv;
        this.segment(this.engineFrame + k, adv ? 1 : 0);
      }
      if (adv) {
        const p = this.pos;
        const e = this.env;
        for (let c = 0; c < nCh; c++) input[c][k] = p < len ? track[c][p] * e : 0;
        this.pos = p + 1;
        if (this.pos >= len && !loop) {
          this.pos = len;
          this.playing = false;
          this.env = 0;
          this.advancing = false;
          this.segment(this.engineFrame + k + 1, 0);
          this.post({ type: 'ended' });
        }
      } else for (let c = 0; c < nCh; c++) input[c][k] = 0;
      if (this.env === 0 && this.pendingJump >= 0) {
        this.pos = this.pendingJump;
        this.pendingJump = -1;
        this.segment(this.engineFrame + k + 1, 0);
      }
    }
  }

  /** Renders `frames` into output (planar, 1 or 2 channels), in quanta of at most 128 frames. */
  process(output: Float32Array[], frames: number): void {
    for (let s = 0; s < frames; s += QUANTUM) {
      const n = Math.min(QUANTUM, frames - s);
      const view = s === 0 && n === frames ? output : output.map((o) => o.subarray(s, s + n));
      this.quantum(view, n);
    }
  }

  private quantum(output: Float32Array[], n: number): void {
    const mixer = this.mixer;
    if (!mixer || this.length === 0) {
      for (const o of output) o.fill(0, 0, n);
      return;
    }
    this.readTrack(n);
    const idle = !this.playing && this.env === 0 && this.pendingJump < 0;
    this.idleFrames = idle ? this.idleFrames + n : 0;
    if (this.idleFrames > IDLE_AFTER_S * this.sampleRate && !mixer.fading) {
      for (const o of output) o.fill(0, 0, n);
    } else {
      mixer.process(this.input, output, n);
      if (this.pendingMode !== null || this.outEnv < 1) this.modeDip(output, n);
      this.engineFrame += n;
      this.checkSwitch(output, n);
    }
    this.sincePosition += n;
    this.sinceEvents += n;
    if (this.sincePosition >= this.sampleRate / POSITION_HZ) {
      this.sincePosition = 0;
      this.postPosition();
    }
    if (this.sinceEvents >= this.sampleRate / EVENTS_HZ) {
      this.sinceEvents = 0;
      this.postEvents('a');
      this.postEvents('b');
    }
  }

  private applyMode(mode: ListenMode): void {
    this.mode = mode;
    for (const s of ['a', 'b'] as const) this.lanes[s].r?.setMode(mode);
    if (this.ref) this.ref.silent = mode === 'residual';
  }

  private modeDip(output: Float32Array[], n: number): void {
    const step = this.envStep;
    let env = this.outEnv;
    const down = this.pendingMode !== null;
    let hold = this.modeHold;
    for (let k = 0; k < n; k++) {
      if (down) env = env - step <= 0 ? 0 : env - step;
      else if (hold > 0) hold--;
      else env = env + step >= 1 ? 1 : env + step;
      for (let c = 0; c < output.length; c++) output[c][k] *= env;
    }
    this.outEnv = env;
    this.modeHold = hold;
    if (down && env === 0) {
      this.applyMode(this.pendingMode!);
      this.pendingMode = null;
      this.modeHold = this.latencyFrames + 1;
    }
  }

  /** Accumulates the time process() took for one quantum of `frames`, ms. */
  noteLoad(elapsedMs: number, frames: number): void {
    this.busyMs += elapsedMs;
    this.windowFrames += frames;
    if (elapsedMs > (frames / this.sampleRate) * 1000) this.lateBlocks++;
    if (this.windowFrames >= LOAD_WINDOW_S * this.sampleRate) {
      this.load = this.busyMs / ((this.windowFrames / this.sampleRate) * 1000);
      this.busyMs = 0;
      this.windowFrames = 0;
    }
  }

  /** Measures the output's sample steps against what a linear crossfade of the two lanes allows. */
  private checkSwitch(output: Float32Array[], n: number): void {
    const mixer = this.mixer!;
    const started = mixer.lastSwitchFrame !== this.lastSwitch;
    if (started) {
      this.lastSwitch = mixer.lastSwitchFrame;
      const m = this.measure;
      m.from = this.prevHeard;
      m.to = mixer.lane;
      m.maxStep = 0;
      m.allowed = 0;
      m.worst = 0;
      m.blockFrame = mixer.lastSwitchFrame;
      this.measuring = Math.ceil(mixer.fadeFrames / QUANTUM) + 1;
    }
    if (this.measuring > 0) {
      const m = this.measure;
      const mon = mixer.monitorGain;
      const gA = mixer.laneGain[m.from] * mon,
        gB = mixer.laneGain[m.to] * mon;
      const A = mixer.laneBlock(m.from),
        B = mixer.laneBlock(m.to);
      const L = mixer.fadeFrames;
      const pa = this.prevLane[m.from],
        pb = this.prevLane[m.to];
      for (let c = 0; c < output.length; c++) {
        const src = Math.min(c, this.channels - 1);
        const a = A[src],
          b = B[src],
          o = output[c];
        let aPrev = pa[src] * gA,
          bPrev = pb[src] * gB,
          oPrev = this.prevOut[c];
        for (let k = 0; k < n; k++) {
          const ak = a[k] * gA,
            bk = b[k] * gB;
          const da = Math.abs(ak - aPrev),
            db = Math.abs(bk - bPrev);
          const bound = (da > db ? da : db) + Math.abs(bPrev - aPrev) / L;
          const step = Math.abs(o[k] - oPrev);
          if (step > m.maxStep) m.maxStep = step;
          if (bound > m.allowed) m.allowed = bound;
          // Float32 rounding of the mixed samples: a few ulps of the larger magnitude.
          const tol = 4e-7 * (Math.abs(ak) + Math.abs(bk) + Math.abs(aPrev) + Math.abs(bPrev)) + 1e-12;
          const ratio = step / (bound + tol);
          if (ratio > m.worst) m.worst = ratio;
          aPrev = ak;
          bPrev = bk;
          oPrev = o[k];
        }
      }
      if (--this.measuring === 0) {
        this.post({
          type: 'switched',
          from: m.from,
          lane: m.to,
          blockFrame: m.blockFrame,
          quantum: QUANTUM,
          fadeFrames: L,
          maxStep: m.maxStep,
          allowedStep: m.allowed,
          worstRatio: m.worst,
        });
      }
    }
    // Keep each lane's and the output's last samples for the next block's first step.
    for (const id of LANE_IDS) {
      const blk = mixer.laneBlock(id),
        keep = this.prevLane[id];
      for (let c = 0; c < this.channels; c++) keep[c] = blk[c][n - 1];
    }
    for (let c = 0; c < output.length; c++) this.prevOut[c] = output[c][n - 1];
    this.prevHeard = mixer.heardLane;
  }
  private prevHeard: LaneId = 'a';

  private meter(slot: DesignSlot): MeterSample | null {
    const r = this.lanes[slot].r;
    if (!r) return null;
    const t = r.traces();
    const i = t.excursionMm.length - 1;
    if (i < 0) return null;
    const m = {
      excursionMm: t.excursionMm[i],
      coilTempC: t.coilTempC[i],
      portSpeed: t.portSpeed[i],
      compressionDb: t.compressionDb[i],
      residualDb: t.residualDb[i],
    };
    // Live listening needs only the latest point: keep the traces from growing for hours.
    if (i > 64) r.clearTraces();
    return m;
  }

  private postPosition(): void {
    const heard = Math.max(0, this.pos - (this.advancing ? this.latencyFrames : 0));
    this.post({
      type: 'position',
      frame: Math.min(heard, this.length),
      playing: this.playing,
      lane: this.lane,
      load: this.load,
      lateBlocks: this.lateBlocks,
      meters: { a: this.meter('a'), b: this.meter('b') },
    });
  }

  /** New or changed events of one design since the last report, in track time. */
  private postEvents(slot: DesignSlot): void {
    const l = this.lanes[slot];
    if (!l.r || l.r.events.count === 0) return;
    const all = l.r.events.list(1 / this.sampleRate, false);
    let endSum = 0;
    for (const e of all) endSum += e.end_s + e.peak;
    if (all.length === l.sent.length && endSum === l.sentEndSum) return;
    l.sentEndSum = endSum;
    // Renderer time only grows, so the list keeps its order; only the last few can still change.
    const from = Math.max(0, Math.min(l.sent.length, all.length) - 8);
    const fresh: StressEvent[] = [];
    for (let i = from; i < all.length; i++) {
      const e = all[i];
      const start = this.trackTime(e.start_s);
      const end = Math.max(start, this.trackTime(e.end_s));
      fresh.push({ ...e, start_s: Number(start.toFixed(4)), end_s: Number(end.toFixed(4)), peak: Number(e.peak.toFixed(3)) });
    }
    l.sent.length = from;
    l.sent.push(...fresh);
    this.post({ type: 'events', slot, from, events: fresh });
  }

  /** The transport's state, for tests. */
  get transport(): { pos: number; playing: boolean; env: number; loop: LoopRegion | null; length: number } {
    return { pos: this.pos, playing: this.playing, env: this.env, loop: this.loop, length: this.length };
  }

  get laneMixer(): LaneMixer | null {
    return this.mixer;
  }
}
