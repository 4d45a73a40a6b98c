// Worker thread for `preheard sweep`: loads the TypeScript step through tsx, answers one step per message.
import { parentPort, workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
const { sweepStep } = await import('./sweep-step.ts');
const channels = workerData.channels.map((sab) => new Float32Array(sab));
parentPort.on('message', (msg) => {
  parentPort.postMessage({
    index: msg.index,
    row: sweepStep(workerData.design, workerData.wayIndex, msg.point, channels, workerData.sampleRate),
  });
});
parentPort.postMessage({ ready: true });
