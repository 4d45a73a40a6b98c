// The Driver sheet's fit from measured impedance: reads the user's tables through the engine's
// reader, fits, and turns the result into driver fields and a design with them (one undo step).
import { InputProblem } from '../engine/issues.ts';
import { airAt } from '../engine/air.ts';
import type { DesignDoc } from '../engine/design/document.ts';
import { fittedFields, withFittedFields, type FittedFields } from '../engine/fit/driver-fields.ts';
import { fitImpedance, type ImpedanceFit } from '../engine/fit/impedance-fit.ts';
import { parseImpedanceTable } from '../engine/fit/impedance-table.ts';
import { mechanicalSet, type MechanicalResult, type SecondSweep } from '../engine/fit/mechanical.ts';

/** Largest table file read in the app. */
export const MAX_TABLE_FILE_BYTES = 8 << 20;

export type VasMethod = 'typed' | 'added-mass' | 'closed-box';

export interface FitRequest {
  freeText: string;
  freeName: string;
  method: VasMethod;
  /** Grams for an added mass, litres for a closed box, litres of a typed Vas (null: keep the driver's own). */
  amount: number | null;
  secondText: string | null;
  secondName: string | null;
  sdCm2: number | null;
}

export type FitOutcome =
  | { ok: true; fit: ImpedanceFit; mech: MechanicalResult | null; second: ImpedanceFit | null; fields: FittedFields }
  | { ok: false; message: string };

function fitTable(text: string, name: string): ImpedanceFit | string {
  const parsed = parseImpedanceTable(text);
  if (!parsed.ok) return `${name}, line ${parsed.line}: ${parsed.message}`;
  try {
    return fitImpedance(parsed.table);
  } catch (e) {
    if (e instanceof InputProblem) return `${name}: ${e.message}`;
    throw e;
  }
}

/** Progress of a fit: `done` of `of` sweeps fitted, and what runs now. */
export type FitStep = (done: number, of: number, what: string) => void;

export function runFit(r: FitRequest, onStep?: FitStep): FitOutcome {
  const sweeps = r.method === 'typed' ? 1 : 2;
  onStep?.(0, sweeps, 'fitting the free-air sweep');
  const fit = fitTable(r.freeText, r.freeName);
  if (typeof fit === 'string') return { ok: false, message: fit };
  let second: SecondSweep | null = null;
  if (r.method !== 'typed') {
    if (r.secondText === null) return { ok: false, message: 'choose the second sweep' };
    if (!(r.amount !== null && r.amount > 0))
      return { ok: false, message: r.method === 'added-mass' ? 'give the added mass in grams' : 'give the box volume in litres' };
    onStep?.(1, sweeps, 'fitting the second sweep');
    const f2 = fitTable(r.secondText, r.secondName ?? 'second sweep');
    if (typeof f2 === 'string') return { ok: false, message: f2 };
    second =
      r.method === 'added-mass'
        ? { kind: 'added-mass', massKg: r.amount / 1000, fit: f2 }
        : { kind: 'closed-box', vbM3: r.amount / 1000, fit: f2 };
  }
  const sdM2 = r.sdCm2 !== null && r.sdCm2 > 0 ? r.sdCm2 * 1e-4 : null;
  const typedVas = r.method === 'typed' && r.amount !== null && r.amount > 0 ? r.amount / 1000 : null;
  let mech: MechanicalResult | null = null;
  if (second || typedVas !== null) {
    try {
      mech = mechanicalSet(fit, second, sdM2, typedVas, airAt());
    } catch (e) {
      if (e instanceof InputProblem) return { ok: false, message: e.message };
      throw e;
    }
  }
  return { ok: true, fit, mech, second: second?.fit ?? null, fields: fittedFields(fit, mech, sdM2) };
}

/** The design with the fitted fields in the driver of way `index` (a driver way). */
export function designWithFit(design: DesignDoc, index: number, fields: FittedFields): DesignDoc {
  const ways = design.ways.map((w, i) => (i === index && w.kind === 'driver' ? { ...w, driver: withFittedFields(w.driver, fields) } : w));
  return { ...design, ways };
}
