import * as v from 'valibot';
import { num, qlSchema, volumeSchema } from '../design/schema.ts';
import type { BoxKind } from './types.ts';
import { boxCompliance, leakageResistance } from './common.ts';
import { ClosedChamber, oneChamberAcoustics } from './one-chamber.ts';
import { qesWithSeries, totalQ } from '../driver.ts';

export interface SealedBox {
  type: 'sealed';
  /** Effective acoustic volume (fill included), m^3. */
  vb: number;
  /** Net internal volume as entered, m^3. */
  vbNet: number;
  /** Parallel leakage resistance, Pa·s/m^3; Infinity = lossless. Leaked air radiates: net radiated volume velocity = Sd·v + Up + pb/Ral. */
  ral: number;
  ql: number | null;
}

const schema = v.strictObject({
  type: v.literal('sealed'),
  vb_l: volumeSchema,
  ql: qlSchema,
  fill: v.optional(num(0, 1)),
});

/**
 * Fill raises the effective volume: the adiabatic-to-isothermal bound is 1.4x (Small 1972);
 * practical heavy fill gives about +20% (common practice, no source). fill is 0..1.
 */
export const FILL_VOLUME_GAIN = 0.2;

/** Small (1972): fc = fs·sqrt(1 + alpha), Qtc = Qts·sqrt(1 + alpha), with Qts including Rs. */
export function sealedAlignment(fs: number, qts: number, vas: number, vb: number) {
  const alpha = vas / vb;
  return { alpha, fc: fs * Math.sqrt(1 + alpha), qtc: qts * Math.sqrt(1 + alpha) };
}

export const sealed: BoxKind<typeof schema, SealedBox> = {
  type: 'sealed',
  label: 'Sealed',
  schema,
  build(doc, { air, driver, rs }) {
    const vbNet = doc.vb_l / 1000;
    const vb = vbNet * (1 + FILL_VOLUME_GAIN * (doc.fill ?? 0));
    const ql = doc.ql ?? null;
    const qts = totalQ(qesWithSeries(driver.qes, driver.re, rs), driver.qms);
    const { fc } = sealedAlignment(driver.fs, qts, driver.vas, vb);
    const ral = leakageResistance(ql, 2 * Math.PI * fc, boxCompliance(vb, air));
    return { box: { type: 'sealed', vb, vbNet, ral, ql }, issues: [] };
  },
  acoustics: (box, air, w) => oneChamberAcoustics(box.vb, box.ral, air, w, null),
  chamber: (box, ctx) => new ClosedChamber(box.vb, box.ral, ctx),
  probe: () => null,
  // fc and Qtc depend on the driver too: the analysis reports them.
  figures: () => [],
};
