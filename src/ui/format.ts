// Display formatting only: numbers to text with a sensible precision, SI values to display units.
// No physics here; every value shown comes from the engine.
import { counted, significant } from '../engine/number-text.ts';

/** Significant-figure formatting for read-outs (the engine's one rule), with a proper minus sign and a dash for no value. */
export function num(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—';
  if (!Number.isFinite(value)) return value > 0 ? '∞' : '−∞';
  return significant(value, digits).replace('-', '−');
}

/** Fixed decimals, with a proper minus sign. */
export function fixed(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return value.toFixed(decimals).replace('-', '−');
}

export function withUnit(text: string, unit: string): string {
  return text === '—' || unit === '' ? text : `${text} ${unit}`;
}

/** Display scale factors from the engine's SI values. */
export const TO_DISPLAY = {
  litres: 1000, // m^3 -> L
  mm: 1000, // m -> mm
  cm: 100, // m -> cm
  cm2: 1e4, // m^2 -> cm^2
  grams: 1000, // kg -> g
  mmPerN: 1000, // m/N -> mm/N
  mH: 1000, // H -> mH
} as const;

/** Largest finite value of an array (display of a curve's peak), with its index; null if none. */
export function peakOf(values: ArrayLike<number> | null | undefined): { value: number; index: number } | null {
  if (!values) return null;
  let best = -Infinity;
  let index = -1;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isFinite(v) && v > best) {
      best = v;
      index = i;
    }
  }
  return index < 0 ? null : { value: best, index };
}

/** Index of the grid point nearest to a frequency on a log-spaced grid (for text tables of a curve). */
export function nearestIndex(freqHz: ArrayLike<number>, f: number): number {
  let best = 0;
  let bestD = Infinity;
  for (let i = 0; i < freqHz.length; i++) {
    const d = Math.abs(Math.log(freqHz[i] / f));
    if (d < bestD) {
      bestD = d;
      best = i;
    }
  }
  return best;
}

/** A file name from a design name: letters, digits and dashes. */
export function fileStem(name: string): string {
  const s = name
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
  return s.slice(0, 60) || 'design';
}

/** "1 warning", "3 warnings": a count with its noun in the right number. */
export const plural = counted;

/** A sample rate as people write it: "44.1 kHz", "22.05 kHz", "48 kHz" (no trailing zeros). */
export function kHz(hz: number): string {
  return `${String(Number((hz / 1000).toPrecision(4)))} kHz`;
}
