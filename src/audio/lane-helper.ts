// A second thread for a Worker's engine work (engine/render/lane-share.ts): the render worker's
// renders, calibrations and exports, and a Headroom probe search that runs alone. A nested Worker
// runs the lanes the engine hands it. Shared memory needs a cross-origin isolated page (the
// servers send COOP and COEP, vite.config.ts); without it, or on one core, the work stays on one
// thread. The helper is offered only once it has answered a first message: the calling Worker
// waits on it with Atomics.wait, and in Chromium a Worker's first messages to a nested Worker it
// has just started can wait for its own event loop, which a thread blocked in Atomics.wait never
// returns to (a headroom search that used the helper as soon as it had started hung).
import type { LaneHelper, LaneJob } from '../engine/render/lane-share.ts';

/** Starts the helper where it can help: `helper()` gives it once it has answered (else undefined); `running` settles then. */
export function startLaneHelper(): { helper: () => LaneHelper | undefined; running: Promise<boolean> } {
  if (!globalThis.crossOriginIsolated || !(navigator.hardwareConcurrency > 1))
    return { helper: () => undefined, running: Promise.resolve(false) };
  const worker = new Worker(new URL('./lane.worker.ts', import.meta.url), { type: 'module' });
  let runs = false;
  const running = new Promise<boolean>((settle) => {
    worker.onmessage = (e: MessageEvent<unknown>) => {
      if (e.data !== 'running') return;
      runs = true;
      settle(true);
    };
    worker.onerror = () => {
      runs = false;
      settle(false);
    };
  });
  // Its answer proves that messages from here reach it.
  worker.postMessage('ping');
  const post: LaneHelper = (job: LaneJob) => worker.postMessage(job);
  return { helper: () => (runs ? post : undefined), running };
}
