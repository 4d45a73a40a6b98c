// The body of a sweep worker thread: answers one step per message over the shared audio.
import { parentPort, workerData } from 'node:worker_threads';
import { sweepStep, type SweepPoint } from './sweep-step.ts';

const port = parentPort!;
const channels = (workerData.channels as SharedArrayBuffer[]).map((sab) => new Float32Array(sab));
port.on('message', (msg: { index: number; point: SweepPoint }) => {
  port.postMessage({ index: msg.index, row: sweepStep(workerData.design, msg.point, channels, workerData.sampleRate) });
});
port.postMessage({ ready: true });
