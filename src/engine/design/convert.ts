// DesignDoc (document units) -> SpeakerSystem (SI). The only place units are converted on the way in.
import {
  activeFilterOf,
  type DesignDoc,
  type DriverDoc,
  type FilterDoc,
  type FlatWayDoc,
  type MeasuredResponseDoc,
  type PassiveFilterDoc,
} from './document.ts';
import { checkBlendCoverage, checkResponse } from '../fir/response-table.ts';
import type { MeasuredResponse } from '../fir/correction.ts';
import { toRoom } from '../room/build.ts';
import type { ActiveFilter, Air, LadderPart, Driver, DriverWay, FlatWay, Listening, SpeakerSystem, ThermalParams, Way } from '../system.ts';
import { P_REF, SENSITIVITY_VOLTS } from '../units.ts';
import { airAt } from '../air.ts';
import { deriveSmallSignal, totalQ, type SmallSignalInput } from '../driver.ts';
import { BOX_KINDS } from '../box/index.ts';
import { error, fmt, warning, type Issue } from '../issues.ts';

/** Temperature coefficients of resistance at 20 °C: annealed copper (IEC 60028), EC aluminium. */
export const ALPHA_R = { copper: 3.93e-3, aluminium: 4.03e-3 } as const;

export const SOLID_ANGLE: Record<Listening['space'], number> = {
  full: 4 * Math.PI,
  half: 2 * Math.PI,
  quarter: Math.PI,
  eighth: Math.PI / 2,
};

/** Default coil rating for paper formers, °C (from memory: about 150 °C). */
export const DEFAULT_COIL_MAX_C = 150;

/**
 * Thermal estimates when the datasheet gives none (estimates, not measurements): the rated power
 * held continuously brings the coil to its rating, split 60:40 coil-to-magnet : magnet-to-air;
 * time constants 10 s (coil) and 25 min (magnet), inside the typical ranges of Henricksen (1987).
 * The resistances come out below the typical 2-4 K/W (coil) and 1-3 K/W (magnet) of small woofers
 * (REFERENCES, from memory) on purpose: the model has no convective cooling from cone motion, which
 * is what lets a real driver survive its rating, so typical values would put the model's coil past
 * its limit at a third to a half of the driver's own rating. Tied to the rating, the coil event fires
 * where the datasheet says the driver stops being safe. A designer who knows the network enters it.
 */
export function estimateThermal(peW: number, coilMaxC: number, ambientC: number): Omit<ThermalParams, 'alphaR' | 'material' | 'coilMaxC'> {
  const total = Math.max(coilMaxC - ambientC, 10) / peW;
  const rtv = 0.6 * total;
  const rtm = 0.4 * total;
  return { rtv, ctv: 10 / rtv, rtm, ctm: 1500 / rtm };
}

/** Default Xlim when not given: twice Xmax (an estimate, reported as a warning). */
export const defaultXlimMm = (xmaxMm: number): number => 2 * xmaxMm;

/** Drivers per way: the electrical and mechanical equivalent of `count` identical drivers as wired. */
export function combineDrivers(unit: Driver, count: number, wiring: 'series' | 'parallel'): Driver {
  if (count === 1) return unit;
  // Parallel: the same voltage on each coil, currents add; series: the same current, voltages add.
  // Either way masses, stiffnesses, losses and areas add; fs and the Qs stay those of one driver.
  const e = wiring === 'series' ? count : 1 / count;
  return {
    ...unit,
    vas: unit.vas * count,
    re: unit.re * e,
    le: unit.le * e,
    l2: unit.l2 * e,
    r2: unit.r2 * e,
    sd: unit.sd * count,
    bl: wiring === 'series' ? unit.bl * count : unit.bl,
    mms: unit.mms * count,
    cms: unit.cms / count,
    rms: unit.rms * count,
    pe: unit.pe * count,
    thermal: {
      ...unit.thermal,
      rtv: unit.thermal.rtv / count,
      ctv: unit.thermal.ctv * count,
      rtm: unit.thermal.rtm / count,
      ctm: unit.thermal.ctm * count,
    },
  };
}

/** One driver as entered, in SI; issues carry paths under `path`. */
function toDriver(d: DriverDoc, air: Air, path: string, issues: Issue[]): Driver | null {
  const re = d.re_ohm;
  const sd = d.sd_cm2 * 1e-4;
  const given: SmallSignalInput = {};
  if (d.fs_hz !== undefined) given.fs = d.fs_hz;
  if (d.qes !== undefined) given.qes = d.qes;
  if (d.qms !== undefined) given.qms = d.qms;
  if (d.vas_l !== undefined) given.vas = d.vas_l / 1000;
  if (d.bl_tm !== undefined) given.bl = d.bl_tm;
  if (d.mms_g !== undefined) given.mms = d.mms_g / 1000;
  if (d.cms_mm_per_n !== undefined) given.cms = d.cms_mm_per_n / 1000;
  if (d.rms_kg_s !== undefined) given.rms = d.rms_kg_s;
  const derived = deriveSmallSignal(given, re, sd, air, path);
  issues.push(...derived.issues);

  if ((d.l2_mh === undefined) !== (d.r2_ohm === undefined)) {
    const missing = d.l2_mh === undefined ? 'l2_mh' : 'r2_ohm';
    issues.push(error(`${path}.${missing}`, 'is required with the other semi-inductance field: give both l2_mh and r2_ohm, or neither'));
  }
  let xlimMm = d.xlim_mm;
  if (xlimMm === undefined) {
    xlimMm = defaultXlimMm(d.xmax_mm);
    issues.push(warning(`${path}.xlim_mm`, `not given; estimated as ${fmt(xlimMm)} mm (twice Xmax)`));
  } else if (xlimMm <= d.xmax_mm) {
    issues.push(
      error(
        `${path}.xlim_mm`,
        `${fmt(xlimMm)} mm must be larger than xmax_mm ${fmt(d.xmax_mm)} mm (the mechanical limit lies beyond the linear travel)`,
      ),
    );
  }
  if (!derived.values) return null;
  const v = derived.values;
  const material = d.coil_material ?? 'copper';
  const coilMaxC = d.coil_max_c ?? DEFAULT_COIL_MAX_C;
  const estimate = estimateThermal(d.pe_w, coilMaxC, air.temperatureC);
  return {
    fs: v.fs,
    qes: v.qes,
    qms: v.qms,
    qts: totalQ(v.qes, v.qms),
    vas: v.vas,
    re,
    le: (d.le_mh ?? 0) / 1000,
    l2: (d.l2_mh ?? 0) / 1000,
    r2: d.l2_mh !== undefined ? (d.r2_ohm ?? 0) : 0,
    sd,
    bl: v.bl,
    mms: v.mms,
    cms: v.cms,
    rms: v.rms,
    xmax: d.xmax_mm / 1000,
    xlim: xlimMm / 1000,
    pe: d.pe_w,
    blRelPerMm: d.bl_rel_per_mm ?? [],
    kmsRelPerMm: d.kms_rel_per_mm ?? [],
    leRelPerMm: d.le_rel_per_mm ?? [],
    nonlinearFitted: d.bl_rel_per_mm === undefined && d.kms_rel_per_mm === undefined,
    ...(d.bl_offset_mm ? { blOffset: d.bl_offset_mm / 1000 } : {}),
    ...(d.kms_asymmetry ? { kmsAsymmetry: d.kms_asymmetry } : {}),
    thermal: {
      rtv: d.rtv_k_per_w ?? estimate.rtv,
      ctv: d.ctv_j_per_k ?? estimate.ctv,
      rtm: d.rtm_k_per_w ?? estimate.rtm,
      ctm: d.ctm_j_per_k ?? estimate.ctm,
      alphaR: ALPHA_R[material],
      material,
      coilMaxC,
    },
  };
}

function toFilter(doc: FilterDoc | PassiveFilterDoc | undefined): ActiveFilter {
  // A passive way's network sits after the amplifier; in front of it the signal passes unchanged.
  if (doc?.type === 'passive') return { type: 'active', highpass: null, lowpass: null, gain: 1, delay: 0 };
  return {
    type: 'active',
    highpass: doc?.highpass ? { shape: doc.highpass.shape, hz: doc.highpass.hz } : null,
    lowpass: doc?.lowpass ? { shape: doc.lowpass.shape, hz: doc.lowpass.hz } : null,
    gain: 10 ** ((doc?.gain_db ?? 0) / 20),
    delay: (doc?.delay_ms ?? 0) / 1000,
  };
}

/** A measured response as the engine reads it; its problems (a point out of order, the blend not covered) under `path`. */
function toMeasured(doc: MeasuredResponseDoc, path: string, issues: Issue[]): MeasuredResponse | undefined {
  const table = { freqHz: doc.freq_hz, splDb: doc.spl_db, phaseDeg: doc.phase_deg ?? null };
  const problem = checkResponse(table);
  if (problem) {
    issues.push(error(problem.index >= 0 ? `${path}.freq_hz[${problem.index}]` : `${path}.freq_hz`, problem.message));
    return undefined;
  }
  const uncovered = checkBlendCoverage(doc.freq_hz, doc.blend_hz);
  if (uncovered) {
    issues.push(error(`${path}.blend_hz`, `the measured response ${uncovered}`));
    return undefined;
  }
  return { ...table, blendHz: doc.blend_hz };
}

/** A passive ladder in SI; its problems (a network that cuts the driver off) under `path`. */
function toNetwork(doc: PassiveFilterDoc, path: string, issues: Issue[]): LadderPart[] {
  const parts = doc.ladder.map(
    (p): LadderPart => ({
      at: p.at,
      part: p.part,
      r: 'ohm' in p ? (p.ohm ?? 0) : 0,
      l: 'mh' in p ? p.mh / 1000 : 0,
      c: 'uf' in p ? p.uf * 1e-6 : 0,
      dcr: 'dcr_ohm' in p ? (p.dcr_ohm ?? 0) : 0,
      ratedW: 'w' in p ? (p.w ?? 0) : 0,
    }),
  );
  parts.forEach((p, k) => {
    // A plain resistor or an inductor across the line shorts the amplifier at DC: allowed (a pad's
    // shunt arm, a high-pass), but a series capacitor leaves nothing to refuse either. What cannot
    // work is a shunt that is a plain wire, which the schema's minimum values already rule out.
    if (p.at === 'series' && p.part === 'lc-parallel' && p.r === 0 && p.dcr === 0) {
      issues.push(
        warning(
          `${path}[${k}]`,
          'a trap without a resistor cuts its band off completely at its resonance: give its ohm (the trap depth) or the inductor dcr_ohm',
        ),
      );
    }
  });
  return parts;
}

/** Passband seat pressure per amplifier volt of a driver way: rho·Bl·Sd/((Re + Rs)·Mms·Omega·r). */
export function drivenPaPerV(driver: Driver, rs: number, air: Air, listening: Listening): number {
  const kOut = air.rho / (listening.omega * listening.distance);
  return (kOut * driver.bl * driver.sd) / ((driver.re + rs) * driver.mms);
}

export function toSystem(doc: DesignDoc): { system: SpeakerSystem | null; issues: Issue[] } {
  const issues: Issue[] = [];
  const air = airAt(doc.air?.temperature_c, doc.air?.pressure_kpa);
  const rs = doc.amplifier.rs_ohm ?? 0;
  if ((doc.listening.baffle_width_cm ?? 0) > 0 && doc.listening.space !== 'full') {
    issues.push(
      warning(
        'listening.baffle_width_cm',
        `the baffle step models a free-standing cabinet; with ${doc.listening.space} space it adds its 6 dB on top of the boundaries`,
      ),
    );
  }
  const level = doc.listening.level ?? { mode: 'spl', spl_db: 85 };
  const listening: Listening = {
    distance: doc.listening.distance_m,
    space: doc.listening.space,
    omega: SOLID_ANGLE[doc.listening.space],
    channels: doc.listening.channels ?? 'pair',
    level: level.mode === 'spl' ? { mode: 'spl', splDb: level.spl_db } : { mode: 'volts', voltsFs: level.volts_fs },
    roomGainHz: doc.listening.room_gain_hz ?? 0,
    baffleWidth: (doc.listening.baffle_width_cm ?? 0) / 100,
  };
  const room = toRoom(doc.listening, issues);
  if (room) listening.room = room;
  const names = new Set<string>();
  doc.ways.forEach((w, k) => {
    if (names.has(w.name)) issues.push(error(`ways[${k}].name`, `"${w.name}" is the name of an earlier way; each way needs its own name`));
    names.add(w.name);
    const active = activeFilterOf(w);
    const hp = active?.highpass?.hz;
    const lp = active?.lowpass?.hz;
    if (hp !== undefined && lp !== undefined && hp >= lp) {
      issues.push(error(`ways[${k}].filter.highpass.hz`, `${fmt(hp)} Hz must lie below the low-pass at ${fmt(lp)} Hz`));
    } else if (hp !== undefined && lp !== undefined && hp * 4 > lp) {
      // Closer than two octaves the two slopes overlap: the band never reaches its full level.
      issues.push(
        warning(
          `ways[${k}].filter.highpass.hz`,
          `${fmt(hp)} Hz is less than two octaves below the low-pass at ${fmt(lp)} Hz: the two filters overlap and the band loses level`,
        ),
      );
    }
  });
  if (!doc.ways.some((w) => w.kind === 'driver')) issues.push(error('ways', 'needs at least one way with a driver'));

  const ways: Way[] = [];
  const pending: { k: number; w: FlatWayDoc }[] = [];
  doc.ways.forEach((w, k) => {
    const path = `ways[${k}]`;
    const common = { name: w.name, filter: toFilter(w.filter), polarity: w.polarity ?? 1, offset: (w.offset_mm ?? 0) / 1000 };
    if (w.kind === 'flat') {
      pending.push({ k, w });
      ways.push({ kind: 'flat', ...common, paPerV: 0 });
      return;
    }
    const unit = toDriver(w.driver, air, `${path}.driver`, issues);
    if (!unit) return;
    const count = w.count ?? 1;
    const wiring = w.wiring ?? 'parallel';
    const driver = combineDrivers(unit, count, wiring);
    const built = BOX_KINDS[w.box.type].build(w.box as never, { air, driver, rs }, `${path}.box`);
    issues.push(...built.issues);
    if (!built.box) return;
    const way: DriverWay = { kind: 'driver', ...common, driver, unit, count, wiring, box: built.box };
    if (w.filter?.type === 'passive') way.network = toNetwork(w.filter, `${path}.filter.ladder`, issues);
    if (w.measured_response) way.measured = toMeasured(w.measured_response, `${path}.measured_response`, issues);
    ways.push(way);
  });
  if (issues.some((i) => i.severity === 'error')) return { system: null, issues };
  const firstDriven = ways.find((w) => w.kind === 'driver');
  for (const { k, w } of pending) {
    const way = ways[k] as FlatWay;
    // A flat way without its own sensitivity plays at the first driver way's passband level.
    way.paPerV =
      w.sensitivity_db === undefined
        ? drivenPaPerV(firstDriven!.driver, rs, air, listening)
        : (P_REF * 10 ** (w.sensitivity_db / 20)) / (SENSITIVITY_VOLTS * listening.distance);
  }
  const system: SpeakerSystem = {
    name: doc.name,
    air,
    ways,
    amplifier: {
      power: doc.amplifier.power_w,
      load: doc.amplifier.load_ohm,
      rs,
      vPeak: Math.sqrt(2 * doc.amplifier.power_w * doc.amplifier.load_ohm),
      clip: doc.amplifier.clip ?? 'hard',
    },
    listening,
  };
  return { system, issues };
}
