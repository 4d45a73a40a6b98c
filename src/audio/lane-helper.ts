// A second thread for the render worker's renders, calibrations and exports
// (engine/render/lane-share.ts): a nested Worker that runs the lanes the engine hands it. Shared
// memory needs a cross-origin isolated page (the servers send COOP and COEP, vite.config.ts);
// without it, or on one core, the work stays on one thread. The helper is offered only once it has
// said it is running: the render worker waits on it with Atomics.wait, which must never wait on a
// thread that has not started.
import type { LaneHelper, LaneJob } from '../engine/render/lane-share.ts';

/** Starts the helper where it can help; the returned function gives it once it runs, else undefined. */
export function startLaneHelper(): () => LaneHelper | undefined {
  if (!globalThis.crossOriginIsolated || !(navigator.hardwareConcurrency > 1)) return () => undefined;
  const worker = new Worker(new URL('./lane.worker.ts', import.meta.url), { type: 'module' });
  let running = false;
  worker.onmessage = (e: MessageEvent<unknown>) => {
    if (e.data === 'running') running = true;
  };
  worker.onerror = () => {
    running = false;
  };
  const post: LaneHelper = (job: LaneJob) => worker.postMessage(job);
  return () => (running ? post : undefined);
}
