// The charts' curves are stroked through fewer points than they have: every point left out must lie
// within the stated tolerance of the line drawn, the ends and the gaps must stay where they are, and
// a smooth response on the analysis grid must lose most of its points (the reason for doing it).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LINE_TOLERANCE_PX, lineRuns } from '../src/ui/charts/line-path.ts';

/** Distance from a point to a segment, written out here (plane geometry, no source needed). */
function segmentDistance(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax;
  const dy = by - ay;
  const len2 = dx * dx + dy * dy;
  const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / len2));
  return Math.hypot(px - (ax + t * dx), py - (ay + t * dy));
}

/** The stretches without a gap, as the chart has them: index ranges of finite values. */
function stretches(ys: (number | null)[]): [number, number][] {
  const out: [number, number][] = [];
  let start = -1;
  ys.forEach((y, i) => {
    const ok = y !== null && Number.isFinite(y);
    if (ok && start < 0) start = i;
    if (!ok && start >= 0) {
      out.push([start, i - 1]);
      start = -1;
    }
  });
  if (start >= 0) out.push([start, ys.length - 1]);
  return out.filter(([a, b]) => b > a);
}

/** Checks a simplification against the points it came from; returns the largest distance found. */
function worstDeviation(xs: number[], ys: (number | null)[], runs: number[][]): number {
  const parts = stretches(ys);
  expect(runs.length).toBe(parts.length);
  let worst = 0;
  parts.forEach(([a, b], r) => {
    const run = runs[r];
    // The ends stay exactly where they were.
    expect([run[0], run[1]]).toEqual([xs[a], ys[a]]);
    expect([run[run.length - 2], run[run.length - 1]]).toEqual([xs[b], ys[b]]);
    for (let i = a; i <= b; i++) {
      let d = Number.POSITIVE_INFINITY;
      for (let k = 0; k + 3 < run.length; k += 2)
        d = Math.min(d, segmentDistance(xs[i], ys[i]!, run[k], run[k + 1], run[k + 2], run[k + 3]));
      worst = Math.max(worst, d);
    }
  });
  return worst;
}

describe('a chart line through fewer points', () => {
  it('keeps every point within the tolerance, the ends of each stretch, and its gaps (random curves)', () => {
    const value = fc.oneof(
      { weight: 12, arbitrary: fc.double({ min: -300, max: 300, noNaN: true }) },
      { weight: 1, arbitrary: fc.constant(null) },
      { weight: 1, arbitrary: fc.constant(Number.NaN) },
    );
    fc.assert(
      fc.property(fc.array(value, { minLength: 0, maxLength: 200 }), fc.double({ min: 0.2, max: 5, noNaN: true }), (ys, step) => {
        const xs = ys.map((_, i) => 10 + i * step);
        const runs = lineRuns(xs, ys);
        expect(worstDeviation(xs, ys, runs)).toBeLessThanOrEqual(LINE_TOLERANCE_PX + 1e-9);
      }),
      { numRuns: 300 },
    );
  });

  it('draws a smooth response on the analysis grid through a fraction of its points, within a quarter pixel', () => {
    // A second-order high-pass (Q 0.7, 45 Hz) in dB on a 48-points-per-octave grid from 10 Hz to
    // 20 kHz, drawn 450 px wide over three decades and 250 px over 60 dB: a chart of the Curves screen.
    const f: number[] = [];
    for (let x = 10; x <= 20000; x *= 2 ** (1 / 48)) f.push(x);
    const db = f.map((hz) => {
      const r = (hz / 45) ** 2;
      return 10 * Math.log10((r * r) / ((1 - r) ** 2 + r / 0.49));
    });
    const xs = f.map((hz) => (450 * Math.log10(hz / 10)) / Math.log10(2000));
    const ys = db.map((d) => 250 * (1 - (d + 60) / 60));
    const runs = lineRuns(xs, ys);
    expect(worstDeviation(xs, ys, runs)).toBeLessThanOrEqual(LINE_TOLERANCE_PX + 1e-9);
    const kept = runs[0].length / 2;
    expect(f.length).toBeGreaterThan(500);
    // Measured: 527 points drawn through 12.
    expect(kept).toBeGreaterThanOrEqual(6);
    expect(kept).toBeLessThan(f.length / 8);
  });

  it('leaves a lone point between gaps undrawn and an empty or all-gap curve empty', () => {
    expect(lineRuns([], [])).toEqual([]);
    expect(lineRuns([1, 2, 3], [null, Number.NaN, null])).toEqual([]);
    expect(lineRuns([1, 2, 3, 4, 5], [1, null, 2, null, 3])).toEqual([]);
    expect(lineRuns([1, 2, 3, 4], [5, 5, null, 7])).toEqual([[1, 5, 2, 5]]);
  });

  it('draws a limit line (one value at every frequency) as one segment', () => {
    const xs = Array.from({ length: 500 }, (_, i) => 20 + i * 0.9);
    expect(lineRuns(xs, new Array(500).fill(42.5))).toEqual([[20, 42.5, 20 + 499 * 0.9, 42.5]]);
  });
});
