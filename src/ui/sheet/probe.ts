// The Headroom probe's page side: which track it measures, one Worker per design running the engine's
// findHeadroom (src/audio/headroom.worker.ts), progress, cancel, and the findings kept for the
// verdict on the Client sheet and in Presentation mode. Nothing here computes physics.
import HeadroomWorker from '../../audio/headroom.worker.ts?worker';
import { TYPICAL_PASSES, type HeadroomJob, type HeadroomReply, type HeadroomResult } from '../../audio/headroom.worker.ts';
import { benchAudio } from '../../audio/bench.ts';
import { hasKeptHeadroom, keepHeadroom, keptHeadroom, resultsKey } from '../../audio/kept-track.ts';
import { synthesizeDemoTrack } from '../../engine/demo/track.ts';
import type { HeadroomFinding } from '../../engine/verdict/verdict.ts';
import type { SpeakerSystem } from '../../engine/system.ts';
import { SLOTS, type Slot } from '../store.ts';

export interface ProbeTrack {
  name: string;
  source: 'demo' | 'file';
  channels: Float32Array[];
  sampleRate: number;
  durationS: number;
  /** Identity of the track: a finding belongs to one track. */
  key: object;
}

/** Rate of the demo track when the bench has not started (the CLI tests use the same). */
export const DEMO_RATE = 48000;
let demo: ProbeTrack | null = null;

/** The track the bench has loaded, or the built-in demo track when the bench has none. */
export function currentTrack(): ProbeTrack {
  const bench = benchAudio();
  const info = bench.state.track;
  // The bench keeps its decoded samples to itself; the probe only reads them (bracket access to a
  // private field, until the bench offers a getter).
  const channels = bench.trackChannels() as Float32Array[] | null;
  if (info && channels)
    return {
      name: info.name,
      source: info.source,
      channels,
      sampleRate: info.sampleRate,
      durationS: info.frames / info.sampleRate,
      key: info,
    };
  if (!demo) {
    const t = synthesizeDemoTrack(DEMO_RATE);
    demo = { name: 'Demo track (built in)', source: 'demo', channels: t.channels, sampleRate: DEMO_RATE, durationS: t.durationS, key: {} };
  }
  return demo;
}

/** Identity of the track the probe would measure now, without making the demo track. */
export function currentTrackKey(): object | null {
  const info = benchAudio().state.track;
  return info ?? demo?.key ?? null;
}

export interface ProbeSlot {
  status: 'idle' | 'running' | 'done' | 'error';
  /** Runs through the track so far, and about how many the search will take. */
  passes: number;
  estimate: number;
  result: HeadroomResult | null;
  message: string | null;
}

export interface ProbeState {
  status: 'idle' | 'running' | 'done' | 'cancelled' | 'error';
  slots: Record<Slot, ProbeSlot>;
  /** The designs and the track the findings belong to. */
  systems: Record<Slot, SpeakerSystem> | null;
  track: { name: string; durationS: number; frames: number; key: object } | null;
  elapsedMs: number;
  /** The findings were kept from an earlier visit (same track, same designs). */
  restored?: boolean;
}

const idleSlot = (): ProbeSlot => ({ status: 'idle', passes: 0, estimate: 0, result: null, message: null });
const initial = (): ProbeState => ({ status: 'idle', slots: { a: idleSlot(), b: idleSlot() }, systems: null, track: null, elapsedMs: 0 });

/** The part of a Worker the probe uses (so a test can hand in a stand-in). */
export interface WorkerLike {
  postMessage(m: HeadroomJob): void;
  onmessage: ((e: MessageEvent<HeadroomReply>) => void) | null;
  onerror: ((e: ErrorEvent) => void) | null;
  terminate(): void;
}

export class HeadroomProbe {
  state: ProbeState = initial();
  private listeners = new Set<(s: ProbeState) => void>();
  private workers: WorkerLike[] = [];
  private run = 0;

  constructor(private readonly makeWorker: () => WorkerLike = () => new HeadroomWorker() as unknown as WorkerLike) {}

  subscribe(fn: (s: ProbeState) => void): () => void {
    this.listeners.add(fn);
    return () => this.listeners.delete(fn);
  }

  private set(patch: Partial<ProbeState>): void {
    this.state = { ...this.state, ...patch };
    for (const fn of this.listeners) fn(this.state);
  }

  private setSlot(slot: Slot, patch: Partial<ProbeSlot>): void {
    this.set({ slots: { ...this.state.slots, [slot]: { ...this.state.slots[slot], ...patch } } });
  }

  /** Overall progress 0..1 from the runs through the track done against their estimates. */
  progress(): number {
    const s = this.state.slots;
    const est = s.a.estimate + s.b.estimate;
    if (this.state.status === 'done') return 1;
    return est > 0 ? Math.min(0.99, (s.a.passes + s.b.passes) / est) : 0;
  }

  /**
   * Searches both designs at once, one Worker each (the machine's cores work side by side). A design
   * searched on this track before, unchanged since (after an edit of the other one), keeps its
   * finding and is not searched again.
   */
  start(systems: Record<Slot, SpeakerSystem>, track: ProbeTrack): void {
    this.stopWorkers();
    const before = this.state;
    // Only findings of this visit: kept ones may come from an older version of the app.
    const kept = (slot: Slot) =>
      !before.restored &&
      before.track?.key === track.key &&
      before.systems !== null &&
      before.slots[slot].status === 'done' &&
      before.slots[slot].result
        ? JSON.stringify(before.systems[slot]) === JSON.stringify(systems[slot])
        : false;
    const toRun = SLOTS.filter((slot) => !kept(slot));
    const run = ++this.run;
    const t0 = performance.now();
    const frames = track.channels[0]?.length ?? 0;
    const slots = { ...initial().slots };
    for (const slot of SLOTS) if (!toRun.includes(slot)) slots[slot] = before.slots[slot];
    this.set({
      ...initial(),
      slots,
      status: 'running',
      systems,
      track: { name: track.name, durationS: track.durationS, frames, key: track.key },
    });
    if (toRun.length === 0) this.settle(run, t0);
    for (const slot of toRun) {
      const w = this.makeWorker();
      this.workers.push(w);
      this.setSlot(slot, { status: 'running', estimate: TYPICAL_PASSES });
      w.onmessage = (e) => {
        if (run !== this.run) return;
        const r = e.data;
        if (r.type === 'progress') this.setSlot(slot, { passes: r.passes, estimate: r.estimate });
        else if (r.type === 'result')
          this.setSlot(slot, { status: 'done', passes: r.result.passes ?? 0, estimate: r.result.passes ?? 0, result: r.result });
        else this.setSlot(slot, { status: 'error', message: r.message });
        this.settle(run, t0);
      };
      w.onerror = (e) => {
        if (run !== this.run) return;
        this.setSlot(slot, { status: 'error', message: e.message || 'the headroom worker failed' });
        this.settle(run, t0);
      };
      // Each worker gets its own copy of the samples; the track stays usable here.
      w.postMessage({
        type: 'headroom',
        id: run,
        system: systems[slot],
        channels: track.channels.map((c) => c.slice()),
        sampleRate: track.sampleRate,
        threads: toRun.length === 1 ? 2 : 1,
      });
    }
  }

  private settle(run: number, t0: number): void {
    const s = this.state.slots;
    if (SLOTS.some((k) => s[k].status === 'running')) return;
    this.stopWorkers();
    if (run !== this.run) return;
    const status = SLOTS.some((k) => s[k].status === 'error') ? 'error' : 'done';
    this.set({ status, elapsedMs: performance.now() - t0 });
    const { systems, track } = this.state;
    if (status === 'done' && systems && track) void keepHeadroom(resultsKey(track, systems), { a: s.a.result, b: s.b.result });
  }

  /**
   * Brings back the findings of an earlier visit when they belong to these designs and the track the
   * bench has now (the bench is started to know its track; it restores the kept file or the demo).
   */
  async restore(systems: Record<Slot, SpeakerSystem | null>): Promise<boolean> {
    const { a, b } = systems;
    if (this.state.status !== 'idle' || !a || !b || !(await hasKeptHeadroom())) return false;
    const run = this.run;
    const bench = benchAudio();
    await bench.start();
    const info = bench.state.track;
    if (!info || this.state.status !== 'idle' || run !== this.run) return false;
    const found = await keptHeadroom(resultsKey(info, { a, b }));
    if (!found || this.state.status !== 'idle' || run !== this.run || bench.state.track !== info) return false;
    if (!found.a || !found.b) return false;
    const slot = (r: HeadroomResult): ProbeSlot => ({
      status: 'done',
      passes: r.passes ?? 0,
      estimate: r.passes ?? 0,
      result: r,
      message: null,
    });
    this.set({
      status: 'done',
      slots: { a: slot(found.a), b: slot(found.b) },
      systems: { a, b },
      track: { name: info.name, durationS: info.frames / info.sampleRate, frames: info.frames, key: info },
      elapsedMs: 0,
      restored: true,
    });
    return true;
  }

  cancel(): void {
    if (this.state.status !== 'running') return;
    this.run++;
    this.stopWorkers();
    this.set({ ...initial(), status: 'cancelled' });
  }

  private stopWorkers(): void {
    for (const w of this.workers) w.terminate();
    this.workers = [];
  }

  /** The findings for the verdict, when they belong to these designs and this track; otherwise undefined. */
  findings(
    systems: Record<Slot, SpeakerSystem | null>,
    trackKey: object | null = currentTrackKey(),
  ): [HeadroomFinding | null, HeadroomFinding | null] | undefined {
    const st = this.state;
    if (st.status !== 'done' || !st.systems || !st.track || st.track.key !== trackKey) return undefined;
    if (st.systems.a !== systems.a || st.systems.b !== systems.b) return undefined;
    const f = (r: HeadroomResult | null): HeadroomFinding | null =>
      r
        ? {
            cleanSplDb: r.clean_spl_db,
            cleanVolts: r.clean_volts,
            firstLimit: r.first_limit,
            firstLimitS: r.first_limit_s,
            firstLimitWay: r.first_limit_way ?? null,
          }
        : null;
    return [f(st.slots.a.result), f(st.slots.b.result)];
  }
}

let shared: HeadroomProbe | null = null;
/** The one probe of the page: its findings outlive a visit to the screen. (A test may hand in its worker factory on the first call.) */
export function headroomProbe(makeWorker?: () => WorkerLike): HeadroomProbe {
  shared ??= new HeadroomProbe(makeWorker);
  return shared;
}
