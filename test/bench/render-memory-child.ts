// Child process of the memory benchmark: decode-sized input (10 minutes of stereo float at 48 kHz),
// one full render, and the peak resident set growth over the process's own baseline.
import { renderBuffer } from '../../src/engine/render/index.ts';
import { exampleSystem } from '../helpers/audio-bench.ts';

const fs = 48000,
  n = fs * 600;
const sys = exampleSystem('vented');
// Warm the engine on a short buffer so the baseline includes code and the JIT.
renderBuffer(sys, [new Float32Array(fs).fill(0.01), new Float32Array(fs).fill(0.01)], fs, { voltsFs: 5 });
globalThis.gc?.();
const base = process.memoryUsage().rss;
const baseMax = process.resourceUsage().maxRSS * 1024;
const ch = [new Float32Array(n), new Float32Array(n)];
for (let k = 0; k < n; k++) {
  const t = k / fs;
  ch[0][k] = 0.4 * Math.sin(2 * Math.PI * 45 * t) + 0.1 * Math.sin(2 * Math.PI * 440 * t);
  ch[1][k] = 0.4 * Math.sin(2 * Math.PI * 45 * t) + 0.1 * Math.sin(2 * Math.PI * 550 * t);
}
const decoded = 2 * n * 4;
const r = renderBuffer(sys, ch, fs, { voltsFs: 10 });
const peak = process.resourceUsage().maxRSS * 1024;
const ratio = (peak - Math.min(base, baseMax)) / decoded;
process.stdout.write(
  `${JSON.stringify({ ratio, decodedMb: decoded / 2 ** 20, peakMb: peak / 2 ** 20, baseMb: base / 2 ** 20, frames: r.summary.duration_s })}\n`,
);
