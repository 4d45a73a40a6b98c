// The float input check (src/cli/float-range.ts): kept up to MAX_KEPT_PEAK, scaled by exactly
// 1/peak beyond, refused at the first sample that is not a finite number. The reference peak is
// a plain Math.abs scan written here.
import { describe, expect, it } from 'vitest';
import { checkFloatRange, MAX_KEPT_PEAK } from '../src/cli/float-range.ts';
import { InputError } from '../src/cli/command.ts';

function noise(n: number, amp: number, seed: number): Float32Array {
  let x = seed;
  return Float32Array.from({ length: n }, () => {
    x = (x * 1103515245 + 12345) % 2147483648;
    return amp * ((x / 2147483648) * 2 - 1);
  });
}

const peakByAbs = (chs: Float32Array[]) => chs.reduce((p, ch) => ch.reduce((q, v) => Math.max(q, Math.abs(v)), p), 0);

describe('float input range', () => {
  it('keeps audio peaking at MAX_KEPT_PEAK, positive or negative, untouched', () => {
    for (const sign of [1, -1]) {
      const chs = [noise(1000, 3, 1), noise(1000, 3, 2)];
      chs[1][500] = sign * MAX_KEPT_PEAK;
      const copy = chs.map((c) => c.slice());
      expect(checkFloatRange(chs, 'x.wav')).toBeNull();
      expect(chs).toEqual(copy);
    }
  });

  it('scales louder audio by exactly 1/peak, the peak found on either side of zero in any channel', () => {
    for (const [c, k, v] of [
      [0, 0, 40],
      [1, 999, -1e6],
      [1, 3, 16.000002],
    ] as const) {
      const chs = [noise(1000, 10, 3), noise(1000, 10, 4)];
      chs[c][k] = v;
      const peak = peakByAbs(chs);
      const expected = chs.map((ch) => ch.map((s) => s * (1 / peak)));
      const warning = checkFloatRange(chs, 'x.wav');
      expect(warning).toMatch(new RegExp(`x\\.wav: the audio peaks ${(20 * Math.log10(peak)).toFixed(1)} dB above full scale`));
      expect(chs).toEqual(expected);
    }
  });

  it('names the first sample that is not a finite number, in the first channel holding one', () => {
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) {
      const chs = [noise(100, 0.5, 5), noise(100, 0.5, 6)];
      chs[1][7] = bad;
      chs[1][60] = Number.NaN;
      const err = (() => {
        try {
          checkFloatRange(chs, 'y.wav');
        } catch (e) {
          return e;
        }
      })();
      expect(err).toBeInstanceOf(InputError);
      expect((err as Error).message).toBe('y.wav: sample 7 is not a finite number');
    }
  });
});
