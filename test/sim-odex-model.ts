// The published large-signal equations written out independently of the renderer, and odex
// (Hairer & Wanner's ODEX from npm) to integrate them: shared by the odex test and the benchmark.
import { BL_FLOOR, effectiveNonlinear, fitDefaultNonlinear, KMS_FLOOR, LE_FLOOR } from '../src/engine/sim/nonlinear.ts';
import type { Box, DriverWay, SpeakerSystem } from '../src/engine/system.ts';

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

/** Box constants from the SI box, computed here from the physics (not taken from the model's parameters). */
function boxConstants(sys: SpeakerSystem, _box: Box) {
  const k = sys.air.rho * sys.air.c * sys.air.c;
  const g = (ral: number) => (Number.isFinite(ral) && ral > 0 ? 1 / ral : 0);
  return { k, g };
}

/** Number of states of the published equations for this way's box. */
export function stateCount(way: DriverWay): number {
  return { sealed: 4, vented: 5, 'passive-radiator': 6, bandpass4: 6 }[way.box.type];
}

/**
 * dy/dt for y = [i, x, v, then pb, (Up | xp, vp); bandpass: pr, pf, Up], written out from the
 * published equations, and the radiated volume velocity's rate dU/dt from the state and dy/dt.
 */
export function rhs(sys: SpeakerSystem, way: DriverWay, u: (t: number) => number) {
  const d = way.driver;
  const box = way.box;
  const nl = effectiveNonlinear(d);
  const R = d.re + sys.amplifier.rs;
  const { k, g } = boxConstants(sys, box);
  const f = (t: number, y: number[]): number[] => {
    const [i, x, v] = y;
    // The model's floors keep Bl, Kms and Le positive where the polynomials would not (nonlinear.ts).
    const bl = Math.max(relPoly(nl.blRelPerMm, x)[0], BL_FLOOR) * d.bl;
    const kms = Math.max(relPoly(nl.kmsRelPerMm, x)[0], KMS_FLOOR) / d.cms;
    let [lr, lr1] = relPoly(nl.leRelPerMm, x);
    if (lr < LE_FLOOR) [lr, lr1] = [LE_FLOOR, 0];
    const le = d.le * lr,
      dLe = d.le * lr1;
    const di = (u(t) - R * i - dLe * v * i - bl * v) / le;
    const coneForce = (net: number) => (bl * i - d.rms * v - kms * x + d.sd * net + 0.5 * dLe * i * i) / d.mms;
    if (box.type === 'vented') {
      const [pb, q] = [y[3], y[4]];
      const cab = box.vb / k;
      const portLoss = (0.5 * sys.air.rho * box.portLossK) / (box.sv * box.sv);
      return [di, v, coneForce(pb), (-d.sd * v - q - pb * g(box.ral)) / cab, (pb - portLoss * q * Math.abs(q)) / box.map];
    }
    if (box.type === 'passive-radiator') {
      const [pb, xp, vp] = [y[3], y[4], y[5]];
      const cab = box.vb / k;
      const shape = fitDefaultNonlinear(box.xmax, 2 * box.xmax).kmsRelPerMm;
      const kp = Math.max(relPoly(shape, xp)[0], KMS_FLOOR) * box.kmp;
      return [
        di,
        v,
        coneForce(pb),
        (-d.sd * v - box.sp * vp - pb * g(box.ral)) / cab,
        vp,
        (box.sp * pb - box.rmp * vp - kp * xp) / box.mmp,
      ];
    }
    if (box.type === 'bandpass4') {
      const [pr, pf, q] = [y[3], y[4], y[5]];
      const portLoss = (0.5 * sys.air.rho * box.portLossK) / (box.sv * box.sv);
      return [
        di,
        v,
        coneForce(pr - pf),
        (-d.sd * v - pr * g(box.ralRear)) / (box.vbRear / k),
        (d.sd * v - q - pf * g(box.ralFront)) / (box.vbFront / k),
        (pf - portLoss * q * Math.abs(q)) / box.map,
      ];
    }
    const pb = y[3];
    return [di, v, coneForce(pb), (-d.sd * v - pb * g(box.ral)) / (box.vb / k)];
  };
  /** dU/dt: the cone's face (not in a bandpass box), the outlet and the leaks. */
  const dU = (dy: number[]): number => {
    if (box.type === 'bandpass4') return dy[5] + g(box.ralFront) * dy[4] + g(box.ralRear) * dy[3];
    let out = d.sd * dy[2] + g(box.ral) * dy[3];
    if (box.type === 'vented') out += dy[4];
    if (box.type === 'passive-radiator') out += box.sp * dy[5];
    return out;
  };
  return { f, dU };
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

/**
 * The radiated pressure (the model's output scale kOut times dU/dt) of `way` driven by u(t),
 * sampled at fs for n samples from rest, integrated by odex at tight tolerance.
 */
export function odexPressure(
  sys: SpeakerSystem,
  way: DriverWay,
  u: (t: number) => number,
  n: number,
  fs: number,
  kOut: number,
): Float64Array {
  const { f, dU } = rhs(sys, way, u);
  const solver = new Solver(stateCount(way));
  solver.absoluteTolerance = 1e-11;
  solver.relativeTolerance = 1e-9;
  solver.denseOutput = true;
  solver.maxSteps = 1e7;
  const pr = new Float64Array(n);
  let k = 0;
  solver.solve(
    f,
    0,
    new Array(stateCount(way)).fill(0),
    (n - 1) / fs,
    solver.grid(1 / fs, (t: number, y: number[]) => {
      if (k >= n) return;
      pr[k++] = kOut * dU(f(t, y));
    }),
  );
  return pr;
}
