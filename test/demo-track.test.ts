import { describe, expect, it } from 'vitest';
import { synthesizeDemoTrack } from '../src/engine/demo/track.ts';

const rms = (x: Float32Array, from: number, to: number) => {
  let s = 0;
  for (let k = from; k < to; k++) s += x[k] * x[k];
  return Math.sqrt(s / (to - from));
};

describe('demo track', () => {
  const t = synthesizeDemoTrack(48000);

  it('is stereo, 32 s at 120 BPM, finite and peaking at -1 dBFS', () => {
    expect(t.channels[0].length).toBe(32 * 48000);
    expect(t.channels[1].length).toBe(32 * 48000);
    let peak = 0;
    let finite = true;
    for (const ch of t.channels)
      for (const v of ch) {
        finite &&= Number.isFinite(v);
        peak = Math.max(peak, Math.abs(v));
      }
    expect(finite).toBe(true);
    expect(20 * Math.log10(peak)).toBeCloseTo(-1, 2);
  });

  it('has a quiet half about 14 dB under the loud half', () => {
    const sr = t.sampleRate;
    const quiet = rms(t.channels[0], 0, 16 * sr);
    const loud = rms(t.channels[0], 16 * sr, 32 * sr);
    expect(20 * Math.log10(loud / quiet)).toBeGreaterThan(12);
    expect(20 * Math.log10(loud / quiet)).toBeLessThan(17);
  });

  it('is identical on every call and scales to other rates', () => {
    const again = synthesizeDemoTrack(48000);
    expect(again.channels[1][123457]).toBe(t.channels[1][123457]);
    expect(synthesizeDemoTrack(44100).channels[0].length).toBe(32 * 44100);
  });
});
