// The partitioned convolver against the direct convolution sum y[n] = Σ h[m]·x[n−m] (its
// definition, computed here in plain loops): random taps and signals, streamed in blocks whose
// sizes are not multiples of the partition.
import { describe, expect, it } from 'vitest';
import { PartitionedConvolver } from '../src/engine/fir/partitioned-convolver.ts';

function seeded(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32 - 0.5;
  };
}

function direct(h: Float64Array, x: Float64Array): Float64Array {
  const y = new Float64Array(x.length);
  for (let n = 0; n < x.length; n++) {
    let s = 0;
    for (let m = 0; m < h.length && m <= n; m++) s += h[m] * x[n - m];
    y[n] = s;
  }
  return y;
}

describe('PartitionedConvolver', () => {
  const cases: [taps: number, partition: number, blocks: number[]][] = [
    [1000, 64, [37, 1, 200, 63, 65, 129]],
    [64, 64, [17, 50, 3]],
    [5, 16, [7, 11]],
    [3001, 128, [255, 1, 97, 300]],
    [129, 32, [31, 33, 100]],
    // Calls of whole aligned blocks (the renderer's chunks), then one that breaks the alignment.
    [90, 128, [128, 256, 128, 77, 51, 128]],
    [2000, 128, [256, 128, 1, 127, 384]],
    // Long calls (the level calibration's), two blocks at a time.
    [300, 128, [1024, 256, 384, 100, 28, 8192]],
    [90, 64, [8192]],
  ];
  for (const [taps, partition, blocks] of cases) {
    it(`${taps} taps, partition ${partition}, blocks ${blocks.join('/')}: equals the direct sum`, () => {
      const rnd = seeded(taps * 7 + partition);
      const h = Float64Array.from({ length: taps }, () => rnd());
      const x = Float64Array.from({ length: 6000 }, () => rnd());
      const want = direct(h, x);
      const conv = new PartitionedConvolver(h, partition);
      const got = new Float64Array(x.length);
      let at = 0;
      for (let b = 0; at < x.length; b++) {
        const n = Math.min(blocks[b % blocks.length], x.length - at);
        const buf = x.slice(at, at + n);
        conv.process(buf, n);
        got.set(buf, at);
        at += n;
      }
      let worst = 0;
      let peak = 0;
      for (let i = 0; i < x.length; i++) {
        worst = Math.max(worst, Math.abs(got[i] - want[i]));
        peak = Math.max(peak, Math.abs(want[i]));
      }
      expect(peak).toBeGreaterThan(0.3);
      expect(worst).toBeLessThan(1e-9 * peak);
    });
  }

  for (const [taps, partition, blocks] of cases) {
    it(`a pair of streams, ${taps} taps, partition ${partition}, blocks ${blocks.join('/')}: each equals its direct sum`, () => {
      const rnd = seeded(taps * 11 + partition);
      const h = Float64Array.from({ length: taps }, () => rnd());
      const xa = Float64Array.from({ length: 6000 }, () => rnd());
      const xb = Float64Array.from({ length: 6000 }, () => 3 * rnd());
      const wantA = direct(h, xa);
      const wantB = direct(h, xb);
      const conv = new PartitionedConvolver(h, partition, 2);
      const gotA = new Float64Array(xa.length);
      const gotB = new Float64Array(xb.length);
      let at = 0;
      for (let b = 0; at < xa.length; b++) {
        const n = Math.min(blocks[b % blocks.length], xa.length - at);
        const ba = xa.slice(at, at + n);
        const bb = xb.slice(at, at + n);
        conv.processPair(ba, bb, n);
        gotA.set(ba, at);
        gotB.set(bb, at);
        at += n;
      }
      for (const [got, want] of [
        [gotA, wantA],
        [gotB, wantB],
      ]) {
        let worst = 0;
        let peak = 0;
        for (let i = 0; i < want.length; i++) {
          worst = Math.max(worst, Math.abs(got[i] - want[i]));
          peak = Math.max(peak, Math.abs(want[i]));
        }
        expect(peak).toBeGreaterThan(0.3);
        expect(worst).toBeLessThan(1e-9 * peak);
      }
    });
  }

  it('has no latency: a unit impulse returns the taps from the first sample', () => {
    const h = Float64Array.from({ length: 300 }, (_, i) => Math.exp(-i / 40) * Math.cos(i));
    const conv = new PartitionedConvolver(h, 64);
    const buf = new Float64Array(400);
    buf[0] = 1;
    conv.process(buf, 400);
    for (let i = 0; i < 300; i++) expect(buf[i]).toBeCloseTo(h[i], 12);
    for (let i = 300; i < 400; i++) expect(Math.abs(buf[i])).toBeLessThan(1e-12);
  });
});
