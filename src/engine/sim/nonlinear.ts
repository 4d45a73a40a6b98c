// Large-signal parameters Bl(x), Kms(x), Le(x) as relative polynomials in the cone position.
// Model: the lumped-parameter large-signal model ("Tutorial: Loudspeaker Nonlinearities — Causes,
// Parameters, Symptoms", JAES 54 (2006)). Coefficients are relative, in x in millimetres:
// Bl(x) = Bl(0)·(1 + c1·x + c2·x^2 + ...).
import type { Driver } from '../system.ts';

/** Bl(Xmax)/Bl(0) of the default fit: the Bl-based Xmax definition (JAES 51(5), 2003; IEC 62458). */
export const BL_AT_XMAX = 0.82;
/** Kms(Xmax)/Kms(0) of the default fit (typical woofer, k2 ≈ 0.013/mm^2 at Xmax ≈ 4-5 mm; from memory). */
export const KMS_AT_XMAX = 1.25;
/** Kms(Xlim)/Kms(0) of the default fit: the suspension is near its end stop (our choice, an estimate). */
export const KMS_AT_XLIM = 10;
/** Default relative slope of Le at +Xmax: the coil leaves the iron, Le falls (typical; an estimate). */
export const LE_AT_XMAX = 0.75;
/** Floors that keep the model physical wherever a polynomial would turn negative. */
export const BL_FLOOR = 0.15;
export const KMS_FLOOR = 0.25;
export const LE_FLOOR = 0.2;
/** The most coefficients a polynomial may have after its constant 1 (the model unrolls its Horner loops to this). */
export const MAX_COEFFICIENTS = 8;

export interface FittedNonlinear {
  blRelPerMm: number[];
  kmsRelPerMm: number[];
  leRelPerMm: number[];
}

/**
 * Default polynomials from Xmax and Xlim (both m).
 * Bl: 1 - 0.18·(x/Xmax)^2, symmetric; floored at BL_FLOOR beyond where it would fall further.
 * Kms: 1 + a·(x/Xmax)^2 + b·(x/Xlim)^8 with Kms(Xmax) = 1.25 and Kms(Xlim) = 10: gentle to Xmax,
 * then steep towards the end stop; both coefficients are kept >= 0 so the stiffness only rises.
 * Le: 1 - 0.25·x/Xmax (inductance falls as the coil moves out of the gap).
 */
export function fitDefaultNonlinear(xmax: number, xlim: number): FittedNonlinear {
  const X = xmax * 1000;
  const L = Math.max(xlim, xmax * 1.05) * 1000;
  const bl2 = (BL_AT_XMAX - 1) / (X * X);
  const r8 = Math.pow(X / L, 8);
  const rho2 = (L / X) * (L / X);
  // Solve a + b·r8 = KMS_AT_XMAX - 1 and a·rho2 + b = KMS_AT_XLIM - 1.
  let a = (KMS_AT_XMAX - 1 - r8 * (KMS_AT_XLIM - 1)) / (1 - r8 * rho2);
  let b = KMS_AT_XLIM - 1 - a * rho2;
  if (a < 0) {
    a = 0;
    b = KMS_AT_XLIM - 1;
  }
  if (b < 0) {
    b = 0;
    a = (KMS_AT_XLIM - 1) / rho2;
  }
  const kms = [0, a / (X * X), 0, 0, 0, 0, 0, b / Math.pow(L, 8)];
  return {
    blRelPerMm: [0, bl2],
    kmsRelPerMm: kms,
    leRelPerMm: [(LE_AT_XMAX - 1) / X],
  };
}

/**
 * Even-order asymmetry on the default fit (both 0: the symmetric shapes unchanged, bit for bit).
 * Bl: the parabola centred on x0 instead of 0, Bl(x)/Bl(0) = (1 + bl2·(x − x0)^2)/(1 + bl2·x0^2), so
 * Bl(0) stays the datasheet's. Kms: a linear term s·(KMS_AT_XMAX − 1)·x/Xmax, so Kms(±Xmax) =
 * 1 + (KMS_AT_XMAX − 1)·(1 ± s) (the polynomial floors keep it positive).
 */
export function withAsymmetry(fit: FittedNonlinear, xmax: number, blOffset: number, kmsAsymmetry: number): FittedNonlinear {
  const X = xmax * 1000;
  let bl = fit.blRelPerMm;
  if (blOffset !== 0) {
    const x0 = blOffset * 1000;
    const b2 = bl[1];
    const n = 1 + b2 * x0 * x0;
    bl = [(-2 * b2 * x0) / n, b2 / n];
  }
  let kms = fit.kmsRelPerMm;
  if (kmsAsymmetry !== 0) kms = [kms[0] + (kmsAsymmetry * (KMS_AT_XMAX - 1)) / X, ...kms.slice(1)];
  return { ...fit, blRelPerMm: bl, kmsRelPerMm: kms };
}

/** The polynomials the simulator uses: typed ones, or the default fit where the design left them empty. */
export function effectiveNonlinear(d: Driver): FittedNonlinear {
  const fit = withAsymmetry(fitDefaultNonlinear(d.xmax, d.xlim), d.xmax, d.blOffset ?? 0, d.kmsAsymmetry ?? 0);
  const pick = (given: number[], dflt: number[]) => (given.length > 0 ? given : d.nonlinearFitted ? dflt : []);
  return {
    blRelPerMm: pick(d.blRelPerMm, fit.blRelPerMm),
    kmsRelPerMm: pick(d.kmsRelPerMm, fit.kmsRelPerMm),
    leRelPerMm: d.le > 0 ? pick(d.leRelPerMm, fit.leRelPerMm) : [],
  };
}

/**
 * Relative coefficients per mm -> per metre, as a Horner-ready array [1, c1', c2', ...] with
 * ck' = ck·1000^k. Trailing zeros trimmed.
 */
export function toPerMetre(rel: number[]): Float64Array {
  const c = [1, ...rel.map((v, k) => v * Math.pow(1000, k + 1))];
  while (c.length > 1 && c[c.length - 1] === 0) c.pop();
  if (c.length > MAX_COEFFICIENTS + 1) throw new Error(`a large-signal polynomial has more than ${MAX_COEFFICIENTS} coefficients`);
  return Float64Array.from(c);
}
