// The published large-signal equations written out independently of the renderer, and odex
// (Hairer & Wanner's ODEX from npm) to integrate them: shared by the odex test and the benchmark.
import type { WooferParams } from '../src/engine/sim/params.ts';
import { BL_FLOOR, effectiveNonlinear, KMS_FLOOR, LE_FLOOR } from '../src/engine/sim/nonlinear.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';

/** Relative polynomial in x (m) from coefficients per mm, with its derivative. */
function relPoly(rel: number[], xM: number): [number, number, number] {
  const x = xM * 1000;
  let p = 1,
    d = 0,
    d2 = 0;
  rel.forEach((c, k) => {
    const j = k + 1;
    p += c * x ** j;
    d += j * c * x ** (j - 1) * 1000;
    if (j >= 2) d2 += j * (j - 1) * c * x ** (j - 2) * 1e6;
  });
  return [p, d, d2];
}

/** dy/dt for y = [i, x, v, pb, Up | xp, vp], written out from the published equations. */
export function rhs(sys: SpeakerSystem, p: WooferParams, u: (t: number) => number) {
  const d = sys.driver;
  const nl = effectiveNonlinear(d);
  const R = d.re + sys.amplifier.rs;
  return (t: number, y: number[]): number[] => {
    const [i, x, v, pb] = y;
    // The model's floors keep Bl, Kms and Le positive where the polynomials would not (nonlinear.ts).
    const bl = Math.max(relPoly(nl.blRelPerMm, x)[0], BL_FLOOR) * d.bl;
    const kms = Math.max(relPoly(nl.kmsRelPerMm, x)[0], KMS_FLOOR) / d.cms;
    let [lr, lr1] = relPoly(nl.leRelPerMm, x);
    if (lr < LE_FLOOR) [lr, lr1] = [LE_FLOOR, 0];
    const le = d.le * lr,
      dLe = d.le * lr1;
    const di = (u(t) - R * i - dLe * v * i - bl * v) / le;
    const dv = (bl * i - d.rms * v - kms * x + d.sd * pb + 0.5 * dLe * i * i) / d.mms;
    if (sys.box.type === 'vented') {
      const q = y[4];
      const dpb = (-d.sd * v - q - pb * p.g) / p.cab;
      const dq = (pb - p.portLoss * q * Math.abs(q)) / p.map;
      return [di, v, dv, dpb, dq];
    }
    if (sys.box.type === 'passive-radiator') {
      const [xp, vp] = [y[4], y[5]];
      const kp =
        Math.max(
          relPoly(
            Array.from(p.kmpC.slice(1), (c, k) => c / 1000 ** (k + 1)),
            xp,
          )[0],
          KMS_FLOOR,
        ) * p.kmp0;
      const dpb = (-d.sd * v - p.sp * vp - pb * p.g) / p.cab;
      const dvp = (p.sp * pb - p.rmp * vp - kp * xp) / p.mmp;
      return [di, v, dv, dpb, vp, dvp];
    }
    return [di, v, dv, (-d.sd * v - pb * p.g) / p.cab];
  };
}

// odex ships its TypeScript source, which does not pass this project's strict checks: load it
// untyped and describe the few members used here.
export interface OdexSolver {
  absoluteTolerance: number;
  relativeTolerance: number;
  denseOutput: boolean;
  maxSteps: number;
  solve(f: (t: number, y: number[]) => number[], x0: number, y0: number[], x1: number, out: unknown): unknown;
  grid(dt: number, out: (t: number, y: number[]) => void): unknown;
}
const odexName = 'odex';
export const { Solver } = (await import(odexName)) as { Solver: new (n: number) => OdexSolver };
