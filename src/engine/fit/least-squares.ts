// Nonlinear least squares by Levenberg–Marquardt (Levenberg 1944; Marquardt 1963, with Marquardt's
// diagonal scaling), and the parameters' covariance s^2·(J^T J)^-1 at the minimum (the usual
// linearised estimate; Press et al., Numerical Recipes, ch. 15.5). Written here rather than taken
// from a package because the fit's uncertainties need the Jacobian and covariance, which the small
// npm solvers do not return; n is at most a handful, so plain dense algebra is enough.

export interface LeastSquaresResult {
  x: number[];
  /** Sum of squared residuals at x. */
  ssr: number;
  /** Covariance of x, s^2·(J^T J)^-1 with s^2 = ssr/(m - n); null when J^T J is singular. */
  covariance: number[][] | null;
  iterations: number;
  converged: boolean;
}

export interface LeastSquaresOptions {
  maxIterations?: number;
  /** Relative decrease of the sum of squares below which the search stops. */
  tolerance?: number;
}

const sumSquares = (r: ArrayLike<number>) => {
  let s = 0;
  for (let i = 0; i < r.length; i++) s += r[i] * r[i];
  return s;
};

/** Forward-difference Jacobian, one row per residual. */
function jacobian(residuals: (x: number[]) => Float64Array, x: number[], r0: Float64Array): Float64Array[] {
  const cols: Float64Array[] = [];
  for (let j = 0; j < x.length; j++) {
    const h = 1e-7 * Math.max(1, Math.abs(x[j]));
    const xp = x.slice();
    xp[j] += h;
    const rp = residuals(xp);
    const col = new Float64Array(r0.length);
    for (let i = 0; i < r0.length; i++) col[i] = (rp[i] - r0[i]) / h;
    cols.push(col);
  }
  return cols;
}

/** Solves A·y = b by Gaussian elimination with partial pivoting; null when A is singular. */
export function solveLinear(a: number[][], b: number[]): number[] | null {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i]]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    if (!(Math.abs(m[p][c]) > 1e-300)) return null;
    [m[c], m[p]] = [m[p], m[c]];
    for (let r = c + 1; r < n; r++) {
      const k = m[r][c] / m[c][c];
      for (let k2 = c; k2 <= n; k2++) m[r][k2] -= k * m[c][k2];
    }
  }
  const y = new Array(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = m[r][n];
    for (let c = r + 1; c < n; c++) s -= m[r][c] * y[c];
    y[r] = s / m[r][r];
  }
  return y.every(Number.isFinite) ? y : null;
}

function normalEquations(cols: Float64Array[], r: Float64Array): { jtj: number[][]; jtr: number[] } {
  const n = cols.length;
  const jtj = Array.from({ length: n }, () => new Array(n).fill(0));
  const jtr = new Array(n).fill(0);
  for (let a = 0; a < n; a++) {
    for (let b = a; b < n; b++) {
      let s = 0;
      for (let i = 0; i < r.length; i++) s += cols[a][i] * cols[b][i];
      jtj[a][b] = s;
      jtj[b][a] = s;
    }
    let s = 0;
    for (let i = 0; i < r.length; i++) s += cols[a][i] * r[i];
    jtr[a] = s;
  }
  return { jtj, jtr };
}

/** Minimises the sum of squares of `residuals(x)` from the start `x0`. */
export function levenbergMarquardt(
  residuals: (x: number[]) => Float64Array,
  x0: number[],
  { maxIterations = 300, tolerance = 1e-13 }: LeastSquaresOptions = {},
): LeastSquaresResult {
  let x = x0.slice();
  let r = residuals(x);
  let ssr = sumSquares(r);
  if (!Number.isFinite(ssr)) throw new Error('the starting point of the fit gives no finite residual');
  let lambda = 1e-3;
  let converged = false;
  let iterations = 0;
  for (; iterations < maxIterations && !converged; iterations++) {
    const { jtj, jtr } = normalEquations(jacobian(residuals, x, r), r);
    let improved = false;
    while (lambda < 1e16) {
      const damped = jtj.map((row, i) => row.map((v, j) => (i === j ? v + lambda * Math.max(v, 1e-12) : v)));
      const step = solveLinear(
        damped,
        jtr.map((v) => -v),
      );
      if (!step) {
        lambda *= 10;
        continue;
      }
      const xt = x.map((v, i) => v + step[i]);
      const rt = residuals(xt);
      const st = sumSquares(rt);
      if (Number.isFinite(st) && st < ssr) {
        converged = (ssr - st) / Math.max(ssr, 1e-300) < tolerance;
        x = xt;
        r = rt;
        ssr = st;
        lambda = Math.max(lambda / 10, 1e-12);
        improved = true;
        break;
      }
      lambda *= 10;
    }
    if (!improved) converged = true;
  }
  const { jtj } = normalEquations(jacobian(residuals, x, r), r);
  const dof = Math.max(1, r.length - x.length);
  const s2 = ssr / dof;
  const covariance: number[][] = [];
  for (let j = 0; j < x.length; j++) {
    const e = new Array(x.length).fill(0);
    e[j] = 1;
    const col = solveLinear(jtj, e);
    if (!col) return { x, ssr, covariance: null, iterations, converged };
    covariance.push(col.map((v) => v * s2));
  }
  return { x, ssr, covariance, iterations, converged };
}
