// The body of the CLI's lane worker thread: runs each job the engine hands its LaneHelper
// (engine/render/lane-share.ts), one after the other, for as long as the process lives.
import { parentPort } from 'node:worker_threads';
import type { LaneJob } from '../engine/render/lane-share.ts';
import { runLaneJob } from '../engine/render/lane-helper.ts';

parentPort!.on('message', (job: LaneJob) => runLaneJob(job));
