// A second thread for the engine's renders and calibrations (engine/render/lane-share.ts): one
// worker thread per process, started when a command asks for it, given each job in turn. It does
// not keep the process alive. None on a machine with one core, where it could only slow the work.
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { LaneHelper, LaneJob } from '../engine/render/lane-share.ts';

let worker: Worker | null = null;

/** The worker, started on first use: it loads while the command reads its files. */
function started(): Worker {
  if (!worker) {
    worker = new Worker(new URL('./lane-worker.mjs', import.meta.url));
    worker.unref();
  }
  return worker;
}

function post(job: LaneJob): void {
  started().postMessage(job);
}

/** The process's lane helper, or undefined where a second thread would not help. */
export function laneHelper(): LaneHelper | undefined {
  return availableParallelism() > 1 ? laneThread() : undefined;
}

/** The process's lane helper on any machine (tests and benchmarks), its thread already starting. */
export function laneThread(): LaneHelper {
  started();
  return post;
}
