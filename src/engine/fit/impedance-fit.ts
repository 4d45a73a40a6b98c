// Driver parameters from a measured impedance curve: the small-signal model of a driver in free air
//   Z(f) = Zcoil(f) + Res / (1 + j·Qms·(f/fs - fs/f)),   Res = Re·Qms/Qes   (Thiele 1971; Small 1972)
// with the blocked coil of response/frequency.ts (Le, plus the L2R2 semi-inductance when chosen),
// fitted over the whole curve by nonlinear least squares. Parameters are fitted as logarithms, so
// they stay positive and their standard errors are relative.
import { InputProblem } from '../issues.ts';
import { abs, arg, add, cx, div, sub, type Complex } from '../complex.ts';
import { coilImpedance } from '../response/frequency.ts';
import type { ImpedanceTable } from './impedance-table.ts';
import { levenbergMarquardt } from './least-squares.ts';

export interface ImpedanceParams {
  /** ohm */
  re: number;
  /** Hz */
  fs: number;
  qms: number;
  qes: number;
  /** H */
  le: number;
  /** H; 0 without the semi-inductance */
  l2: number;
  /** ohm; 0 without the semi-inductance */
  r2: number;
}

export type CoilModel = 'le' | 'semi';

export interface ImpedanceFit {
  params: ImpedanceParams;
  /** One standard error of each parameter from the fit, same units; 0 for one not fitted. */
  sigma: ImpedanceParams;
  coil: CoilModel;
  /** RMS of the residual relative to |Z|, percent. */
  residualRmsPct: number;
  /** Whether the phase was fitted (the table had a phase column). */
  usedPhase: boolean;
  curve: FitCurve;
}

export interface FitCurve {
  freq: number[];
  measuredOhm: number[];
  measuredPhaseDeg: number[] | null;
  fittedOhm: number[];
  fittedPhaseDeg: number[];
  /** (|Z| measured - |Z| fitted) / |Z| measured, percent. */
  residualPct: number[];
}

/** The model's impedance at f. */
export function driverImpedance(p: ImpedanceParams, f: number): Complex {
  const coil = coilImpedance({ re: p.re, le: p.le, l2: p.l2, r2: p.r2 }, 2 * Math.PI * f);
  const res = (p.re * p.qms) / p.qes;
  return add(coil, div(cx(res), cx(1, p.qms * (f / p.fs - p.fs / f))));
}

const KEYS: (keyof ImpedanceParams)[] = ['re', 'fs', 'qms', 'qes', 'le', 'l2', 'r2'];

function fromLogs(x: number[], coil: CoilModel): ImpedanceParams {
  const e = x.map(Math.exp);
  return { re: e[0], fs: e[1], qms: e[2], qes: e[3], le: e[4], l2: coil === 'semi' ? e[5] : 0, r2: coil === 'semi' ? e[6] : 0 };
}

/**
 * A start from the curve's landmarks (Small 1972's reading of an impedance curve): Re the lowest
 * |Z| above the peak, fs the peak, r0 = Zmax/Re, Qms = fs·sqrt(r0)/(f2 - f1) with f1, f2 where |Z| =
 * sqrt(Zmax·Re), Qes = Qms/(r0 - 1); Le from the top of the sweep.
 */
export function startingPoint(t: ImpedanceTable): ImpedanceParams | null {
  const { freq: f, magnitude: z } = t;
  // The resonance is the point that stands highest over the lowest |Z| after it: the coil's rise
  // at the top of a sweep can be higher, but nothing after it is lower.
  const lowestAfter = new Array<number>(z.length);
  for (let i = z.length - 1; i >= 0; i--) lowestAfter[i] = Math.min(z[i], i + 1 < z.length ? lowestAfter[i + 1] : Infinity);
  let iMax = 0;
  for (let i = 1; i < z.length; i++) if (z[i] / lowestAfter[i] > z[iMax] / lowestAfter[iMax]) iMax = i;
  let iMin = iMax;
  for (let i = iMax + 1; i < z.length; i++) if (z[i] < z[iMin]) iMin = i;
  if (iMax === 0 || iMin === iMax) return null;
  const re = z[iMin];
  const r0 = z[iMax] / re;
  if (!(r0 > 1.2)) return null;
  const level = Math.sqrt(z[iMax] * re);
  let i1 = iMax;
  while (i1 > 0 && z[i1] > level) i1--;
  let i2 = iMax;
  while (i2 < iMin && z[i2] > level) i2++;
  const fs = f[iMax];
  const width = Math.max(f[i2] - f[i1], fs * 0.02);
  const qms = (fs * Math.sqrt(r0)) / width;
  const qes = qms / (r0 - 1);
  const top = z.length - 1;
  const wTop = 2 * Math.PI * f[top];
  const reactance = t.phaseDeg ? z[top] * Math.sin((t.phaseDeg[top] * Math.PI) / 180) : Math.sqrt(Math.max(z[top] ** 2 - re ** 2, 0));
  const le = Math.max(reactance / wTop, 1e-6);
  return { re, fs, qms, qes, le, l2: 0, r2: 0 };
}

function residualsFor(t: ImpedanceTable, coil: CoilModel): (x: number[]) => Float64Array {
  const n = t.freq.length;
  const measured: Complex[] = t.freq.map((_, i) => {
    const ph = t.phaseDeg ? (t.phaseDeg[i] * Math.PI) / 180 : 0;
    return cx(t.magnitude[i] * Math.cos(ph), t.magnitude[i] * Math.sin(ph));
  });
  return (x) => {
    const p = fromLogs(x, coil);
    if (t.phaseDeg) {
      // Complex residual relative to |Z|: equal weight on every point of a log sweep.
      const out = new Float64Array(2 * n);
      for (let i = 0; i < n; i++) {
        const d = sub(driverImpedance(p, t.freq[i]), measured[i]);
        out[2 * i] = d.re / t.magnitude[i];
        out[2 * i + 1] = d.im / t.magnitude[i];
      }
      return out;
    }
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = Math.log(abs(driverImpedance(p, t.freq[i])) / t.magnitude[i]);
    return out;
  };
}

interface Attempt {
  x: number[];
  ssr: number;
  covariance: number[][] | null;
  coil: CoilModel;
}

function attempt(t: ImpedanceTable, coil: CoilModel, start: ImpedanceParams): Attempt {
  const x0 = [start.re, start.fs, start.qms, start.qes, start.le, ...(coil === 'semi' ? [start.l2, start.r2] : [])].map(Math.log);
  const r = levenbergMarquardt(residualsFor(t, coil), x0);
  return { x: r.x, ssr: r.ssr, covariance: r.covariance, coil };
}

/** How much better the semi-inductance must fit, in sum of squares, before it is kept. */
const SEMI_GAIN = 0.8;

/**
 * Fits the model to a table. `coil: 'auto'` fits Le alone and Le with the semi-inductance, and keeps
 * the second when it lowers the sum of squares by more than a fifth. Throws InputProblem with a
 * message for a person when the curve has no resonance to fit.
 */
export function fitImpedance(t: ImpedanceTable, coil: CoilModel | 'auto' = 'auto'): ImpedanceFit {
  const start = startingPoint(t);
  if (!start)
    throw new InputProblem(
      'the curve shows no resonance peak followed by a minimum: the sweep must start below the resonance and go well above it',
    );
  const simple = attempt(t, 'le', start);
  let best = simple;
  if (coil !== 'le') {
    const p = fromLogs(simple.x, 'le');
    const wTop = 2 * Math.PI * t.freq[t.freq.length - 1];
    // A few corners for R2 around the top of the sweep: the semi-inductance's fit has several valleys.
    for (const k of [0.1, 0.3, 1, 3]) {
      const semi = attempt(t, 'semi', { ...p, le: p.le * 0.5, l2: p.le, r2: k * wTop * p.le });
      if (best.coil === 'le' ? coil === 'semi' || semi.ssr < SEMI_GAIN * simple.ssr : semi.ssr < best.ssr) best = semi;
    }
  }
  const params = fromLogs(best.x, best.coil);
  const sigma = Object.fromEntries(KEYS.map((k) => [k, 0])) as unknown as ImpedanceParams;
  best.x.forEach((_, j) => {
    const variance = best.covariance?.[j][j];
    sigma[KEYS[j]] = variance !== undefined && variance >= 0 ? params[KEYS[j]] * Math.sqrt(variance) : Number.NaN;
  });
  const fitted = t.freq.map((f) => driverImpedance(params, f));
  const fittedOhm = fitted.map(abs);
  const residualPct = t.magnitude.map((m, i) => (100 * (m - fittedOhm[i])) / m);
  const m = t.phaseDeg ? 2 * t.freq.length : t.freq.length;
  return {
    params,
    sigma,
    coil: best.coil,
    residualRmsPct: 100 * Math.sqrt(best.ssr / m),
    usedPhase: t.phaseDeg !== null,
    curve: {
      freq: t.freq,
      measuredOhm: t.magnitude,
      measuredPhaseDeg: t.phaseDeg,
      fittedOhm,
      fittedPhaseDeg: fitted.map((z) => (arg(z) * 180) / Math.PI),
      residualPct,
    },
  };
}
