// The Headroom probe's Worker (imported with `?worker`): the engine's findHeadroom on one design and
// one track, with a progress report after each probe (runs through the track so far). It runs the very call `preheard headroom` makes, so
// the numbers are the CLI's. The page cancels by terminating the worker.
// `probeHeadroom` and the message types are exported for the page and for the Node test; the
// message handler is installed only inside a worker.
import { findHeadroom } from '../engine/render/index.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import type { LaneHelper } from '../engine/render/lane-share.ts';
import { startLaneHelper } from './lane-helper.ts';

export interface HeadroomJob {
  type: 'headroom';
  id: number;
  system: SpeakerSystem;
  channels: Float32Array[];
  sampleRate: number;
  /** 2: the search runs alone (the other design's finding was kept) and may take a second thread. */
  threads?: number;
}

/** The same fields as `preheard headroom --json`, plus the renders it took and how far they ran. */
export interface HeadroomResult {
  clean_volts: number;
  clean_spl_db: number;
  first_limit: string | null;
  /** The way whose limit it is (null: the summed output, or no limit). */
  first_limit_way?: string | null;
  first_limit_s: number | null;
  renders: number;
  /** Runs through the track those renders made together (absent in findings kept by older versions). */
  passes?: number;
  /** Threads the search ran on (absent in findings kept by older versions). */
  threads?: number;
}

export type HeadroomReply =
  | { type: 'progress'; id: number; passes: number; estimate: number }
  | { type: 'result'; id: number; result: HeadroomResult }
  | { type: 'error'; id: number; message: string };

/**
 * Runs through the track a search usually takes, for the progress bar only: probes just under a
 * dirty one stop at their first event, so the work is mostly the clean probes, which run the whole
 * track. Measured on the built-in demo track: 2.0 (sealed example) and 3.0 (vented, vented in a
 * room, bandpass, passive two-way); the calibration pass before them is not counted.
 */
export const TYPICAL_PASSES = 3;

/** Progress estimate after `passes` runs through the track: the typical count, then one more while a search runs on. */
export function passEstimate(passes: number): number {
  return Math.max(TYPICAL_PASSES, Math.ceil(passes) + 1);
}

export function probeHeadroom(
  system: SpeakerSystem,
  channels: Float32Array[],
  sampleRate: number,
  onPasses?: (passes: number, estimate: number) => void,
  helper?: LaneHelper,
): HeadroomResult {
  const h = findHeadroom(system, channels, sampleRate, { onPasses: (passes) => onPasses?.(passes, passEstimate(passes)), helper });
  return {
    clean_volts: h.clean_volts,
    clean_spl_db: h.clean_spl_db,
    first_limit: h.first_limit,
    first_limit_way: h.first_limit_way,
    first_limit_s: h.first_limit_s,
    renders: h.renders,
    passes: h.passes,
  };
}

/** How long a search that runs alone waits for its second thread to answer before it runs on one, ms. */
const HELPER_START_MS = 3000;

interface WorkerScope {
  postMessage(m: HeadroomReply): void;
  onmessage: ((e: MessageEvent<HeadroomJob>) => void) | null;
}

const scope = globalThis as unknown as Partial<WorkerScope> & { WorkerGlobalScope?: unknown; document?: unknown };
if (scope.WorkerGlobalScope !== undefined && scope.document === undefined) {
  const post = (m: HeadroomReply) => scope.postMessage!(m);
  scope.onmessage = async (e) => {
    const m = e.data;
    try {
      if (m?.type !== 'headroom') throw new RangeError(`unknown job type ${JSON.stringify(m?.type)}: expected "headroom"`);
      // A search that runs alone starts a second thread, waits for it to answer (up to
      // HELPER_START_MS) and uses it where the page allows one.
      const lanes = m.threads === 2 ? startLaneHelper() : null;
      if (lanes) await Promise.race([lanes.running, new Promise((r) => setTimeout(r, HELPER_START_MS))]);
      const helper = lanes?.helper();
      const result = probeHeadroom(
        m.system,
        m.channels,
        m.sampleRate,
        (passes, estimate) => post({ type: 'progress', id: m.id, passes, estimate }),
        helper,
      );
      result.threads = helper ? 2 : 1;
      post({ type: 'result', id: m.id, result });
    } catch (err) {
      post({ type: 'error', id: m?.id ?? -1, message: err instanceof Error ? err.message : String(err) });
    }
  };
}
