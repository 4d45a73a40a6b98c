// A steady tone rendered through a design, for comparing renders with the small-signal analysis.
import { renderBuffer } from '../../src/engine/render/index.ts';
import type { SpeakerSystem } from '../../src/engine/system.ts';

/** A 0.25 V peak tone; the steady-state peak of the render (rms over whole cycles of the second half, times √2). */
export function renderedPeak(sys: SpeakerSystem, f: number, sr: number, mode: 'linear' | 'nonlinear'): number {
  const n = Math.round(sr * (f < 100 ? 1.2 : 0.4));
  const tone = Float32Array.from({ length: n }, (_, k) => 0.5 * Math.sin((2 * Math.PI * f * k) / sr));
  const out = renderBuffer(sys, [tone], sr, { voltsFs: 0.5, paPerFs: 1, mode }).audio[0];
  const span = Math.floor(Math.floor(n / 2 / (sr / f)) * (sr / f));
  let ss = 0;
  for (let k = n - span; k < n; k++) ss += out[k] * out[k];
  return Math.sqrt((2 * ss) / span);
}
