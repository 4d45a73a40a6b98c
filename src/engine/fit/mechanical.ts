// Vas and the mechanical set from a second impedance sweep, with the published closed forms:
//   added mass M (Thiele 1971; Small 1972):  Mms = M / ((fs/fm)^2 - 1),  Cms = 1/((2π·fs)^2·Mms),
//                                            Vas = rho·c^2·Sd^2·Cms       (fm: resonance with the mass)
//   closed box Vb (Small 1972):              Vas = Vb·(fc·Qec/(fs·Qes) - 1)
//                                            (fc, Qec: resonance and electrical Q in the box)
// then Bl = sqrt(2π·fs·Mms·Re/Qes), Rms = 2π·fs·Mms/Qms through the one derivation in driver.ts.
// Uncertainties go through by first-order propagation of the fits' standard errors (independent
// sweeps); the mass, volume and Sd are taken as exact.
import { InputProblem } from '../issues.ts';
import { bulkModulus } from '../air.ts';
import { deriveSmallSignal, type SmallSignalSet } from '../driver.ts';
import type { Air } from '../system.ts';
import type { ImpedanceFit } from './impedance-fit.ts';

/** Moving mass from the resonance without (fs) and with (fm) an added mass (kg). */
export const addedMassMms = (fs: number, fm: number, addedKg: number): number => addedKg / ((fs / fm) ** 2 - 1);

/** Vas (m^3) from the free-air fit and the fit in a closed box of Vb (m^3). */
export const closedBoxVas = (vb: number, fs: number, qes: number, fc: number, qec: number): number => vb * ((fc * qec) / (fs * qes) - 1);

/** Vas (m^3) of a suspension of compliance Cms behind a cone of area Sd. */
export const vasFromCms = (cms: number, sd: number, air: Air): number => bulkModulus(air) * sd * sd * cms;

export type SecondSweep =
  | { kind: 'added-mass'; massKg: number; fit: ImpedanceFit }
  | { kind: 'closed-box'; vbM3: number; fit: ImpedanceFit };

export interface MechanicalResult {
  /** m^3; null when it cannot be known (added mass without Sd). */
  vas: number | null;
  vasSigma: number | null;
  /** The full set when Sd is known; null otherwise. */
  set: SmallSignalSet | null;
  /** Moving mass, kg: known from an added mass even without Sd. */
  mms: number | null;
  mmsSigma: number | null;
  /** The method, in words, for reports. */
  method: string;
}

/** First-order propagation of independent standard errors through f. */
function propagate(f: (x: number[]) => number, x: number[], sigma: number[]): number {
  const y0 = f(x);
  let variance = 0;
  x.forEach((xi, i) => {
    const h = 1e-6 * Math.abs(xi || 1);
    const xp = x.slice();
    xp[i] = xi + h;
    const d = (f(xp) - y0) / h;
    variance += (d * sigma[i]) ** 2;
  });
  return Math.sqrt(variance);
}

/**
 * Vas and the mechanical set. `typedVas` (m^3) is used when no second sweep is given; `sd` (m^2) is
 * needed for the mechanical set and, with an added mass, for Vas. Throws InputProblem for a second
 * sweep that contradicts the first (a resonance that did not move the right way).
 */
export function mechanicalSet(
  free: ImpedanceFit,
  second: SecondSweep | null,
  sd: number | null,
  typedVas: number | null,
  air: Air,
): MechanicalResult {
  const { fs, qes, qms, re } = free.params;
  const s = free.sigma;
  let vas: number | null = null;
  let vasSigma: number | null = null;
  let mms: number | null = null;
  let mmsSigma: number | null = null;
  let method = 'Vas as given';
  if (second?.kind === 'added-mass') {
    const fm = second.fit.params.fs;
    if (!(fm < fs * 0.995))
      throw new InputProblem(
        `the resonance with the added mass (${fm.toFixed(2)} Hz) must be clearly below the resonance without it (${fs.toFixed(2)} Hz)`,
      );
    const f = (x: number[]) => addedMassMms(x[0], x[1], second.massKg);
    mms = f([fs, fm]);
    mmsSigma = propagate(f, [fs, fm], [s.fs, second.fit.sigma.fs]);
    method = `added mass of ${(second.massKg * 1000).toPrecision(4)} g`;
    if (sd !== null) {
      const g = (x: number[]) => vasFromCms(1 / ((2 * Math.PI * x[0]) ** 2 * f(x)), sd, air);
      vas = g([fs, fm]);
      vasSigma = propagate(g, [fs, fm], [s.fs, second.fit.sigma.fs]);
    }
  } else if (second?.kind === 'closed-box') {
    const { fs: fc, qes: qec } = second.fit.params;
    if (!(fc > fs * 1.005))
      throw new InputProblem(
        `the resonance in the box (${fc.toFixed(2)} Hz) must be clearly above the resonance in free air (${fs.toFixed(2)} Hz)`,
      );
    const f = (x: number[]) => closedBoxVas(second.vbM3, x[0], x[1], x[2], x[3]);
    vas = f([fs, qes, fc, qec]);
    vasSigma = propagate(f, [fs, qes, fc, qec], [s.fs, s.qes, second.fit.sigma.fs, second.fit.sigma.qes]);
    method = `closed box of ${(second.vbM3 * 1000).toPrecision(4)} l`;
  } else if (typedVas !== null) {
    vas = typedVas;
  }
  let set: SmallSignalSet | null = null;
  if (sd !== null && (vas !== null || mms !== null)) {
    const given = vas !== null ? { fs, qes, qms, vas } : { fs, qes, qms, mms: mms as number };
    set = deriveSmallSignal(given, re, sd, air).values;
    if (set && mms === null) mms = set.mms;
  }
  return { vas, vasSigma, set, mms, mmsSigma, method };
}
