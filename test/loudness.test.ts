import { describe, expect, it } from 'vitest';
import { integratedLoudness, kWeightingSections } from '../src/engine/level/loudness.ts';

const sine = (seconds: number, dbfs: number, hz = 1000, sr = 48000) =>
  Float32Array.from({ length: Math.round(seconds * sr) }, (_, k) => 10 ** (dbfs / 20) * Math.sin((2 * Math.PI * hz * k) / sr));
const concat = (...parts: Float32Array[]) => {
  const out = new Float32Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
};

describe('loudness (ITU-R BS.1770-4)', () => {
  it('reproduces the published K-weighting coefficients at 48 kHz', () => {
    const [shelf, hp] = kWeightingSections(48000);
    // ITU-R BS.1770-4, Tables 1 and 2 (a0 = 1)
    const published = [
      [1.53512485958697, -2.69169618940638, 1.19839281085285, -1.69065929318241, 0.73248077421585],
      [1, -2, 1, -1.99004745483398, 0.99007225036621],
    ];
    for (const [i, sec] of [shelf, hp].entries()) for (const [j, v] of published[i].entries()) expect(sec[j]).toBeCloseTo(v, 7);
  });

  it('reads a 0 dBFS 997 Hz sine in one channel as -3.01 LKFS (BS.1770-4)', () => {
    expect(integratedLoudness([sine(10, 0, 997)], 48000)).toBeCloseTo(-3.01, 1);
  });

  it.each([
    // EBU Tech 3341, cases 1 and 2 (tolerance ±0.1 LU): stereo 1 kHz sine per channel, 20 s
    [-23, -23.0],
    [-33, -33.0],
  ])('stereo 1 kHz at %f dBFS per channel reads %f LUFS (EBU Tech 3341)', (dbfs, lufs) => {
    const x = sine(20, dbfs);
    expect(Math.abs(integratedLoudness([x, x], 48000) - lufs)).toBeLessThanOrEqual(0.1);
  });

  it('gates quiet passages: 10 s at -36, 60 s at -23, 10 s at -36 dBFS reads -23.0 LUFS (EBU Tech 3341 case 3)', () => {
    const x = concat(sine(10, -36), sine(60, -23), sine(10, -36));
    expect(Math.abs(integratedLoudness([x, x], 48000) + 23)).toBeLessThanOrEqual(0.1);
  });

  it('has no loudness for silence or for less than one 400 ms block', () => {
    expect(integratedLoudness([new Float32Array(48000)], 48000)).toBe(-Infinity);
    expect(integratedLoudness([sine(0.3, -10)], 48000)).toBe(-Infinity);
  });
});
