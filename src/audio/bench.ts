// The listening bench's browser glue: one audio context, the worklet node running BenchCore, the
// render Worker, the loaded track and the bench's observable state. The UI reads `state` and calls
// the methods; nothing here computes physics (the engine does, in the worklet and the Worker).
import { integratedLoudness } from '../engine/level/loudness.ts';
import { AudioContext, AudioWorkletNode, isSupported, type IAudioContext, type IAudioWorkletNode } from 'standardized-audio-context';
import processorUrl from './processor.worklet.ts?worker&url';
import RenderWorker from './render.worker.ts?worker';
import type { SpeakerSystem } from '../engine/system.ts';
import type { StressEvent } from '../engine/render/index.ts';
import { synthesizeDemoTrack } from '../engine/demo/track.ts';
import {
  BENCH_PROCESSOR,
  encodeToWorklet,
  parseFromWorklet,
  type DesignSlot,
  type FromWorklet,
  type LaneId,
  type ListenMode,
  type LoopRegion,
  type MeterSample,
  type SwitchReport,
  type ToWorklet,
} from './protocol.ts';
import type { WorkerReply, WorkerRequest } from './render-protocol.ts';
import type { DesignLevel, DesignRender, ExportStream } from './jobs.ts';
import type { ExportFormat } from './wav-export.ts';
import { MONITOR_START_DB } from './levels.ts';
import { decodedProblem, fileProblem, loudestBassStart, MAX_TRACK_S, overviewOf, wavTruncation } from './track.ts';
import { fileSampleRate } from './file-rate.ts';
import { measuredTapsFor } from './measured-taps.ts';
import { forgetTrack, keepResults, keepTrack, keptResults, keptTrack, MAX_KEPT_TRACK_BYTES, resultsKey } from './kept-track.ts';
import { levelFailure, levelProblem } from './level-message.ts';
import { MAX_VOLTS_FS } from '../engine/render/renderer.ts';

export { MAX_KEPT_TRACK_BYTES, MAX_TRACK_S };

/** A design edit reaches the worklet this soon, ms. */
const DESIGN_DEBOUNCE_MS = 40;
/** Planned levels are re-resolved for the track this long after the last edit, ms. */
const LEVEL_DEBOUNCE_MS = 150;
/** The load above which the machine is said not to keep up. */
export const LOAD_LIMIT = 0.8;
/** Live meter history kept for the trace chart, points (20 per second). */
const HISTORY_POINTS = 1200;

export interface TrackInfo {
  name: string;
  source: 'demo' | 'file';
  frames: number;
  /** The rate the track plays at (the audio context's: the browser resamples a file to it), Hz. */
  sampleRate: number;
  /** The rate stored in the file's own header, Hz, when it could be read (file-rate.ts). */
  fileSampleRate?: number;
  channels: number;
  /** The file had more channels than two: only the first two are used. */
  droppedChannels: number;
  /** Min and max of all channels per overview bin. */
  overview: { min: Float32Array; max: Float32Array };
  /** Where the loud section starts, s: the demo's own, or a file's loudest bass passage. */
  loudFromS?: number;
  /** Integrated programme loudness of the file itself (ITU-R BS.1770), LUFS; -Infinity when silent. */
  loudnessLufs?: number;
  /** A file kept for the next visit, brought back from the last one, or too large to keep. */
  kept?: 'kept' | 'restored' | 'too-large';
  /** The WAV file ends before its header says: how long it should be and how much was read, s. */
  truncated?: { statedS: number; presentS: number };
}

export interface OfflineState {
  status: 'idle' | 'running' | 'done' | 'cancelled' | 'error';
  progress: number;
  /** What is running: an analysis render or an export. */
  job: 'render' | 'export' | null;
  results: Record<DesignSlot, DesignRender> | null;
  /** The designs the results belong to: stale once they change. */
  systems: Record<DesignSlot, SpeakerSystem> | null;
  message: string | null;
}

export interface MeterPoint {
  t: number;
  a: MeterSample | null;
  b: MeterSample | null;
}

export interface BenchState {
  status: 'off' | 'starting' | 'ready' | 'unsupported' | 'error';
  message: string | null;
  /** A problem with the last file the user opened (the track already loaded stays). */
  fileError: string | null;
  loading: string | null;
  track: TrackInfo | null;
  sampleRate: number;
  latencyFrames: number;
  playing: boolean;
  /** Track frame heard at `positionAt` (performance.now() ms). */
  position: number;
  positionAt: number;
  lane: LaneId;
  mode: ListenMode;
  monitorDb: number;
  match: boolean;
  loop: LoopRegion | null;
  load: number;
  lateBlocks: number;
  /** True once the load went over LOAD_LIMIT or quanta ran late during playback. */
  struggling: boolean;
  levels: Record<DesignSlot, DesignLevel> | null;
  heard: { paPerFs: number; gains: Record<LaneId, number>; passbandPa: Record<DesignSlot, number> } | null;
  liveEvents: Record<DesignSlot, StressEvent[]>;
  history: MeterPoint[];
  lastSwitch: SwitchReport | null;
  switches: SwitchReport[];
  offline: OfflineState;
  /** Designs that cannot be heard (invalid): the last valid version plays. */
  designsMissing: DesignSlot[];
}

const EMPTY_OFFLINE: OfflineState = { status: 'idle', progress: 0, job: null, results: null, systems: null, message: null };

function initialState(): BenchState {
  return {
    status: 'off',
    message: null,
    fileError: null,
    loading: null,
    track: null,
    sampleRate: 0,
    latencyFrames: 0,
    playing: false,
    position: 0,
    positionAt: 0,
    lane: 'a',
    mode: 'nonlinear',
    monitorDb: MONITOR_START_DB,
    match: true,
    loop: null,
    load: 0,
    lateBlocks: 0,
    struggling: false,
    levels: null,
    heard: null,
    liveEvents: { a: [], b: [] },
    history: [],
    lastSwitch: null,
    switches: [],
    offline: EMPTY_OFFLINE,
    designsMissing: [],
  };
}

type Listener = (s: BenchState) => void;

export class BenchAudio {
  state: BenchState = initialState();
  private listeners = new Set<Listener>();
  private ctx: IAudioContext | null = null;
  private node: IAudioWorkletNode<IAudioContext> | null = null;
  private worker: Worker | null = null;
  private channels: Float32Array[] | null = null;

  /** The decoded samples of the loaded track (read-only: the headroom probe measures them), or null. */
  trackChannels(): readonly Float32Array[] | null {
    return this.channels;
  }
  private systems: Record<DesignSlot, SpeakerSystem | null> = { a: null, b: null };
  private sentSystems: Record<DesignSlot, SpeakerSystem | null> = { a: null, b: null };
  private designTimer: ReturnType<typeof setTimeout> | null = null;
  private levelTimer: ReturnType<typeof setTimeout> | null = null;
  private jobId = 0;
  private levelJob = -1;
  private pending = new Map<number, { resolve: (r: WorkerReply) => void; reject: (e: Error) => void; onProgress?: (f: number) => void }>();
  private starting: Promise<void> | null = null;

  subscribe(fn: Listener): () => void {
    this.listeners.add(fn);
    return () => this.listeners.delete(fn);
  }

  private set(patch: Partial<BenchState>): void {
    this.state = { ...this.state, ...patch };
    for (const fn of this.listeners) fn(this.state);
  }

  /** Opens the audio context and the worklet, then loads the demo track. Safe to call again. */
  start(): Promise<void> {
    this.starting ??= this.open();
    return this.starting;
  }

  private async open(): Promise<void> {
    this.set({ status: 'starting', message: null });
    try {
      if (!(await isSupported()) || AudioWorkletNode === undefined) {
        this.set({
          status: 'unsupported',
          message:
            'This browser lacks the Web Audio features the bench needs (an AudioWorklet). Offline rendering and export still work in a recent Chromium, Firefox or Safari.',
        });
        return;
      }
      const ctx = new AudioContext({ latencyHint: 'playback' });
      this.ctx = ctx;
      await ctx.audioWorklet!.addModule(processorUrl);
      const node = new AudioWorkletNode(ctx, BENCH_PROCESSOR, { numberOfInputs: 0, numberOfOutputs: 1, outputChannelCount: [2] });
      node.port.onmessage = (e: MessageEvent) => this.onReport(e.data);
      node.connect(ctx.destination);
      this.node = node;
      this.set({ status: 'ready', sampleRate: ctx.sampleRate });
      this.spawnWorker();
      if (!(await this.restoreKept())) this.useDemo();
    } catch (e) {
      this.set({ status: 'error', message: `The audio engine could not start: ${(e as Error).message}` });
    }
  }

  private spawnWorker(): void {
    this.worker?.terminate();
    const w = new RenderWorker();
    w.onmessage = (e: MessageEvent<WorkerReply>) => this.onWorker(e.data);
    w.onerror = (e) => {
      for (const p of this.pending.values()) p.reject(new Error(e.message || 'the render worker failed'));
      this.pending.clear();
    };
    this.worker = w;
    if (this.channels)
      this.sendWorker({ type: 'track', channels: this.channels.map((c) => c.slice()), sampleRate: this.state.sampleRate }, true);
  }

  private sendWorker(m: WorkerRequest, transfer = false): void {
    const t = transfer && m.type === 'track' ? m.channels.map((c) => c.buffer as ArrayBuffer) : [];
    this.worker?.postMessage(m, t);
  }

  private job(make: (id: number) => WorkerRequest, onProgress?: (f: number) => void): Promise<WorkerReply> {
    const id = ++this.jobId;
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve, reject, onProgress });
      this.sendWorker(make(id));
    });
  }

  private onWorker(r: WorkerReply): void {
    const p = this.pending.get(r.id);
    if (!p) return;
    if (r.type === 'progress') {
      p.onProgress?.(r.fraction);
      return;
    }
    this.pending.delete(r.id);
    if (r.type === 'error') p.reject(new Error(r.message));
    else p.resolve(r);
  }

  private post(m: ToWorklet): void {
    if (!this.node) return;
    const { message, transfer } = encodeToWorklet(m);
    this.node.port.postMessage(message, transfer);
  }

  private onReport(data: unknown): void {
    const r = parseFromWorklet(data);
    if (!r.ok) {
      this.set({ message: `The audio worklet sent a message that does not fit: ${r.error}` });
      return;
    }
    const m: FromWorklet = r.msg;
    switch (m.type) {
      case 'ready':
        this.set({ latencyFrames: m.latencyFrames });
        return;
      case 'position': {
        const history = this.state.history;
        const t = m.frame / (this.state.sampleRate || 1);
        const next = m.playing
          ? [...(history.length >= HISTORY_POINTS ? history.slice(-HISTORY_POINTS + 1) : history), { t, a: m.meters.a, b: m.meters.b }]
          : history;
        const struggling = this.state.struggling || (m.playing && (m.load > LOAD_LIMIT || m.lateBlocks > this.state.lateBlocks + 4));
        this.set({
          position: m.frame,
          positionAt: performance.now(),
          playing: m.playing,
          load: m.load,
          lateBlocks: m.lateBlocks,
          struggling,
          history: next,
        });
        return;
      }
      case 'switched':
        this.set({ lastSwitch: m, switches: [...this.state.switches.slice(-19), m] });
        return;
      case 'events': {
        const list = this.state.liveEvents[m.slot].slice(0, m.from);
        list.push(...m.events);
        this.set({ liveEvents: { ...this.state.liveEvents, [m.slot]: list } });
        return;
      }
      case 'levels':
        this.set({ heard: { paPerFs: m.paPerFs, gains: m.gains, passbandPa: m.passbandPa } });
        return;
      case 'ended':
        this.set({ playing: false });
        return;
      case 'error':
        this.set({ message: m.message });
        return;
    }
  }

  // ---- tracks ----

  /** The demo track, chosen by the user: the kept file is forgotten. */
  async loadDemo(): Promise<void> {
    void forgetTrack();
    this.useDemo();
  }

  /** The track kept from the last visit, with its render results when the designs are unchanged. */
  private async restoreKept(): Promise<boolean> {
    const kept = await keptTrack();
    if (!kept) return false;
    const ok = await this.loadFile(new File([kept.bytes], kept.name, { type: kept.type }), true);
    const track = this.state.track;
    const { a, b } = this.systems;
    if (!ok || !track || !a || !b) return ok;
    const results = await keptResults(resultsKey(track, { a, b }));
    if (results && this.state.track === track && this.systems.a === a && this.systems.b === b && this.state.offline.status === 'idle')
      this.set({
        offline: { status: 'done', progress: 1, job: null, results, systems: { a, b }, message: 'Results kept from your last visit.' },
      });
    return ok;
  }

  private useDemo(): void {
    const sr = this.state.sampleRate || 48000;
    const demo = synthesizeDemoTrack(sr);
    this.useTrack(demo.channels, {
      name: 'Demo track (built in)',
      source: 'demo',
      sampleRate: sr,
      droppedChannels: 0,
      loudFromS: demo.loudFromS,
    });
  }

  /** Decodes a file locally (nothing leaves the machine) and makes it the track. */
  async loadFile(file: File, restored = false): Promise<boolean> {
    const problem = fileProblem(file);
    if (problem) {
      this.set({ fileError: problem });
      return false;
    }
    // A kept track is restored while the engine starts: waiting for the start here would wait for itself.
    if (!restored) await this.start();
    const ctx = this.ctx;
    if (!ctx) {
      this.set({ fileError: this.state.message ?? 'The audio engine is not running, so the file cannot be decoded.' });
      return false;
    }
    this.set({ loading: `Decoding “${file.name}”…`, fileError: null });
    try {
      const bytes = await file.arrayBuffer();
      // Before decoding: decoding takes the bytes over.
      const truncated = wavTruncation(bytes) ?? undefined;
      const keepable = bytes.byteLength <= MAX_KEPT_TRACK_BYTES;
      const storedRate = await fileSampleRate(file);
      const copy = keepable && !restored ? bytes.slice(0) : null;
      let buf: AudioBuffer;
      try {
        buf = await ctx.decodeAudioData(bytes);
      } catch (e) {
        this.set({
          fileError: `“${file.name}” cannot be decoded: it is not audio, it is damaged, or this browser does not read its format (${(e as Error)?.message || 'no detail given'}). WAV, FLAC, MP3, Ogg and AAC usually work.`,
        });
        return false;
      }
      const n = Math.min(2, buf.numberOfChannels);
      const channels =
        buf.length > 0 && buf.duration <= MAX_TRACK_S
          ? Array.from({ length: n }, (_, c) => {
              const a = new Float32Array(buf.length);
              buf.copyFromChannel(a, c);
              return a;
            })
          : [];
      const bad = decodedProblem(file.name, buf.duration, channels);
      if (bad) {
        this.set({ fileError: bad });
        return false;
      }
      this.useTrack(channels, {
        name: file.name,
        source: 'file',
        sampleRate: ctx.sampleRate,
        ...(storedRate ? { fileSampleRate: storedRate } : {}),
        droppedChannels: buf.numberOfChannels - n,
        truncated,
        kept: restored ? 'restored' : keepable ? 'kept' : 'too-large',
      });
      if (!restored) {
        if (copy) void keepTrack({ name: file.name, type: file.type, bytes: copy });
        else void forgetTrack();
      }
      return true;
    } finally {
      this.set({ loading: null });
    }
  }

  private useTrack(channels: Float32Array[], info: Omit<TrackInfo, 'frames' | 'channels' | 'overview' | 'loudnessLufs'>): void {
    this.channels = channels;
    const track: TrackInfo = {
      ...info,
      frames: channels[0].length,
      channels: channels.length,
      overview: overviewOf(channels),
      loudnessLufs: integratedLoudness(channels, info.sampleRate),
      // A file's loud part is found, not assumed: the blind trial loops from there.
      loudFromS: info.loudFromS ?? loudestBassStart(channels, info.sampleRate),
    };
    this.set({
      track,
      fileError: null,
      playing: false,
      position: 0,
      loop: null,
      levels: null,
      liveEvents: { a: [], b: [] },
      history: [],
      offline: EMPTY_OFFLINE,
      struggling: false,
      lastSwitch: null,
      switches: [],
    });
    this.sentSystems = { a: null, b: null };
    this.post({ type: 'track', channels: channels.map((c) => c.slice()) });
    this.sendWorker({ type: 'track', channels: channels.map((c) => c.slice()), sampleRate: info.sampleRate }, true);
    this.post({ type: 'mode', mode: this.state.mode });
    this.post({ type: 'match', on: this.state.match });
    this.post({ type: 'monitor', gainDb: this.state.monitorDb });
    this.post({ type: 'lane', lane: this.state.lane });
    this.scheduleLevels(0);
  }

  // ---- designs and levels ----

  /** The current valid designs (null where a design has errors: its last valid version stays). */
  setSystems(systems: Record<DesignSlot, SpeakerSystem | null>): void {
    const missing = (['a', 'b'] as const).filter((s) => !systems[s]);
    for (const s of ['a', 'b'] as const) if (systems[s]) this.systems[s] = systems[s];
    if (missing.join() !== this.state.designsMissing.join()) this.set({ designsMissing: missing });
    if (this.designTimer) clearTimeout(this.designTimer);
    this.designTimer = setTimeout(() => this.pushDesigns(), DESIGN_DEBOUNCE_MS);
  }

  private pushDesigns(): void {
    this.designTimer = null;
    const lv = this.state.levels;
    if (!lv) return;
    for (const s of ['a', 'b'] as const) {
      const sys = this.systems[s];
      // A drive the model refuses is never sent: resolveLevels sends the design with its new drive.
      const usable = lv[s].voltsFs > 0 && lv[s].voltsFs < MAX_VOLTS_FS;
      if (sys && sys !== this.sentSystems[s] && usable) {
        this.post(this.designMessage(s, sys, lv[s].voltsFs));
        this.sentSystems[s] = sys;
      }
    }
    this.scheduleLevels(LEVEL_DEBOUNCE_MS);
  }

  /** A design for the worklet with its measured ways' FIRs built here, so the audio thread never builds one. */
  private designMessage(slot: DesignSlot, system: SpeakerSystem, voltsFs: number): ToWorklet {
    return { type: 'design', slot, system, voltsFs, measuredTaps: measuredTapsFor(system, this.state.sampleRate) };
  }

  private scheduleLevels(ms: number): void {
    if (this.levelTimer) clearTimeout(this.levelTimer);
    this.levelTimer = setTimeout(() => void this.resolveLevels(), ms);
  }

  /** The level message on show, if any: replaced or cleared by the next level result, never left stale. */
  private levelMessage: string | null = null;

  private setLevelMessage(message: string | null): void {
    // Another kind of message (the engine's) is left alone; only the previous level message is replaced.
    if (this.state.message === null || this.state.message === this.levelMessage) this.set({ message });
    this.levelMessage = message;
  }

  private async resolveLevels(): Promise<void> {
    this.levelTimer = null;
    const a = this.systems.a,
      b = this.systems.b;
    if (!a || !b || !this.channels) return;
    const systems = { a, b };
    let reply: WorkerReply;
    try {
      reply = await this.job((id) => {
        this.levelJob = id;
        return { type: 'levels', id, systems };
      });
    } catch (e) {
      this.setLevelMessage(levelFailure(e));
      return;
    }
    if (reply.type !== 'levels' || reply.id !== this.levelJob) return;
    const prev = this.state.levels;
    this.set({ levels: reply.levels });
    this.setLevelMessage(levelProblem({ a: reply.levels.a.voltsFs, b: reply.levels.b.voltsFs }));
    for (const s of ['a', 'b'] as const) {
      const v = reply.levels[s].voltsFs;
      if (!(v > 0 && v < MAX_VOLTS_FS)) continue;
      if (this.sentSystems[s] !== systems[s]) {
        this.post(this.designMessage(s, systems[s], v));
        this.sentSystems[s] = systems[s];
      } else if (!prev || prev[s].voltsFs !== v) this.post({ type: 'level', slot: s, voltsFs: v });
    }
  }

  // ---- transport and listening ----

  async play(): Promise<void> {
    await this.start();
    if (!this.ctx || !this.state.track) return;
    if (this.ctx.state !== 'running') await this.ctx.resume();
    this.post({ type: 'play', playing: true });
    this.set({ playing: true, positionAt: performance.now() });
  }

  pause(): void {
    this.post({ type: 'play', playing: false });
    this.set({ playing: false });
  }

  seek(seconds: number): void {
    const t = this.state.track;
    if (!t) return;
    const frame = Math.max(0, Math.min(t.frames - 1, Math.round(seconds * t.sampleRate)));
    this.post({ type: 'seek', frame });
    this.set({ position: frame, positionAt: performance.now() });
  }

  selectLane(lane: LaneId): void {
    this.post({ type: 'lane', lane });
    this.set({ lane });
  }

  setMode(mode: ListenMode): void {
    this.post({ type: 'mode', mode });
    this.set({ mode });
  }

  /** The monitor gain, already past the caution check (levels.ts requestMonitorGain). */
  setMonitorDb(db: number): void {
    this.post({ type: 'monitor', gainDb: db });
    this.set({ monitorDb: db });
  }

  setMatch(on: boolean): void {
    this.post({ type: 'match', on });
    this.set({ match: on });
  }

  /** A loop region in seconds, or null for none. Regions shorter than 50 ms are refused by the worklet. */
  setLoop(region: { startS: number; endS: number } | null): void {
    const t = this.state.track;
    if (!t) return;
    if (!region) {
      this.post({ type: 'loop', region: null });
      this.set({ loop: null });
      return;
    }
    const s = Math.max(0, Math.round(Math.min(region.startS, region.endS) * t.sampleRate));
    const e = Math.min(t.frames, Math.round(Math.max(region.startS, region.endS) * t.sampleRate));
    if (e - s < 0.05 * t.sampleRate) return;
    const loop = { startFrame: s, endFrame: e };
    this.post({ type: 'loop', region: loop });
    this.set({ loop });
  }

  /** The frame heard now, extrapolated between the worklet's reports. */
  positionNow(): number {
    const st = this.state;
    if (!st.track) return 0;
    if (!st.playing) return st.position;
    const f = st.position + ((performance.now() - st.positionAt) / 1000) * st.track.sampleRate;
    if (st.loop && f >= st.loop.endFrame) return st.loop.startFrame + ((f - st.loop.startFrame) % (st.loop.endFrame - st.loop.startFrame));
    return Math.min(f, st.track.frames);
  }

  // ---- offline ----

  /** Renders both designs over the whole track in the Worker: stress events and traces. */
  async renderOffline(): Promise<void> {
    const a = this.systems.a,
      b = this.systems.b;
    if (!a || !b || !this.channels) return;
    const systems = { a, b };
    this.set({ offline: { ...EMPTY_OFFLINE, status: 'running', job: 'render', systems } });
    try {
      const r = await this.job(
        (id) => ({ type: 'render', id, systems }),
        (f) => this.set({ offline: { ...this.state.offline, progress: f } }),
      );
      if (r.type === 'rendered') {
        this.set({ offline: { status: 'done', progress: 1, job: null, results: r.results, systems, message: null } });
        const track = this.state.track;
        if (track?.source === 'file' && track.kept !== 'too-large') void keepResults(resultsKey(track, systems), r.results);
      }
    } catch (e) {
      if (this.state.offline.status === 'cancelled') return;
      this.set({ offline: { ...this.state.offline, status: 'error', job: null, message: (e as Error).message } });
    }
  }

  /** Stops a running render or export: the Worker is replaced by a fresh one. */
  cancelOffline(): void {
    if (this.state.offline.status !== 'running') return;
    const keep = this.state.offline.job === 'export' ? this.state.offline : EMPTY_OFFLINE;
    for (const p of this.pending.values()) p.reject(new Error('cancelled'));
    this.pending.clear();
    this.set({ offline: { ...keep, status: 'cancelled', job: null, progress: 0, message: 'Cancelled.' } });
    this.spawnWorker();
    this.scheduleLevels(0);
  }

  /** Renders one design's stream over the whole track and hands it to the browser as a WAV download. */
  async exportWav(slot: DesignSlot, mode: ExportStream, format: ExportFormat): Promise<string | null> {
    const sys = this.systems[slot];
    const t = this.state.track;
    if (!sys || !t || !this.channels) return null;
    const before = this.state.offline;
    this.set({ offline: { ...before, status: 'running', job: 'export', progress: 0, message: null } });
    try {
      const r = await this.job(
        (id) => ({ type: 'export', id, system: sys, mode, format }),
        (f) => this.set({ offline: { ...this.state.offline, progress: f } }),
      );
      if (r.type !== 'exported') return null;
      const base =
        t.name
          .replace(/\.[a-z0-9]+$/i, '')
          .replace(/[^\w.-]+/g, '-')
          .slice(0, 60) || 'track';
      const name = `${base}.${slot}.${mode === 'nonlinear' ? 'modelled' : mode === 'linear' ? 'linear' : 'distortion'}.${format === 'f32' ? 'f32' : '16bit'}.wav`;
      const url = URL.createObjectURL(new Blob([r.bytes as BlobPart], { type: 'audio/wav' }));
      const link = document.createElement('a');
      link.href = url;
      link.download = name;
      document.body.appendChild(link);
      link.click();
      link.remove();
      setTimeout(() => URL.revokeObjectURL(url), 60_000);
      this.set({
        offline: {
          ...before,
          status: before.status === 'running' ? 'idle' : before.status,
          job: null,
          message: `Exported ${name} (${(r.bytes.byteLength / 2 ** 20).toFixed(1)} MB).`,
        },
      });
      return name;
    } catch (e) {
      if (this.state.offline.status !== 'cancelled')
        this.set({ offline: { ...before, job: null, message: `The export failed: ${(e as Error).message}` } });
      return null;
    }
  }

  /** True when the offline results belong to the designs being heard now. */
  offlineFresh(): boolean {
    const o = this.state.offline;
    return o.status === 'done' && !!o.systems && o.systems.a === this.systems.a && o.systems.b === this.systems.b;
  }
}

let shared: BenchAudio | null = null;
/** The one bench of the page: it keeps playing while the user moves between screens. */
export function benchAudio(): BenchAudio {
  shared ??= new BenchAudio();
  return shared;
}
