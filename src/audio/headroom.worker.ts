// The Headroom probe's Worker (imported with `?worker`): the engine's findHeadroom on one design and
// one track, with a progress report per render. It runs the very call `preheard headroom` makes, so
// the numbers are the CLI's. The page cancels by terminating the worker.
// `probeHeadroom` and the message types are exported for the page and for the Node test; the
// message handler is installed only inside a worker.
import { findHeadroom } from '../engine/render/index.ts';
import type { SpeakerSystem } from '../engine/system.ts';

export interface HeadroomJob {
  type: 'headroom';
  id: number;
  system: SpeakerSystem;
  channels: Float32Array[];
  sampleRate: number;
}

/** The same fields as `preheard headroom --json`, plus the number of renders it took. */
export interface HeadroomResult {
  clean_volts: number;
  clean_spl_db: number;
  first_limit: string | null;
  /** The way whose limit it is (null: the summed output, or no limit). */
  first_limit_way?: string | null;
  first_limit_s: number | null;
  renders: number;
}

export type HeadroomReply =
  | { type: 'progress'; id: number; renders: number; estimate: number }
  | { type: 'result'; id: number; result: HeadroomResult }
  | { type: 'error'; id: number; message: string };

/**
 * Renders a search usually takes, for the progress bar only: the first probe, one bracketing step,
 * then the linear model's guess and a step or two from it. Measured on the built-in demo track: 3
 * (sealed example), 4 (vented, vented in a room, bandpass). The calibration pass before them is
 * counted as part of the first.
 */
export const TYPICAL_RENDERS = 4;

/** Progress estimate after `renders` renders: the typical count, then one more while a search runs on. */
export function renderEstimate(renders: number): number {
  return Math.max(TYPICAL_RENDERS, renders + 1);
}

export function probeHeadroom(
  system: SpeakerSystem,
  channels: Float32Array[],
  sampleRate: number,
  onRender?: (renders: number, estimate: number) => void,
): HeadroomResult {
  let n = 0;
  const h = findHeadroom(system, channels, sampleRate, {
    onRender: () => {
      n++;
      onRender?.(n - 1, renderEstimate(n));
    },
  });
  return {
    clean_volts: h.clean_volts,
    clean_spl_db: h.clean_spl_db,
    first_limit: h.first_limit,
    first_limit_way: h.first_limit_way,
    first_limit_s: h.first_limit_s,
    renders: h.renders,
  };
}

interface WorkerScope {
  postMessage(m: HeadroomReply): void;
  onmessage: ((e: MessageEvent<HeadroomJob>) => void) | null;
}

const scope = globalThis as unknown as Partial<WorkerScope> & { WorkerGlobalScope?: unknown; document?: unknown };
if (scope.WorkerGlobalScope !== undefined && scope.document === undefined) {
  const post = (m: HeadroomReply) => scope.postMessage!(m);
  scope.onmessage = (e) => {
    const m = e.data;
    try {
      if (m?.type !== 'headroom') throw new RangeError(`unknown job type ${JSON.stringify(m?.type)}: expected "headroom"`);
      const result = probeHeadroom(m.system, m.channels, m.sampleRate, (renders, estimate) =>
        post({ type: 'progress', id: m.id, renders, estimate }),
      );
      post({ type: 'result', id: m.id, result });
    } catch (err) {
      post({ type: 'error', id: m?.id ?? -1, message: err instanceof Error ? err.message : String(err) });
    }
  };
}
