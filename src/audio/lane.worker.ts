// The second thread of a Worker (lane-helper.ts): answers the Worker's first message, then runs
// each job the engine hands it (engine/render/lane-share.ts), one after the other.
import type { LaneJob } from '../engine/render/lane-share.ts';
import { runLaneJob } from '../engine/render/lane-helper.ts';

self.onmessage = (e: MessageEvent<LaneJob | 'ping'>) => {
  if (e.data === 'ping') (self as unknown as Worker).postMessage('running');
  else runLaneJob(e.data);
};
