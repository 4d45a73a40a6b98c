import * as v from 'valibot';
import { int, num, qlSchema, volumeSchema } from '../design/schema.ts';
import type { BoxKind } from './types.ts';
import { boxCompliance, DEFAULT_QL, leakageResistance } from './common.ts';
import { bulkModulus } from '../air.ts';
import { fmt, warning, type Issue } from '../issues.ts';
import { cx, inv } from '../complex.ts';
import { oneChamberAcoustics, RadiatorChamber } from './one-chamber.ts';

export interface PassiveRadiatorBox {
  type: 'passive-radiator';
  vb: number;
  vbNet: number;
  ral: number;
  ql: number | null;
  /** Total radiating area of all radiators, m^2. */
  sp: number;
  count: number;
  /** Mechanical values of all radiators together (count·m, count·k, count·r). */
  mmp: number;
  kmp: number;
  rmp: number;
  qmp: number | null;
  xmax: number;
  /** Free-air resonance of the radiator (the response notch), Hz. */
  fp: number;
  /** System tuning sqrt((Kmp + rho c^2 Sp^2 / Vb)/Mmp)/(2 pi), Hz. */
  fb: number;
}

const schema = v.strictObject({
  type: v.literal('passive-radiator'),
  vb_l: volumeSchema,
  ql: qlSchema,
  radiator: v.strictObject({
    sd_cm2: num(0.5, 20000, 'cm²'),
    mmp_g: num(0.1, 50000, 'g'),
    cmp_mm_per_n: num(0.0001, 1000, 'mm/N'),
    qmp: v.optional(v.nullable(num(0.5, 1000))),
    xmax_mm: num(0.1, 100, 'mm'),
    count: v.optional(int(1, 8)),
  }),
});

export const passiveRadiator: BoxKind<typeof schema, PassiveRadiatorBox> = {
  type: 'passive-radiator',
  label: 'Passive radiator',
  schema,
  build(doc, { air, driver }, path) {
    const issues: Issue[] = [];
    const r = doc.radiator;
    const count = r.count ?? 1;
    const vbNet = doc.vb_l / 1000;
    const vb = vbNet;
    const sp = count * r.sd_cm2 * 1e-4;
    const mmp = (count * r.mmp_g) / 1000;
    const kmp = count / (r.cmp_mm_per_n / 1000);
    const fp = Math.sqrt(kmp / mmp) / (2 * Math.PI);
    const qmp = r.qmp === undefined ? 20 : r.qmp;
    const rmp = qmp === null ? 0 : (2 * Math.PI * fp * mmp) / qmp;
    // Tuning with the box air spring added to the radiator's own (Small 1974; Hurlburt 2000).
    const fb = Math.sqrt((kmp + (bulkModulus(air) * sp * sp) / vb) / mmp) / (2 * Math.PI);
    const ql = doc.ql === undefined ? DEFAULT_QL : doc.ql;
    const xmax = r.xmax_mm / 1000;
    const radiatorDisplacement = sp * xmax;
    const coneDisplacement = driver.sd * driver.xmax;
    if (radiatorDisplacement < 1.5 * coneDisplacement) {
      issues.push(
        warning(
          `${path}.radiator`,
          `the radiators displace ${fmt(radiatorDisplacement * 1e6)} cm³ at their Xmax against the cone's ${fmt(coneDisplacement * 1e6)} cm³; ` +
            'near fb they move more than the cone, so about twice the cone displacement is usual (common practice)',
        ),
      );
    }
    const box: PassiveRadiatorBox = {
      type: 'passive-radiator',
      vb,
      vbNet,
      ral: leakageResistance(ql, 2 * Math.PI * fb, boxCompliance(vb, air)),
      ql,
      sp,
      count,
      mmp,
      kmp,
      rmp,
      qmp,
      xmax,
      fp,
      fb,
    };
    return { box, issues };
  },
  // The radiator's mass-spring-damper in acoustic units: Z = j w Mmp/Sp^2 + Rmp/Sp^2 + Kmp/(j w Sp^2).
  acoustics: (box, air, w) => {
    // Radiator admittance Sp^2/(j w Mmp + Rmp + Kmp/(j w)) (Small 1974). A part-per-billion
    // resistance keeps a lossless radiator finite exactly at its resonance.
    const s2 = box.sp * box.sp;
    const r = Math.max(box.rmp, 1e-9 * w * box.mmp);
    return oneChamberAcoustics(box.vb, box.ral, air, w, inv(cx(r / s2, (w * box.mmp - box.kmp / w) / s2)));
  },
  chamber: (box, ctx) => new RadiatorChamber(box.vb, box.ral, box.sp, box.mmp, box.kmp, box.rmp, box.xmax, ctx),
  probe: (box) => ({ kind: 'radiator', toUnit: 1000, limit: box.xmax * 1000 }),
  figures: (box) => [
    { id: 'fb', label: 'Tuning fb', value: box.fb, unit: 'Hz' },
    { id: 'fp', label: 'Radiator resonance (notch)', value: box.fp, unit: 'Hz' },
  ],
};
