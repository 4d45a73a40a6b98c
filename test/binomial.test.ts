import { describe, expect, it } from 'vitest';
import { probabilityAtLeast } from '../src/engine/trial/binomial.ts';

describe('binomial probability of guessing (exact binomial tail)', () => {
  it('matches hand-computed tails for a fair coin', () => {
    // 16 trials: P(X >= 12) = (1820 + 560 + 120 + 16 + 1) / 65536 = 2517/65536 (binomial coefficients)
    expect(probabilityAtLeast(12, 16)).toBeCloseTo(2517 / 65536, 12);
    // 10 trials: P(X >= 9) = (10 + 1)/1024
    expect(probabilityAtLeast(9, 10)).toBeCloseTo(11 / 1024, 12);
    expect(probabilityAtLeast(0, 10)).toBe(1);
    expect(probabilityAtLeast(5, 4)).toBe(0);
  });

  it('is about 0.5 at half right for a long odd run, by symmetry', () => {
    expect(probabilityAtLeast(51, 101)).toBeCloseTo(0.5, 10);
  });

  it('refuses fractional counts', () => {
    expect(() => probabilityAtLeast(1.5, 4)).toThrow(RangeError);
  });
});
