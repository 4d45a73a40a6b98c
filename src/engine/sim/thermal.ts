// Two-node voice-coil thermal network: coil -> magnet -> air.
//   Ctv·Tv' = P - (Tv - Tm)/Rtv;   Ctm·Tm' = (Tv - Tm)/Rtv - (Tm - Ta)/Rtm
// (Henricksen, JAES 1987; Button, JAES 1992). Discretised exactly for power held over a step
// (zero-order hold of the 2x2 linear system), so any step length is stable and exact.
import type { ThermalParams } from '../system.ts';

/** Exact step of the network over dt seconds: rise' = Phi·rise + Gamma·P (rises over ambient). */
export interface ThermalStep {
  p11: number;
  p12: number;
  p21: number;
  p22: number;
  g1: number;
  g2: number;
}

export function thermalStep(
  t: ThermalParams,
  dt: number,
  out: ThermalStep = { p11: 1, p12: 0, p21: 0, p22: 1, g1: 0, g2: 0 },
): ThermalStep {
  const a11 = -1 / (t.rtv * t.ctv);
  const a12 = 1 / (t.rtv * t.ctv);
  const a21 = 1 / (t.rtv * t.ctm);
  const a22 = -(1 / t.rtv + 1 / t.rtm) / t.ctm;
  // Eigenvalues of A (real, negative, distinct for a passive network).
  const tr = a11 + a22;
  const det = a11 * a22 - a12 * a21;
  const disc = Math.sqrt(Math.max(tr * tr - 4 * det, 0));
  const l1 = (tr + disc) / 2;
  const l2 = (tr - disc) / 2;
  const e1 = Math.exp(l1 * dt),
    e2 = Math.exp(l2 * dt);
  // e^{A dt} = (e1 (A - l2 I) - e2 (A - l1 I)) / (l1 - l2)  (Sylvester's formula).
  const d = l1 - l2 || 1e-300;
  const p11 = (e1 * (a11 - l2) - e2 * (a11 - l1)) / d;
  const p12 = ((e1 - e2) * a12) / d;
  const p21 = ((e1 - e2) * a21) / d;
  const p22 = (e1 * (a22 - l2) - e2 * (a22 - l1)) / d;
  // Gamma = A^{-1} (Phi - I) B, B = [1/Ctv, 0].
  const b1 = 1 / t.ctv;
  const m11 = p11 - 1,
    m21 = p21;
  const x1 = m11 * b1,
    x2 = m21 * b1;
  const g1 = (a22 * x1 - a12 * x2) / det;
  const g2 = (-a21 * x1 + a11 * x2) / det;
  out.p11 = p11;
  out.p12 = p12;
  out.p21 = p21;
  out.p22 = p22;
  out.g1 = g1;
  out.g2 = g2;
  return out;
}

/** Steady-state coil rise for constant power: P·(Rtv + Rtm). */
export function steadyRise(t: ThermalParams, powerW: number): number {
  return powerW * (t.rtv + t.rtm);
}

/** Voltage-drive level change from a hot coil, dB (negative): 20·log10(R_cold / R_hot). */
export function compressionDb(alphaR: number, riseK: number, rs = 0, re = 1): number {
  return 20 * Math.log10((re + rs) / (re * (1 + alphaR * riseK) + rs));
}
