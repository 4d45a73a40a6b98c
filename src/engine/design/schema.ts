// The structural schema of the design document: types, units and the physically possible ranges.
// Ranges here refuse; plausibility (warnings with numbers) lives in checks.ts.
import * as v from 'valibot';
import { DESIGN_FORMAT, DESIGN_VERSION } from './document.ts';

/** A finite number in [min, max]; the message names the range and the unit. */
function num(min: number, max: number, unit = '') {
  const u = unit ? ` ${unit}` : '';
  return v.pipe(
    v.number(`must be a number (${unit || 'no unit'})`),
    v.finite('must be a finite number'),
    v.minValue(min, `must be from ${min} to ${max}${u}`),
    v.maxValue(max, `must be from ${min} to ${max}${u}`),
  );
}
const int = (min: number, max: number) => v.pipe(num(min, max), v.integer(`must be a whole number from ${min} to ${max}`));
const coefficients = v.pipe(
  v.array(num(-10, 10, 'per mm^k'), 'must be an array of numbers [c1, c2, ...]'),
  v.maxLength(8, 'must have at most 8 coefficients'),
);

export const driverSchema = v.strictObject({
  name: v.optional(v.pipe(v.string(), v.maxLength(200))),
  fs_hz: v.optional(num(1, 2000, 'Hz')),
  qes: v.optional(num(0.02, 50)),
  qms: v.optional(num(0.2, 100000)),
  vas_l: v.optional(num(0.001, 20000, 'l')),
  re_ohm: num(0.1, 200, 'ohm'),
  le_mh: v.optional(num(0, 50, 'mH')),
  sd_cm2: num(0.5, 20000, 'cm²'),
  bl_tm: v.optional(num(0.05, 200, 'T·m')),
  mms_g: v.optional(num(0.01, 10000, 'g')),
  cms_mm_per_n: v.optional(num(0.0001, 100, 'mm/N')),
  rms_kg_s: v.optional(num(0.001, 200, 'kg/s')),
  xmax_mm: num(0.05, 100, 'mm'),
  xlim_mm: v.optional(num(0.1, 200, 'mm')),
  pe_w: num(0.1, 20000, 'W'),
  bl_rel_per_mm: v.optional(coefficients),
  kms_rel_per_mm: v.optional(coefficients),
  le_rel_per_mm: v.optional(coefficients),
  rtv_k_per_w: v.optional(num(0.01, 100, 'K/W')),
  ctv_j_per_k: v.optional(num(0.01, 10000, 'J/K')),
  rtm_k_per_w: v.optional(num(0.01, 100, 'K/W')),
  ctm_j_per_k: v.optional(num(1, 1e6, 'J/K')),
  coil_material: v.optional(v.picklist(['copper', 'aluminium'], 'must be "copper" or "aluminium"')),
  coil_max_c: v.optional(num(50, 400, '°C')),
});

const portSchema = v.strictObject({
  diameter_cm: v.optional(num(0.5, 100, 'cm')),
  width_cm: v.optional(num(0.2, 200, 'cm')),
  height_cm: v.optional(num(0.2, 200, 'cm')),
  count: v.optional(int(1, 16)),
  outer_end: v.optional(v.picklist(['flanged', 'free'], 'must be "flanged" or "free"')),
  inner_end: v.optional(v.picklist(['flanged', 'free'], 'must be "flanged" or "free"')),
});

const qlSchema = v.optional(v.nullable(num(0.5, 1000)));

export const boxSchema = v.variant(
  'type',
  [
    v.strictObject({
      type: v.literal('sealed'),
      vb_l: num(0.05, 20000, 'l'),
      ql: qlSchema,
      fill: v.optional(num(0, 1)),
    }),
    v.strictObject({
      type: v.literal('vented'),
      vb_l: num(0.05, 20000, 'l'),
      fb_hz: num(5, 500, 'Hz'),
      ql: qlSchema,
      ports: v.pipe(v.array(portSchema, 'must be a list of ports'), v.minLength(1, 'needs at least one port'), v.maxLength(8)),
    }),
    v.strictObject({
      type: v.literal('passive-radiator'),
      vb_l: num(0.05, 20000, 'l'),
      ql: qlSchema,
      radiator: v.strictObject({
        sd_cm2: num(0.5, 20000, 'cm²'),
        mmp_g: num(0.1, 50000, 'g'),
        cmp_mm_per_n: num(0.0001, 1000, 'mm/N'),
        qmp: v.optional(v.nullable(num(0.5, 1000))),
        xmax_mm: num(0.1, 100, 'mm'),
        count: v.optional(int(1, 8)),
      }),
    }),
  ],
  'type must be "sealed", "vented" or "passive-radiator"',
);

export const designSchema = v.strictObject({
  format: v.literal(DESIGN_FORMAT, `must be "${DESIGN_FORMAT}"`),
  version: v.literal(DESIGN_VERSION, `must be ${DESIGN_VERSION}`),
  name: v.pipe(v.string('must be a text'), v.maxLength(200, 'must be at most 200 characters')),
  notes: v.optional(v.pipe(v.string(), v.maxLength(20000))),
  driver: driverSchema,
  box: boxSchema,
  amplifier: v.strictObject({
    power_w: num(0.1, 100000, 'W'),
    load_ohm: num(1, 64, 'ohm'),
    rs_ohm: v.optional(num(0, 20, 'ohm')),
    clip: v.optional(v.picklist(['hard', 'soft'], 'must be "hard" or "soft"')),
  }),
  crossover: v.strictObject({
    type: v.picklist(['lr2', 'lr4', 'lr8', 'none'], 'must be "lr2", "lr4", "lr8" or "none"'),
    fx_hz: v.optional(num(20, 5000, 'Hz')),
    highpass_hz: v.optional(num(0, 200, 'Hz')),
  }),
  listening: v.strictObject({
    distance_m: num(0.1, 200, 'm'),
    space: v.picklist(['full', 'half', 'quarter', 'eighth'], 'must be "full", "half", "quarter" or "eighth"'),
    channels: v.optional(v.picklist(['pair', 'mono-sum'], 'must be "pair" or "mono-sum"')),
    level: v.optional(
      v.variant(
        'mode',
        [
          v.strictObject({ mode: v.literal('spl'), spl_db: num(30, 150, 'dB SPL') }),
          v.strictObject({ mode: v.literal('volts'), volts_fs: num(0.01, 2000, 'V') }),
        ],
        'mode must be "spl" or "volts"',
      ),
    ),
    room_gain_hz: v.optional(num(0, 200, 'Hz')),
    baffle_width_cm: v.optional(num(0, 300, 'cm')),
  }),
  air: v.optional(
    v.strictObject({
      temperature_c: v.optional(num(-40, 60, '°C')),
      pressure_kpa: v.optional(num(50, 110, 'kPa')),
    }),
  ),
});
