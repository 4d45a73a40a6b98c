// A second thread for the engine's renders and calibrations (engine/render/lane-share.ts): one
// worker thread per process, started on first use, given each job in turn. It does not keep the
// process alive. None on a machine with one core, where it could only slow the work down.
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { LaneHelper, LaneJob } from '../engine/render/lane-share.ts';

let worker: Worker | null = null;

function post(job: LaneJob): void {
  if (!worker) {
    worker = new Worker(new URL('./lane-worker.mjs', import.meta.url));
    worker.unref();
  }
  worker.postMessage(job);
}

/** The process's lane helper, or undefined where a second thread would not help. */
export function laneHelper(): LaneHelper | undefined {
  return availableParallelism() > 1 ? post : undefined;
}

/** The process's lane helper on any machine (tests and benchmarks). */
export function laneThread(): LaneHelper {
  return post;
}
