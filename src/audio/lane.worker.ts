// The render worker's helper thread (lane-helper.ts): runs each job the engine hands it
// (engine/render/lane-share.ts), one after the other.
import type { LaneJob } from '../engine/render/lane-share.ts';
import { runLaneJob } from '../engine/render/lane-helper.ts';

self.onmessage = (e: MessageEvent<LaneJob>) => runLaneJob(e.data);
(self as unknown as Worker).postMessage('running');
