// A measured frequency response of one driver: frequency (Hz), SPL (dB) and phase (degrees,
// optional), read from a text or CSV table the way impedance sweeps are (fit/text-table.ts), and
// the checks that every measured response passes, read from a table or from a design file.

import { columnRoles, FREQ_WORDS, PHASE_WORDS, readNumericRows, risingColumn, type TableError } from '../fit/text-table.ts';

export interface ResponseTable {
  /** Hz, strictly rising. */
  freqHz: number[];
  /** dB (any reference: the level is matched to the model). */
  splDb: number[];
  /** Degrees; null when the table has no phase column (the minimum phase is then used). */
  phaseDeg: number[] | null;
}

/** Fewest points of a measured response (a few per octave over the band it replaces). */
export const MIN_RESPONSE_POINTS = 10;
/** Most points kept in a design file (a response needs a few hundred; the file stays small). */
export const MAX_RESPONSE_POINTS = 5000;
/** The frequencies a measured response may span, Hz. */
export const RESPONSE_LOW_HZ = 1;
export const RESPONSE_HIGH_HZ = 100_000;
/** SPL values kept, dB (relative or absolute). */
export const RESPONSE_DB_LIMIT = 250;
/** Phase values kept, degrees (unwrapped phase may run far past ±180). */
export const RESPONSE_PHASE_LIMIT = 1e6;

/** The first point that makes a response unusable: its index (-1 for the whole table) and why. */
export interface ResponseProblem {
  index: number;
  message: string;
}

/** The checks of one response: counts, rising finite frequencies in range, finite SPL and phase. */
export function checkResponse(t: ResponseTable): ResponseProblem | null {
  const n = t.freqHz.length;
  if (n < MIN_RESPONSE_POINTS) return { index: -1, message: `has ${n} points; a measured response needs at least ${MIN_RESPONSE_POINTS}` };
  if (n > MAX_RESPONSE_POINTS) return { index: -1, message: `has ${n} points; at most ${MAX_RESPONSE_POINTS} are kept` };
  if (t.splDb.length !== n) return { index: -1, message: `has ${n} frequencies but ${t.splDb.length} SPL values` };
  if (t.phaseDeg && t.phaseDeg.length !== n) return { index: -1, message: `has ${n} frequencies but ${t.phaseDeg.length} phase values` };
  for (let i = 0; i < n; i++) {
    const f = t.freqHz[i];
    if (!Number.isFinite(f) || f < RESPONSE_LOW_HZ || f > RESPONSE_HIGH_HZ)
      return { index: i, message: `frequency ${f} Hz must be from ${RESPONSE_LOW_HZ} to ${RESPONSE_HIGH_HZ} Hz` };
    if (i > 0 && !(f > t.freqHz[i - 1])) return { index: i, message: `frequency ${f} Hz does not rise from the point before` };
    const db = t.splDb[i];
    if (!Number.isFinite(db) || Math.abs(db) > RESPONSE_DB_LIMIT)
      return { index: i, message: `SPL ${db} dB must be from -${RESPONSE_DB_LIMIT} to ${RESPONSE_DB_LIMIT} dB` };
    const ph = t.phaseDeg?.[i];
    if (ph !== undefined && !(Number.isFinite(ph) && Math.abs(ph) <= RESPONSE_PHASE_LIMIT))
      return { index: i, message: `phase ${ph}° must be a finite number of degrees` };
  }
  return null;
}

/** The blend octave runs from blend/√2 to blend·√2; the table must cover it and an octave above. */
export function checkBlendCoverage(freqHz: ArrayLike<number>, blendHz: number): string | null {
  const low = blendHz / Math.SQRT2;
  const high = blendHz * 2 * Math.SQRT2;
  const first = freqHz[0];
  const last = freqHz[freqHz.length - 1];
  if (first > low * 1.0001)
    return `starts at ${round(first)} Hz: for a blend at ${round(blendHz)} Hz it must start at ${round(low)} Hz or lower (half an octave below)`;
  if (last < high * 0.9999)
    return `ends at ${round(last)} Hz: for a blend at ${round(blendHz)} Hz it must reach ${round(high)} Hz (an octave and a half above)`;
  return null;
}

const round = (x: number) => Number(x.toPrecision(4));

type Role = 'freq' | 'spl' | 'phase' | 'other';

/** Column roles from a header's words, or null when it names no frequency and level. */
function rolesFromHeader(fields: string[]): Role[] | null {
  const roles = fields.map((raw): Role => {
    const f = raw.toLowerCase();
    if (FREQ_WORDS.test(f)) return 'freq';
    if (PHASE_WORDS.test(f)) return 'phase';
    if (/spl|db|level|mag|gain|^l$|resp|pressure/.test(f)) return 'spl';
    return 'other';
  });
  return roles.includes('freq') && roles.includes('spl') ? roles : null;
}

/**
 * Without a header: frequency is the positive column that rises (but for a stray step); the
 * others are SPL then phase, in their order.
 */
function rolesFromData(rows: number[][]): Role[] | null {
  const n = rows[0].length;
  const freqCol = risingColumn(rows, 1);
  if (freqCol === null) return null;
  const roles: Role[] = new Array(n).fill('other');
  roles[freqCol] = 'freq';
  const rest = Array.from({ length: n }, (_, j) => j).filter((j) => j !== freqCol);
  roles[rest[0]] = 'spl';
  if (rest.length > 1) roles[rest[1]] = 'phase';
  return roles;
}

export type ResponseTableResult = { ok: true; table: ResponseTable } | TableError;

/** Reads a table of frequency, SPL and optional phase; the first problem names its line. */
export function parseResponseTable(text: string): ResponseTableResult {
  const read = readNumericRows(text, MAX_RESPONSE_POINTS, 'frequency and SPL');
  if (!read.ok) return read;
  const { rows, rowLines } = read.table;
  const roles = columnRoles(read.table, rolesFromHeader, rolesFromData);
  if (!roles)
    return {
      ok: false,
      line: rowLines[0],
      message: 'cannot tell the columns apart: give a header such as "Hz dB Deg", or put frequency (rising) first, then SPL, then phase',
    };
  const fi = roles.indexOf('freq');
  const si = roles.indexOf('spl');
  const pi = roles.indexOf('phase');
  // Kept to what a measurement resolves (6 significant digits, 0.001 dB, 0.01°), so a design file stays small.
  const table: ResponseTable = {
    freqHz: rows.map((r) => Number(r[fi].toPrecision(6))),
    splDb: rows.map((r) => Math.round(r[si] * 1000) / 1000),
    phaseDeg: pi >= 0 ? rows.map((r) => Math.round(r[pi] * 100) / 100) : null,
  };
  const problem = checkResponse(table);
  if (problem)
    return problem.index >= 0
      ? { ok: false, line: rowLines[problem.index], message: problem.message }
      : { ok: false, line: rowLines[rowLines.length - 1], message: `the table ${problem.message}` };
  return { ok: true, table };
}
