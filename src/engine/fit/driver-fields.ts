// A fit as design-document driver fields, and how they replace a driver's own: the one place both
// the CLI and the Driver sheet take them from.
import type { DriverDoc } from '../design/document.ts';
import type { ImpedanceFit } from './impedance-fit.ts';
import type { MechanicalResult } from './mechanical.ts';

/** The fields a fit sets, in the design document's units, to four significant digits. */
export type FittedFields = Partial<Pick<DriverDoc, 'l2_mh' | 'r2_ohm' | 'vas_l' | 'sd_cm2'>> & {
  re_ohm: number;
  fs_hz: number;
  qes: number;
  qms: number;
  le_mh: number;
};

const round = (x: number) => Number(x.toPrecision(4));

export function fittedFields(fit: ImpedanceFit, mech: MechanicalResult | null, sdM2: number | null): FittedFields {
  const p = fit.params;
  const out: FittedFields = { re_ohm: round(p.re), fs_hz: round(p.fs), qes: round(p.qes), qms: round(p.qms), le_mh: round(p.le * 1000) };
  if (fit.coil === 'semi') {
    out.l2_mh = round(p.l2 * 1000);
    out.r2_ohm = round(p.r2);
  }
  if (mech?.vas != null) out.vas_l = round(mech.vas * 1000);
  if (sdM2 !== null) out.sd_cm2 = round(sdM2 * 1e4);
  return out;
}

/** The mechanical fields, any one of which with fs, Qes and Qms fixes the rest. */
const MECHANICAL: (keyof DriverDoc)[] = ['vas_l', 'mms_g', 'cms_mm_per_n', 'bl_tm', 'rms_kg_s'];

/**
 * A driver with the fitted fields in place. fs, Qes and Qms with one more mechanical figure fix the
 * small-signal set (driver.ts), so every other mechanical field goes, or the driver would
 * contradict itself: the fitted Vas when there is one, else the driver's own first of Vas, Mms, Cms,
 * Bl, Rms stays. A semi-inductance the fit did not find goes too.
 */
export function withFittedFields(driver: DriverDoc, fields: FittedFields): DriverDoc {
  const next: DriverDoc = { ...driver };
  const keep = fields.vas_l !== undefined ? 'vas_l' : MECHANICAL.find((k) => driver[k] !== undefined);
  for (const k of MECHANICAL) if (k !== keep) delete next[k];
  if (fields.l2_mh === undefined) {
    delete next.l2_mh;
    delete next.r2_ohm;
  }
  return { ...next, ...fields };
}
