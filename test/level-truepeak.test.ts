// The true-peak guard: below its threshold a plain delay of `latency` frames whatever the block
// sizes; over the ceiling it turns the level down so no output sample passes the ceiling, and
// once released it is a plain delay again. The reference is the input itself, delayed and scaled.
import { describe, expect, it } from 'vitest';
import { TruePeakGuard } from '../src/engine/level/truepeak.ts';

const fs = 48000;

function noise(seed: number): () => number {
  let s = seed;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296 - 0.5;
  };
}

/** Runs the guard over x (one array per channel) in blocks of random length 1..maxBlock. */
function guarded(guard: TruePeakGuard, x: Float64Array[], scale: number, maxBlock: number, seed: number): Float32Array[] {
  const n = x[0].length;
  const out = x.map(() => new Float32Array(n));
  const rand = noise(seed);
  for (let s = 0; s < n; ) {
    const m = Math.min(n - s, 1 + Math.floor((rand() + 0.5) * maxBlock));
    guard.processBlock(
      x.map((c) => c.subarray(s, s + m)),
      m,
      scale,
      out,
      s,
    );
    s += m;
  }
  return out;
}

describe('TruePeakGuard', () => {
  it('is a plain delay of its latency below the threshold, in blocks shorter and longer than its history', () => {
    const rand = noise(7);
    const n = 20000;
    const x = [0, 1].map((c) => Float64Array.from({ length: n }, (_, k) => 0.35 * Math.sin(0.01 * k + c) + 0.1 * rand()));
    for (const maxBlock of [5, 100, 700]) {
      const guard = new TruePeakGuard(2, fs);
      const scale = 1.25;
      const y = guarded(guard, x, scale, maxBlock, maxBlock);
      const lat = guard.latency;
      for (let c = 0; c < 2; c++) {
        for (let k = 0; k < lat; k++) expect(y[c][k]).toBe(0);
        for (let k = lat; k < n; k++)
          if (y[c][k] !== Math.fround(x[c][k - lat] * scale)) expect([c, k, y[c][k]]).toEqual([c, k, Math.fround(x[c][k - lat] * scale)]);
      }
      expect(guard.minGain).toBe(1);
      expect(guard.activeFrames).toBe(0);
    }
  });

  it('holds a loud burst under the ceiling, then is a plain delay again once released', () => {
    const n = 5 * fs;
    const burst = [fs, fs + 0.2 * fs];
    const x = [0, 1].map((c) =>
      Float64Array.from(
        { length: n },
        (_, k) => (k >= burst[0] && k < burst[1] ? 2 : 0.3) * Math.sin((2 * Math.PI * (440 + 3 * c) * k) / fs),
      ),
    );
    const guard = new TruePeakGuard(2, fs);
    const y = guarded(guard, x, 1, 300, 3);
    let peak = 0;
    for (const c of y) for (const v of c) peak = Math.max(peak, Math.abs(v));
    // -0.1 dBFS ceiling; the sample peak stays at or under it (Float32 rounding allowed).
    expect(peak).toBeLessThanOrEqual(guard.ceiling * (1 + 1e-7));
    expect(peak).toBeGreaterThan(0.95 * guard.ceiling);
    // The burst's samples reach 2: about 6 dB (2 over the ceiling) of reduction.
    expect(guard.reductionDb()).toBeGreaterThan(6);
    expect(guard.reductionDb()).toBeLessThan(6.6);
    // The 80 ms release has brought the gain back to exactly 1 well before the last second.
    const lat = guard.latency;
    for (let c = 0; c < 2; c++)
      for (let k = 4 * fs; k < n; k++)
        if (y[c][k] !== Math.fround(x[c][k - lat])) expect([c, k, y[c][k]]).toEqual([c, k, Math.fround(x[c][k - lat])]);
  });
});
