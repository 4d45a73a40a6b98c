// The line-level reading shared by the measured-table readers (impedance sweeps, frequency
// responses): comment lines (#, *, ;, //, %, !), header lines before the first row of numbers,
// decimal points or decimal commas, tab/semicolon/comma/space separators, one width for every row.
// A table that cannot be read is a value naming the line, never an exception.

export type TableError = { ok: false; line: number; message: string };

export interface NumericRows {
  rows: number[][];
  /** 1-based line number of each row in the text. */
  rowLines: number[];
  /** The fields of each header line before the first row of numbers, in order. */
  headers: string[][];
  width: number;
  /** Lines in the text (where a message about the whole table points). */
  lineCount: number;
}

const COMMENT = /^\s*(#|\*|;|\/\/|%|!)/;
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const DECIMAL_COMMA_NUMBER = /^[+-]?\d+(,\d+)?([eE][+-]?\d+)?$/;

/**
 * The fields of one line. Tabs and semicolons separate fields (a comma inside one is a decimal
 * comma); with neither, fields separated by white space that all read as numbers with a decimal
 * comma are taken so; otherwise commas and white space both separate.
 */
function splitFields(line: string): string[] {
  const trimmed = line.trim();
  if (/[\t;]/.test(trimmed)) return trimmed.split(/\s*[\t;]\s*/).map((f) => f.trim().replace(',', '.'));
  const bySpace = trimmed.split(/\s+/);
  if (bySpace.length >= 2 && bySpace.every((f) => DECIMAL_COMMA_NUMBER.test(f)) && bySpace.some((f) => f.includes(',')))
    return bySpace.map((f) => f.replace(',', '.'));
  return trimmed.split(/\s*,\s*|\s+/).filter((f) => f !== '');
}

/**
 * The rows of numbers of a table and its header. `twoColumns` names the two columns every row
 * needs at least (for the message), e.g. "frequency and impedance".
 */
export function readNumericRows(text: string, maxRows: number, twoColumns: string): { ok: true; table: NumericRows } | TableError {
  const lines = text.split(/\r\n|\r|\n/);
  const headers: string[][] = [];
  const rows: number[][] = [];
  const rowLines: number[] = [];
  let width = 0;
  for (let i = 0; i < lines.length; i++) {
    const lineNo = i + 1;
    const line = lines[i];
    if (line.trim() === '' || COMMENT.test(line)) continue;
    const fields = splitFields(line);
    const numeric = fields.every((f) => NUMBER.test(f));
    if (!numeric) {
      if (rows.length === 0) {
        // Text before the first row of numbers is a header; the caller decides which one names columns.
        headers.push(/[\t;,]/.test(line) ? line.trim().split(/\s*[\t;,]\s*/) : fields);
        continue;
      }
      const bad = fields.find((f) => !NUMBER.test(f)) ?? '';
      return { ok: false, line: lineNo, message: `"${bad.slice(0, 40)}" is not a number` };
    }
    if (fields.length < 2) return { ok: false, line: lineNo, message: `needs at least two columns: ${twoColumns}` };
    if (width === 0) width = fields.length;
    else if (fields.length !== width)
      return { ok: false, line: lineNo, message: `has ${fields.length} columns where the lines before have ${width}` };
    const values = fields.map(Number);
    if (!values.every(Number.isFinite)) return { ok: false, line: lineNo, message: 'has a number too large to use' };
    rows.push(values);
    rowLines.push(lineNo);
    if (rows.length > maxRows) return { ok: false, line: lineNo, message: `the table is longer than ${maxRows} rows` };
  }
  if (rows.length === 0) return { ok: false, line: lines.length, message: 'the table has no rows of numbers' };
  return { ok: true, table: { rows, rowLines, headers, width, lineCount: lines.length } };
}

/** Header words naming the frequency and the phase columns (shared by every table kind). */
export const FREQ_WORDS = /freq|^f$|hz/;
export const PHASE_WORDS = /phase|deg|^ph|angle|arg|°/;

/**
 * The frequency column from the numbers alone: of the columns positive throughout (at least
 * `positiveNeeded` of them), the one rising most often — a single step out of order is then reported
 * on its own line; null when none rises in nine steps out of ten.
 */
export function risingColumn(rows: number[][], positiveNeeded: number): number | null {
  const n = rows[0].length;
  const col = (j: number) => rows.map((r) => r[j]);
  const risingSteps = (c: number[]) => c.filter((x, i) => i > 0 && x > c[i - 1]).length;
  const candidates = Array.from({ length: n }, (_, j) => j).filter((j) => col(j).every((x) => x > 0));
  if (candidates.length < positiveNeeded) return null;
  const freqCol = candidates.reduce((a, b) => (risingSteps(col(b)) > risingSteps(col(a)) ? b : a));
  return risingSteps(col(freqCol)) < 0.9 * (rows.length - 1) ? null : freqCol;
}

/**
 * Each column's role: from the last header line that names the columns (when it names every
 * column), else from the numbers alone; null when neither tells them apart.
 */
export function columnRoles<R>(
  t: NumericRows,
  fromHeader: (fields: string[]) => R[] | null,
  fromData: (rows: number[][]) => R[] | null,
): R[] | null {
  const headerRoles = t.headers.reduce<R[] | null>((found, h) => fromHeader(h) ?? found, null);
  return headerRoles && headerRoles.length === t.width ? headerRoles : fromData(t.rows);
}
