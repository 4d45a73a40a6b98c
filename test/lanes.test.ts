import { describe, expect, it } from 'vitest';
import { CROSSFADE_S, LaneMixer, type BlockRenderer } from '../src/audio/lanes.ts';

/** A lane that scales its input: enough to see which lane is heard. */
const gain = (g: number): BlockRenderer => ({
  process(input, output, frames) {
    for (let c = 0; c < output.length; c++) for (let k = 0; k < frames; k++) output[c][k] = g * (input[c]?.[k] ?? 0);
  },
});

const sr = 48000;
const run = (mixer: LaneMixer, blocks: number, onBlock?: (b: number) => void) => {
  const out: number[] = [];
  const input = [new Float32Array(128).fill(1), new Float32Array(128).fill(1)];
  const output = [new Float32Array(128), new Float32Array(128)];
  for (let b = 0; b < blocks; b++) {
    onBlock?.(b);
    mixer.process(input, output, 128);
    out.push(...output[0]);
  }
  return out;
};

describe('lane mixer', () => {
  it('switches only at a block boundary, through a crossfade of the stated length with no step larger than one fade increment', () => {
    const mixer = new LaneMixer({ a: gain(1), b: gain(0.5), ref: gain(0.25) }, 2, sr);
    mixer.monitorGain = 1;
    const out = run(mixer, 10, (b) => b === 3 && mixer.select('b'));
    expect(mixer.lastSwitchFrame).toBe(3 * 128);
    expect(out[3 * 128 - 1]).toBe(1);
    const fadeLen = Math.round(CROSSFADE_S * sr);
    expect(out[3 * 128 + fadeLen + 5]).toBeCloseTo(0.5, 6);
    let maxStep = 0;
    for (let k = 1; k < out.length; k++) maxStep = Math.max(maxStep, Math.abs(out[k] - out[k - 1]));
    expect(maxStep).toBeLessThanOrEqual(0.5 / fadeLen + 1e-6);
  });

  it('keeps every lane running while another is heard, so a switch lands mid-music without restarting', () => {
    let calls = 0;
    const counting: BlockRenderer = {
      process: (i, o, f) => {
        calls++;
        gain(1).process(i, o, f);
      },
    };
    const mixer = new LaneMixer({ a: gain(1), b: counting, ref: gain(1) }, 2, sr);
    run(mixer, 5);
    expect(calls).toBe(5);
  });

  it('finishes a running fade before starting the next one', () => {
    const mixer = new LaneMixer({ a: gain(1), b: gain(0), ref: gain(-1) }, 2, sr);
    mixer.monitorGain = 1;
    const out = run(mixer, 8, (b) => {
      if (b === 1) mixer.select('b');
      if (b === 2) mixer.select('ref');
    });
    let maxStep = 0;
    for (let k = 1; k < out.length; k++) maxStep = Math.max(maxStep, Math.abs(out[k] - out[k - 1]));
    expect(maxStep).toBeLessThanOrEqual(1 / Math.round(CROSSFADE_S * sr) + 1e-6);
    expect(out.at(-1)).toBeCloseTo(-1, 6);
  });
});
