// The body of `preheard compare`'s worker thread: design B's side (compare-side.ts) over the shared
// audio; the audio it renders is handed back without a copy.
import { parentPort, workerData } from 'node:worker_threads';
import { InputProblem } from '../engine/issues.ts';
import { loadDesignFile } from './design-file.ts';
import { renderSide } from './compare-side.ts';

const port = parentPort!;
const channels = (workerData.channels as SharedArrayBuffer[]).map((sab) => new Float32Array(sab));
try {
  const { system } = await loadDesignFile(workerData.designPath);
  const side = renderSide(system, channels, workerData.sampleRate, workerData.level);
  port.postMessage(
    { side },
    side.audio.map((a) => a.buffer as ArrayBuffer),
  );
} catch (e) {
  // An InputProblem is the user's input (the main thread words it); anything else is a fault.
  port.postMessage({ error: e instanceof Error ? e.message : String(e), problem: e instanceof InputProblem });
}
