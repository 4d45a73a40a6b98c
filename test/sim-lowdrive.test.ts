// Low drive: the large-signal renderer must reproduce the small-signal response of the same design
// (response/frequency.ts, Thiele 1971 / Small 1972-1973 lumped circuit) within 0.1 dB from 20 Hz to
// a 2 kHz crossover point, for sealed, vented and passive-radiator boxes at 44.1, 48 and 96 kHz.
import { describe, expect, it } from 'vitest';
import { respond } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { renderBuffer } from '../src/engine/render/index.ts';
import { toneAmplitude } from '../src/engine/level/distortion.ts';
import { radiatorBox, sealedBox, system, ventedBox, wooferOf } from './sim-fixtures.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';

const FREQS = [20, 25, 31.5, 40, 50, 63, 80, 125, 250, 500, 1000, 2000];
const VOLTS = 0.05; // a whisper: 50 mV peak per full scale keeps every nonlinearity far below 0.01 dB

function renderedGainDb(sys: SpeakerSystem, f: number, fs: number): number {
  const n = Math.round(fs * 1.6);
  const x = new Float32Array(n);
  for (let k = 0; k < n; k++) x[k] = 0.5 * Math.sin((2 * Math.PI * f * k) / fs);
  const paPerFs = 1;
  const r = renderBuffer(sys, [x], fs, { voltsFs: VOLTS, paPerFs });
  // Whole periods in the last 0.5 s (steady state).
  const periods = Math.floor(0.5 * f);
  const len = Math.round((periods * fs) / f);
  const amp = toneAmplitude(r.audio[0], n - len, len, f, fs);
  return 20 * Math.log10((amp * paPerFs) / (0.5 * VOLTS));
}

describe('low-drive agreement with the small-signal model', () => {
  const boxes = [
    ['sealed', sealedBox(14, 8)],
    ['vented', ventedBox(28, 38, 7)],
    ['passive radiator', radiatorBox()],
  ] as const;
  for (const [name, box] of boxes) {
    for (const fs of [44100, 48000, 96000]) {
      it(`${name} at ${fs} Hz within 0.1 dB, 20 Hz to 2 kHz`, () => {
        const sys = system(box, { xo: 'none' });
        const errs: number[] = [];
        for (const f of FREQS) {
          const ref = 20 * Math.log10(abs(respond(sys, wooferOf(sys), f, 1).pressure));
          errs.push(renderedGainDb(sys, f, fs) - ref);
        }
        expect(Math.max(...errs.map(Math.abs))).toBeLessThan(0.1);
      });
    }
  }
});
