// The structural schema of the design document: types, units and the physically possible ranges.
// Ranges here refuse; plausibility (warnings with numbers) lives in checks.ts. The document's
// TypeScript types are inferred from these schemas (document.ts), so there is one definition.
import * as v from 'valibot';
import { MAX_RESPONSE_POINTS } from '../fir/response-table.ts';
import { MAX_COEFFICIENTS } from '../sim/nonlinear.ts';

export const DESIGN_FORMAT = 'preheard-design';
export const DESIGN_VERSION = 2;
/** A design has one to this many ways. */
export const MAX_WAYS = 4;
/** Identical drivers in one way, at most. */
export const MAX_DRIVERS_PER_WAY = 8;

/** A finite number in [min, max]; the message names the range and the unit. */
export function num(min: number, max: number, unit = '') {
  const u = unit ? ` ${unit}` : '';
  return v.pipe(
    v.number(`must be a number (${unit || 'no unit'})`),
    v.finite('must be a finite number'),
    v.minValue(min, `must be from ${min} to ${max}${u}`),
    v.maxValue(max, `must be from ${min} to ${max}${u}`),
  );
}
export const int = (min: number, max: number) => v.pipe(num(min, max), v.integer(`must be a whole number from ${min} to ${max}`));
const coefficients = v.pipe(
  v.array(num(-10, 10, 'per mm^k'), 'must be an array of numbers [c1, c2, ...]'),
  v.maxLength(MAX_COEFFICIENTS, `must have at most ${MAX_COEFFICIENTS} coefficients`),
);
const text = (max: number) => v.pipe(v.string('must be a text'), v.maxLength(max, `must be at most ${max} characters`));

export const driverSchema = v.strictObject({
  name: v.optional(text(200)),
  fs_hz: v.optional(num(1, 5000, 'Hz')),
  qes: v.optional(num(0.02, 50)),
  qms: v.optional(num(0.2, 100000)),
  vas_l: v.optional(num(0.0001, 20000, 'l')),
  re_ohm: num(0.1, 200, 'ohm'),
  le_mh: v.optional(num(0, 50, 'mH')),
  l2_mh: v.optional(num(0.001, 50, 'mH')),
  r2_ohm: v.optional(num(0.01, 1000, 'ohm')),
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
  bl_offset_mm: v.optional(num(-50, 50, 'mm')),
  kms_asymmetry: v.optional(num(-0.9, 0.9)),
  rtv_k_per_w: v.optional(num(0.01, 100, 'K/W')),
  ctv_j_per_k: v.optional(num(0.01, 10000, 'J/K')),
  rtm_k_per_w: v.optional(num(0.01, 100, 'K/W')),
  ctm_j_per_k: v.optional(num(1, 1e6, 'J/K')),
  coil_material: v.optional(v.picklist(['copper', 'aluminium'], 'must be "copper" or "aluminium"')),
  coil_max_c: v.optional(num(50, 400, '°C')),
});

export const portSchema = v.strictObject({
  diameter_cm: v.optional(num(0.5, 100, 'cm')),
  width_cm: v.optional(num(0.2, 200, 'cm')),
  height_cm: v.optional(num(0.2, 200, 'cm')),
  count: v.optional(int(1, 16)),
  outer_end: v.optional(v.picklist(['flanged', 'free'], 'must be "flanged" or "free"')),
  inner_end: v.optional(v.picklist(['flanged', 'free'], 'must be "flanged" or "free"')),
  /** How the port's ends are shaped: it sets the loss that compresses the port at high air speed. */
  end_shape: v.optional(v.picklist(['sharp', 'rounded', 'flared'], 'must be "sharp", "rounded" or "flared"')),
});
export const portsSchema = v.pipe(
  v.array(portSchema, 'must be a list of ports'),
  v.minLength(1, 'needs at least one port'),
  v.maxLength(8, 'must have at most 8 port entries'),
);

export const qlSchema = v.optional(v.nullable(num(0.5, 1000)));
export const volumeSchema = num(0.005, 20000, 'l');

export const FILTER_SHAPES = ['lr2', 'lr4', 'lr8', 'bw2', 'bw3', 'bw4'] as const;
const filterBandSchema = v.strictObject({
  shape: v.picklist(FILTER_SHAPES, `must be one of ${FILTER_SHAPES.map((s) => `"${s}"`).join(', ')}`),
  hz: num(5, 40000, 'Hz'),
});

export const activeFilterSchema = v.strictObject({
  type: v.literal('active', 'must be "active"'),
  highpass: v.optional(filterBandSchema),
  lowpass: v.optional(filterBandSchema),
  gain_db: v.optional(num(-60, 20, 'dB')),
  delay_ms: v.optional(num(0, 50, 'ms')),
});

/** Parts in one passive ladder, at most. */
export const MAX_LADDER_PARTS = 16;
export const LADDER_PARTS = ['l', 'c', 'r', 'rc', 'rlc', 'lc-parallel'] as const;
const ladderPlace = v.picklist(['series', 'shunt'], 'must be "series" or "shunt"');
const partCommon = {
  at: ladderPlace,
  /** Tolerance of the part's value, percent (kept for later; not yet used). */
  tol_pct: v.optional(num(0, 50, '%')),
};
const mh = num(0.001, 1000, 'mH');
const uf = num(0.01, 100000, 'µF');
const ohm = num(0.001, 10000, 'ohm');
/** A resistor's rated power, W: a part stress event when it is passed. */
const ratedW = v.optional(num(0.1, 10000, 'W'));
const dcr = v.optional(num(0, 100, 'ohm'));
/**
 * One part of a passive ladder, from the amplifier towards the driver: across the line (`shunt`)
 * or in it (`series`). `rc` and `rlc` are their parts in series (a compensation network, a notch);
 * `lc-parallel` is a tank (a trap), its optional `ohm` across it setting the trap's depth.
 */
export const ladderPartSchema = v.variant(
  'part',
  [
    v.strictObject({ ...partCommon, part: v.literal('l'), mh, dcr_ohm: dcr }),
    v.strictObject({ ...partCommon, part: v.literal('c'), uf }),
    v.strictObject({ ...partCommon, part: v.literal('r'), ohm, w: ratedW }),
    v.strictObject({ ...partCommon, part: v.literal('rc'), ohm, uf, w: ratedW }),
    v.strictObject({ ...partCommon, part: v.literal('rlc'), ohm, mh, uf, dcr_ohm: dcr, w: ratedW }),
    v.strictObject({ ...partCommon, part: v.literal('lc-parallel'), mh, uf, dcr_ohm: dcr, ohm: v.optional(ohm), w: ratedW }),
  ],
  `part must be one of ${LADDER_PARTS.map((p) => `"${p}"`).join(', ')}`,
);

/** A passive network between the way's amplifier channel and its drivers. */
export const passiveFilterSchema = v.strictObject({
  type: v.literal('passive', 'must be "passive"'),
  ladder: v.pipe(
    v.array(ladderPartSchema, 'must be a list of parts'),
    v.maxLength(MAX_LADDER_PARTS, `must have at most ${MAX_LADDER_PARTS} parts`),
  ),
});

/**
 * A driver's measured frequency response (frequency, SPL, optional phase as parallel lists) and the
 * frequency the way blends from its model to the measurement (fir/correction.ts); the lists' own
 * consistency (lengths, rising frequencies, the blend covered) is checked in convert.ts.
 */
const mostPoints = `must have at most ${MAX_RESPONSE_POINTS} points`;
/** A list of numbers in [min, max] of at most MAX_RESPONSE_POINTS. */
const points = (min: number, max: number, unit: string, what: string) =>
  v.pipe(v.array(num(min, max, unit), `must be a list of ${what}`), v.maxLength(MAX_RESPONSE_POINTS, mostPoints));
export const measuredResponseSchema = v.strictObject({
  blend_hz: num(10, 20000, 'Hz'),
  freq_hz: points(1, 100000, 'Hz', 'frequencies in Hz'),
  spl_db: points(-250, 250, 'dB', 'levels in dB'),
  phase_deg: v.optional(points(-1e6, 1e6, '°', 'phases in degrees')),
  /** Where the table came from (a file name), shown to the user. */
  source: v.optional(text(200)),
});

const wayCommon = {
  name: v.pipe(text(40), v.minLength(1, 'must not be empty')),
  polarity: v.optional(v.picklist([1, -1], 'must be 1 or -1')),
  offset_mm: v.optional(num(-500, 500, 'mm')),
};

export const amplifierSchema = v.strictObject({
  power_w: num(0.1, 100000, 'W'),
  load_ohm: num(1, 64, 'ohm'),
  rs_ohm: v.optional(num(0, 20, 'ohm')),
  clip: v.optional(v.picklist(['hard', 'soft'], 'must be "hard" or "soft"')),
});

const position = v.tuple([num(0, 50, 'm'), num(0, 50, 'm'), num(0, 50, 'm')], 'must be [x, y, z] in metres');
const absorption = num(0.01, 0.99);

/** A rectangular listening room: x along its length from the front wall, y across from the left wall, z up from the floor. */
export const roomSchema = v.strictObject({
  length_m: num(1.5, 50, 'm'),
  width_m: num(1.5, 50, 'm'),
  height_m: num(1.5, 20, 'm'),
  /** One position (the pair mirrored about the centre line) or the left and right speakers' own. */
  speaker_m: v.union([position, v.tuple([position, position])], 'must be [x, y, z] or [[x, y, z], [x, y, z]] in metres'),
  seat_m: position,
  /** The average absorption coefficient, or one per surface. */
  absorption: v.union(
    [
      absorption,
      v.strictObject({
        floor: absorption,
        ceiling: absorption,
        front: absorption,
        back: absorption,
        left: absorption,
        right: absorption,
      }),
    ],
    'must be a number from 0.01 to 0.99, or {floor, ceiling, front, back, left, right} each from 0.01 to 0.99',
  ),
});

export const listeningSchema = v.strictObject({
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
  room: v.optional(roomSchema),
});

export const airSchema = v.optional(
  v.strictObject({
    temperature_c: v.optional(num(-40, 60, '°C')),
    pressure_kpa: v.optional(num(50, 110, 'kPa')),
  }),
);

/**
 * The design schema for a given list of box schemas (one per registered box kind, see box/index.ts,
 * which builds the design schema: the box kinds own their own document shape).
 */
export function makeDesignSchema<const B extends v.ObjectSchema<any, any>[] | v.StrictObjectSchema<any, any>[]>(boxSchemas: B) {
  const types = boxSchemas.map((s) => `"${(s.entries.type as v.LiteralSchema<string, undefined>).literal}"`).join(', ');
  const boxSchema = v.variant('type', boxSchemas, `type must be one of ${types}`);
  const driverWaySchema = v.strictObject({
    kind: v.literal('driver'),
    ...wayCommon,
    // A driver way's filter is active (before its amplifier channel) or a passive network (after it).
    filter: v.optional(v.variant('type', [activeFilterSchema, passiveFilterSchema], 'type must be "active" or "passive"')),
    driver: driverSchema,
    count: v.optional(int(1, MAX_DRIVERS_PER_WAY)),
    wiring: v.optional(v.picklist(['series', 'parallel'], 'must be "series" or "parallel"')),
    box: boxSchema,
    measured_response: v.optional(measuredResponseSchema),
  });
  // An ideal flat band (the first version's upper path): at the passband level of the first
  // driver way unless its own sensitivity is given.
  const flatWaySchema = v.strictObject({
    kind: v.literal('flat'),
    ...wayCommon,
    // An ideal band has no impedance for a passive network to work into.
    filter: v.optional(activeFilterSchema),
    sensitivity_db: v.optional(num(40, 130, 'dB at 2.83 V, 1 m')),
  });
  const waySchema = v.variant('kind', [driverWaySchema, flatWaySchema], 'kind must be "driver" or "flat"');
  return v.strictObject({
    format: v.literal(DESIGN_FORMAT, `must be "${DESIGN_FORMAT}"`),
    version: v.literal(DESIGN_VERSION, `must be ${DESIGN_VERSION}`),
    name: text(200),
    notes: v.optional(text(20000)),
    ways: v.pipe(
      v.array(waySchema, 'must be a list of ways'),
      v.minLength(1, 'needs at least one way'),
      v.maxLength(MAX_WAYS, `must have at most ${MAX_WAYS} ways`),
    ),
    amplifier: amplifierSchema,
    listening: listeningSchema,
    air: airSchema,
  });
}
