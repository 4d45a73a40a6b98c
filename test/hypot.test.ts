// The engine's two-argument hypot stands in for Math.hypot in the analysis (engine/complex.ts): it
// must give the very same double for every pair, or the analysis would change in its last bits.
// The reference is the JavaScript engine's own Math.hypot (ECMAScript's definition, V8's algorithm).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { hypot } from '../src/engine/complex.ts';

describe('hypot, two arguments', () => {
  it('equals Math.hypot bit for bit on any pair of doubles (NaN, infinities, -0, subnormals included)', () => {
    fc.assert(
      fc.property(fc.double(), fc.double(), (x, y) => {
        expect(Object.is(hypot(x, y), Math.hypot(x, y))).toBe(true);
      }),
      { numRuns: 20000 },
    );
  });

  it('equals Math.hypot bit for bit on a million pairs spread over eighty decades', () => {
    // A fixed linear congruential sequence (Knuth's MMIX constants): the same pairs on every run.
    let state = 0x2545f491n;
    const next = () => {
      state = (state * 6364136223846793005n + 1442695040888963407n) & 0xffffffffffffffffn;
      return Number(state >> 11n) / 2 ** 53;
    };
    const value = () => (next() - 0.5) * 10 ** Math.floor(next() * 80 - 40);
    let mismatches = 0;
    for (let i = 0; i < 1_000_000; i++) {
      const x = value();
      const y = value();
      if (!Object.is(hypot(x, y), Math.hypot(x, y))) mismatches++;
    }
    expect(mismatches).toBe(0);
  });

  it('keeps the edge cases of the specification', () => {
    expect(hypot(3, 4)).toBe(5);
    expect(Object.is(hypot(-0, -0), 0)).toBe(true);
    expect(hypot(Number.NaN, Number.POSITIVE_INFINITY)).toBe(Number.POSITIVE_INFINITY);
    expect(hypot(Number.NEGATIVE_INFINITY, Number.NaN)).toBe(Number.POSITIVE_INFINITY);
    expect(hypot(Number.NaN, 1)).toBeNaN();
    expect(hypot(1e308, 1e308)).toBe(Math.hypot(1e308, 1e308));
    expect(hypot(5e-324, 5e-324)).toBe(Math.hypot(5e-324, 5e-324));
  });
});
