// Numbers as text for people: three significant figures unless asked otherwise. The one rule behind
// the engine's messages (issues.ts fmt), the verdict sentences and the app's read-outs (ui/format.ts).

/**
 * `value` to `digits` significant figures, without an exponent for ordinary magnitudes (1e-4 up to
 * 1e6). A whole number with more digits than asked stays whole (1234 Hz, not 1230), so a typed value
 * echoed in a message reads as typed; trailing zeros are kept (2.80 V says three figures).
 */
export function significant(value: number, digits = 3): string {
  if (Number.isNaN(value)) return 'NaN';
  if (!Number.isFinite(value)) return value > 0 ? 'Infinity' : '-Infinity';
  const a = Math.abs(value);
  if (a === 0) return '0';
  if (a >= 1e6 || a < 1e-4) return value.toExponential(digits - 1);
  if (Math.floor(Math.log10(a)) + 1 >= digits) return value.toFixed(0);
  // Rounding may carry into one more whole digit (9.996 -> 10.0): count digits after rounding.
  const rounded = Number(value.toPrecision(digits));
  const intDigits = Math.floor(Math.log10(Math.abs(rounded))) + 1;
  return rounded.toFixed(Math.max(0, digits - intDigits));
}

/** `significant` without trailing zeros (4.99 V, 2 l, 2.83 V): figures in messages and tables read as typed. */
export function significantTrimmed(value: number, digits = 3): string {
  const text = significant(value, digits);
  return /e/.test(text) || !/\./.test(text) ? text : text.replace(/\.?0+$/, '');
}

/** "1 warning", "0 errors", "3 warnings": a count with its noun in the right number. */
export function counted(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}
