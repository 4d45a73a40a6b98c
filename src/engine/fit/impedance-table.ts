// Reading a measured impedance table: frequency, |Z| (ohm) and phase (degrees, optional) in any of
// the common column orders, with header or comment lines, decimal points or decimal commas.
// A table that cannot be read is a value naming the line, never an exception (text-table.ts reads the lines).
import { columnRoles, FREQ_WORDS, PHASE_WORDS, readNumericRows, risingColumn, type TableError } from './text-table.ts';

export interface ImpedanceTable {
  /** Hz, strictly rising. */
  freq: number[];
  /** ohm */
  magnitude: number[];
  /** degrees; null when the table has no phase column. */
  phaseDeg: number[] | null;
}

export type TableResult = { ok: true; table: ImpedanceTable } | TableError;

/** Longest table read; a sweep has a few thousand points at most. */
export const MAX_TABLE_ROWS = 100_000;
/** Fewest points a fit can use (seven parameters, with room to judge the residual). */
export const MIN_TABLE_ROWS = 20;

type Role = 'freq' | 'mag' | 'phase' | 'other';

/** Column roles from a header's words, or null when the header names no frequency and impedance. */
function rolesFromHeader(fields: string[]): Role[] | null {
  const roles = fields.map((raw): Role => {
    const f = raw.toLowerCase();
    if (FREQ_WORDS.test(f)) return 'freq';
    if (PHASE_WORDS.test(f)) return 'phase';
    if (/imp|ohm|mag|^\|?z\|?$|^z\b|ω|Ω/i.test(f)) return 'mag';
    return 'other';
  });
  return roles.includes('freq') && roles.includes('mag') ? roles : null;
}

/**
 * Column roles from the numbers alone: frequency is the column that rises (but for a stray step); of the others, a column
 * with negative values or values the size of angles and of both signs is the phase, and the first
 * column positive throughout is |Z|. With two positive candidates the common order f, |Z|, phase
 * is taken.
 */
function rolesFromData(rows: number[][]): Role[] | null {
  const n = rows[0].length;
  const col = (j: number) => rows.map((r) => r[j]);
  const freqCol = risingColumn(rows, 2);
  if (freqCol === null) return null;
  const roles: Role[] = new Array(n).fill('other');
  roles[freqCol] = 'freq';
  const rest = Array.from({ length: n }, (_, j) => j).filter((j) => j !== freqCol);
  const positive = rest.filter((j) => col(j).every((x) => x > 0));
  const phaseLike = rest.filter((j) => col(j).some((x) => x < 0) && col(j).every((x) => Math.abs(x) <= 180));
  const magCol = positive[0];
  if (magCol === undefined) return null;
  roles[magCol] = 'mag';
  const phaseCol = phaseLike.find((j) => j !== magCol) ?? (rest.length >= 2 ? rest.find((j) => j !== magCol) : undefined);
  if (phaseCol !== undefined) roles[phaseCol] = 'phase';
  return roles;
}

/** Reads a table of frequency, |Z| and optional phase. */
export function parseImpedanceTable(text: string): TableResult {
  const read = readNumericRows(text, MAX_TABLE_ROWS, 'frequency and impedance');
  if (!read.ok) return read;
  const { rows, rowLines } = read.table;
  const roles = columnRoles(read.table, rolesFromHeader, rolesFromData);
  if (!roles)
    return {
      ok: false,
      line: rowLines[0],
      message:
        'cannot tell the columns apart: give a header such as "Hz Ohm Deg", or put frequency (rising) first and impedance (above zero) next',
    };
  const fi = roles.indexOf('freq');
  const mi = roles.indexOf('mag');
  const pi = roles.indexOf('phase');
  const freq: number[] = [];
  const magnitude: number[] = [];
  const phaseDeg: number[] = [];
  for (let k = 0; k < rows.length; k++) {
    const r = rows[k];
    const lineNo = rowLines[k];
    if (!(r[fi] > 0)) return { ok: false, line: lineNo, message: `frequency ${r[fi]} Hz must be above zero` };
    if (k > 0 && !(r[fi] > freq[k - 1]))
      return { ok: false, line: lineNo, message: `frequency ${r[fi]} Hz does not rise from the line before` };
    if (!(r[mi] > 0)) return { ok: false, line: lineNo, message: `impedance ${r[mi]} ohm must be above zero` };
    if (pi >= 0 && !(Math.abs(r[pi]) <= 180))
      return { ok: false, line: lineNo, message: `phase ${r[pi]}° must be from -180 to 180 degrees` };
    freq.push(r[fi]);
    magnitude.push(r[mi]);
    if (pi >= 0) phaseDeg.push(r[pi]);
  }
  if (freq.length < MIN_TABLE_ROWS)
    return {
      ok: false,
      line: rowLines[rowLines.length - 1],
      message: `the table has ${freq.length} rows; a fit needs at least ${MIN_TABLE_ROWS}`,
    };
  return { ok: true, table: { freq, magnitude, phaseDeg: pi >= 0 ? phaseDeg : null } };
}
