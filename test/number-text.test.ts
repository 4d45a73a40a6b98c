// Numbers as text: three significant figures, whole numbers kept, the app's read-out form.
import { describe, expect, it } from 'vitest';
import { fmt } from '../src/engine/issues.ts';
import { significant } from '../src/engine/number-text.ts';
import { num, plural } from '../src/ui/format.ts';

describe('three significant figures', () => {
  it('rounds read-outs and messages to three figures', () => {
    expect(significant(4.98912)).toBe('4.99');
    expect(significant(0.37612)).toBe('0.376');
    expect(significant(0.41127)).toBe('0.411');
    expect(significant(2.83)).toBe('2.83');
    expect(significant(2.8)).toBe('2.80');
    expect(significant(180.6089)).toBe('181');
    expect(significant(2.53707)).toBe('2.54');
    expect(significant(-0.0123456)).toBe('-0.0123');
    expect(fmt(4.98912)).toBe('4.99');
    // Messages echo typed values as typed: no trailing zeros.
    expect(fmt(2)).toBe('2');
    expect(fmt(2.83)).toBe('2.83');
    expect(fmt(15.6213)).toBe('15.6');
    expect(fmt(12345)).toBe('12345');
    expect(fmt(2.5e7)).toBe('2.50e+7');
  });

  it('carries a rounding into the next whole digit without a fourth figure', () => {
    expect(significant(9.996)).toBe('10.0');
    expect(significant(99.96)).toBe('100');
    expect(significant(0.09996)).toBe('0.100');
  });

  it('keeps whole numbers of more digits whole, and uses an exponent only for extreme magnitudes', () => {
    expect(significant(6000)).toBe('6000');
    expect(significant(12345)).toBe('12345');
    expect(significant(12345.6)).toBe('12346');
    expect(significant(2.5e7)).toBe('2.50e+7');
    expect(significant(1.5e-5)).toBe('1.50e-5');
    expect(significant(0)).toBe('0');
    expect(significant(Number.NaN)).toBe('NaN');
  });

  it('shows read-outs with a proper minus, a dash for no value, and counts with their noun', () => {
    expect(num(-3.14159)).toBe('−3.14');
    expect(num(null)).toBe('—');
    expect(num(Number.POSITIVE_INFINITY)).toBe('∞');
    expect(num(3, 2)).toBe('3.0');
    expect(plural(1, 'warning')).toBe('1 warning');
    expect(plural(0, 'error')).toBe('0 errors');
  });
});

describe('times as m:ss.s', () => {
  it('rounds before splitting minutes from seconds', async () => {
    const { clock } = await import('../src/ui/bench/palette.ts');
    expect(clock(59.96)).toBe('1:00.0');
    // A switch at sample 176,128 of a 44.1 kHz track: 3.9938 s.
    expect(clock(176128 / 44100)).toBe('0:04.0');
    expect(clock(125.94, 1)).toBe('2:05.9');
    expect(clock(-1)).toBe('0:00.0');
  });
});
