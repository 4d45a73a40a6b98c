// Two joined cascades in one WebAssembly loop (src/engine/filters/cascade-pair.ts), as the
// calibration pass runs two ways of a channel: each lane must be its JoinedCascade's processInPlace
// on the input copied to Float64, bit for bit (a zero's sign aside, from the shorter lane's
// pass-through padding; the calibration only squares its samples). Random stable sections, gains,
// lengths that differ by whole groups of four, and uneven blocks, as a track's last block is.
import { describe, expect, it } from 'vitest';
import { BiquadCascade, JoinedCascade } from '../src/engine/filters/biquad.ts';
import { cascadesPairable, processCascadePair } from '../src/engine/filters/cascade-pair.ts';

function lcg(seed: number): () => number {
  let x = seed;
  return () => {
    x = (x * 1103515245 + 12345) % 2147483648;
    return x / 2147483648;
  };
}

/** A joined cascade of `stages` random stable stages of 1 to 5 sections each (seeded). */
function joined(seed: number, stages: number): JoinedCascade {
  const r = lcg(seed);
  return new JoinedCascade(
    Array.from({ length: stages }, () => {
      const n = 1 + Math.floor(r() * 5);
      const coef = new Float64Array(5 * n);
      for (let k = 0; k < n; k++) {
        const rad = 0.3 + 0.69 * r(),
          th = Math.PI * r();
        coef.set([r() * 2 - 1, r() * 2 - 1, r() * 2 - 1, -2 * rad * Math.cos(th), rad * rad], 5 * k);
      }
      return new BiquadCascade(coef, 0.1 + 3 * r());
    }),
  );
}

describe('two joined cascades in one loop', () => {
  it('each lane is its cascade alone, bit for bit, over uneven blocks', () => {
    const rand = lcg(11);
    let lengthsDiffered = 0;
    for (let trial = 0; trial < 30; trial++) {
      const stagesA = 1 + (trial % 4),
        stagesB = 1 + ((trial * 7) % 5);
      const [refA, refB, pairA, pairB] = [
        joined(trial, stagesA),
        joined(500 + trial, stagesB),
        joined(trial, stagesA),
        joined(500 + trial, stagesB),
      ];
      expect(cascadesPairable(pairA, pairB)).toBe(true);
      if (pairA.sections !== pairB.sections) lengthsDiffered++;
      const input = Float32Array.from({ length: 20000 }, () => rand() * 2 - 1);
      const outA = new Float64Array(input.length),
        outB = new Float64Array(input.length);
      const a = new Float64Array(8192),
        b = new Float64Array(8192),
        bufA = new Float64Array(8192),
        bufB = new Float64Array(8192);
      for (let s = 0; s < input.length; ) {
        const n = Math.min(input.length - s, 1 + Math.floor(rand() * 8192));
        const block = input.subarray(s, s + n);
        for (let j = 0; j < n; j++) bufA[j] = bufB[j] = block[j];
        refA.processInPlace(bufA, 0, n);
        refB.processInPlace(bufB, 0, n);
        processCascadePair(pairA, pairB, block, n, a, b);
        for (let j = 0; j < n; j++) {
          if (a[j] !== bufA[j] || b[j] !== bufB[j])
            throw new Error(`trial ${trial}, frame ${s + j}: ${a[j]}, ${b[j]} against ${bufA[j]}, ${bufB[j]}`);
        }
        outA.set(a.subarray(0, n), s);
        outB.set(b.subarray(0, n), s);
        s += n;
      }
      // Not a silent test: the outputs move.
      expect(outA.some((v) => Math.abs(v) > 1e-3) && outB.some((v) => Math.abs(v) > 1e-3)).toBe(true);
    }
    expect(lengthsDiffered).toBeGreaterThan(10);
  });
});
