// Thiele/Small parameters: derive the full set from any sufficient subset, report disagreement.
//
// The four relations (Thiele 1971, Small 1972) are products of powers, so in logarithms they are
// linear:  Cms = Vas/(rho c^2 Sd^2),  Mms = 1/(ws^2 Cms),  Qes = ws Mms Re / Bl^2,  Qms = ws Mms / Rms.
// Every consistent set is fixed by z = (ln ws, ln Vas, ln Qes, ln Qms); each quantity is an affine
// function of z. The given quantities pin z by least squares; the residuals say who disagrees.
import type { Air } from './system.ts';
import { error, fmt, warning, type Issue } from './issues.ts';

export type SmallSignalKey = 'fs' | 'qes' | 'qms' | 'vas' | 'bl' | 'mms' | 'cms' | 'rms';
export const SMALL_SIGNAL_KEYS: SmallSignalKey[] = ['fs', 'qes', 'qms', 'vas', 'bl', 'mms', 'cms', 'rms'];

/** SI values; a key that is absent is unknown. */
export type SmallSignalInput = Partial<Record<SmallSignalKey, number>>;
export type SmallSignalSet = Record<SmallSignalKey, number>;

/** Relative disagreement at which an over-determined set is refused; below it the set is reconciled. */
export const DISAGREE_ERROR = 0.05;
/** Datasheet rounding is usually under 1%; above this we warn. */
export const DISAGREE_WARNING = 0.01;

const DOC_FIELD: Record<SmallSignalKey, string> = {
  fs: 'fs_hz',
  qes: 'qes',
  qms: 'qms',
  vas: 'vas_l',
  bl: 'bl_tm',
  mms: 'mms_g',
  cms: 'cms_mm_per_n',
  rms: 'rms_kg_s',
};
const DOC_SCALE: Record<SmallSignalKey, number> = {
  fs: 1,
  qes: 1,
  qms: 1,
  vas: 1000,
  bl: 1,
  mms: 1000,
  cms: 1000,
  rms: 1,
};
const docValue = (key: SmallSignalKey, si: number) => fmt(si * DOC_SCALE[key]);

/** Rows of the affine map ln(q) = offset + coef · z, with z = (ln ws, ln Vas, ln Qes, ln Qms). */
function affineMap(re: number, sd: number, air: Air): Record<SmallSignalKey, { coef: number[]; offset: number }> {
  const l1 = Math.log(air.rho * air.c * air.c * sd * sd);
  const lnRe = Math.log(re);
  return {
    fs: { coef: [1, 0, 0, 0], offset: -Math.log(2 * Math.PI) },
    vas: { coef: [0, 1, 0, 0], offset: 0 },
    qes: { coef: [0, 0, 1, 0], offset: 0 },
    qms: { coef: [0, 0, 0, 1], offset: 0 },
    cms: { coef: [0, 1, 0, 0], offset: -l1 },
    mms: { coef: [-2, -1, 0, 0], offset: l1 },
    bl: { coef: [-0.5, -0.5, -0.5, 0], offset: 0.5 * (l1 + lnRe) },
    rms: { coef: [-1, -1, 0, -1], offset: l1 },
  };
}

/** Least squares for z from the given rows; null when the rows do not fix all of z. */
function solveZ(rows: { coef: number[]; target: number }[]): number[] | null {
  // Normal equations (4x4), Gaussian elimination with partial pivoting and a rank test.
  const n = 4;
  const m = Array.from({ length: n }, () => new Array<number>(n + 1).fill(0));
  for (const { coef, target } of rows) {
    for (let r = 0; r < n; r++) {
      for (let c = 0; c < n; c++) m[r][c] += coef[r] * coef[c];
      m[r][n] += coef[r] * target;
    }
  }
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r][col]) > Math.abs(m[pivot][col])) pivot = r;
    if (Math.abs(m[pivot][col]) < 1e-9) return null;
    [m[col], m[pivot]] = [m[pivot], m[col]];
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = m[r][col] / m[col][col];
      for (let c = col; c <= n; c++) m[r][c] -= f * m[col][c];
    }
  }
  return m.map((row, i) => row[n] / row[i]);
}

export interface DerivedSmallSignal {
  values: SmallSignalSet | null;
  issues: Issue[];
}

/**
 * Derives fs, Qes, Qms, Vas, Bl, Mms, Cms and Rms from any sufficient subset, given Re and Sd.
 * Over-determined sets that agree within DISAGREE_ERROR are reconciled by least squares in logs.
 */
export function deriveSmallSignal(given: SmallSignalInput, re: number, sd: number, air: Air, path = 'driver'): DerivedSmallSignal {
  const map = affineMap(re, sd, air);
  const known = SMALL_SIGNAL_KEYS.filter((k) => given[k] !== undefined);
  const rowsFor = (keys: SmallSignalKey[]) => keys.map((k) => ({ coef: map[k].coef, target: Math.log(given[k]!) - map[k].offset }));
  const z = solveZ(rowsFor(known));
  if (!z) {
    return {
      values: null,
      issues: [
        error(
          path,
          `not enough driver parameters to derive the rest (given: ${known.map((k) => DOC_FIELD[k]).join(', ') || 'none'}, besides re_ohm and sd_cm2); ` +
            'give for example fs_hz, qes, qms and vas_l, or bl_tm, mms_g, cms_mm_per_n and rms_kg_s',
        ),
      ],
    };
  }
  const evaluate = (zz: number[], k: SmallSignalKey) => Math.exp(map[k].offset + map[k].coef.reduce((s, c, i) => s + c * zz[i], 0));
  const values = Object.fromEntries(SMALL_SIGNAL_KEYS.map((k) => [k, evaluate(z, k)])) as SmallSignalSet;

  const issues: Issue[] = [];
  if (known.length > 4) {
    for (const k of known) {
      // What the other given values imply for this one, when they fix it on their own.
      const others = solveZ(rowsFor(known.filter((o) => o !== k)));
      const implied = others ? evaluate(others, k) : values[k];
      const rel = given[k]! / implied - 1;
      if (Math.abs(rel) <= DISAGREE_WARNING) continue;
      const text =
        `${DOC_FIELD[k]} is given as ${docValue(k, given[k]!)} but the other driver values imply ${docValue(k, implied)} ` +
        `(${rel > 0 ? '+' : ''}${(rel * 100).toFixed(1)}%)`;
      issues.push(
        Math.abs(rel) > DISAGREE_ERROR
          ? error(`${path}.${DOC_FIELD[k]}`, `${text}; the set is inconsistent beyond ${DISAGREE_ERROR * 100}%`)
          : warning(`${path}.${DOC_FIELD[k]}`, `${text}; reconciled by least squares`),
      );
    }
  }
  return { values: issues.some((i) => i.severity === 'error') ? null : values, issues };
}

export const totalQ = (qes: number, qms: number): number => (qes * qms) / (qes + qms);

/** Qes with extra series resistance (amplifier output + cable): Qes' = Qes·(Re + Rs)/Re. */
export const qesWithSeries = (qes: number, re: number, rs: number): number => (qes * (re + rs)) / re;
