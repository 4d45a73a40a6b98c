// DesignDoc (document units) -> SpeakerSystem (SI). The only place units are converted on the way in.
import type { DesignDoc } from './document.ts';
import type { Driver, Listening, SpeakerSystem, ThermalParams } from '../system.ts';
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
 */
export function estimateThermal(peW: number, coilMaxC: number, ambientC: number): Omit<ThermalParams, 'alphaR' | 'material' | 'coilMaxC'> {
  const total = Math.max(coilMaxC - ambientC, 10) / peW;
  const rtv = 0.6 * total;
  const rtm = 0.4 * total;
  return { rtv, ctv: 10 / rtv, rtm, ctm: 1500 / rtm };
}

/** Default Xlim when not given: twice Xmax (an estimate, reported as a warning). */
export const defaultXlimMm = (xmaxMm: number): number => 2 * xmaxMm;

export function toSystem(doc: DesignDoc): { system: SpeakerSystem | null; issues: Issue[] } {
  const issues: Issue[] = [];
  const air = airAt(doc.air?.temperature_c, doc.air?.pressure_kpa);
  const d = doc.driver;
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
  const derived = deriveSmallSignal(given, re, sd, air, 'driver');
  issues.push(...derived.issues);

  let xlimMm = d.xlim_mm;
  if (xlimMm === undefined) {
    xlimMm = defaultXlimMm(d.xmax_mm);
    issues.push(warning('driver.xlim_mm', `not given; estimated as ${fmt(xlimMm)} mm (twice Xmax)`));
  } else if (xlimMm <= d.xmax_mm) {
    issues.push(
      error(
        'driver.xlim_mm',
        `${fmt(xlimMm)} mm must be larger than xmax_mm ${fmt(d.xmax_mm)} mm (the mechanical limit lies beyond the linear travel)`,
      ),
    );
  }
  const rs = doc.amplifier.rs_ohm ?? 0;
  if (doc.crossover.type !== 'none' && doc.crossover.fx_hz === undefined) {
    issues.push(error('crossover.fx_hz', `is required for a ${doc.crossover.type} crossover (20 to 5000 Hz)`));
  }
  if ((doc.listening.baffle_width_cm ?? 0) > 0 && doc.listening.space !== 'full') {
    issues.push(
      warning(
        'listening.baffle_width_cm',
        `the baffle step models a free-standing cabinet; with ${doc.listening.space} space it adds its 6 dB on top of the boundaries`,
      ),
    );
  }
  const hpHz = doc.crossover.highpass_hz ?? 0;
  if (hpHz > 0 && doc.crossover.type !== 'none' && doc.crossover.fx_hz !== undefined && hpHz * 4 > doc.crossover.fx_hz) {
    issues.push(
      error('crossover.highpass_hz', `${fmt(hpHz)} Hz must lie at least two octaves below the crossover at ${fmt(doc.crossover.fx_hz)} Hz`),
    );
  }
  if (!derived.values || issues.some((i) => i.severity === 'error')) return { system: null, issues };

  const v = derived.values;
  const material = d.coil_material ?? 'copper';
  const coilMaxC = d.coil_max_c ?? DEFAULT_COIL_MAX_C;
  const estimate = estimateThermal(d.pe_w, coilMaxC, air.temperatureC);
  const driver: Driver = {
    fs: v.fs,
    qes: v.qes,
    qms: v.qms,
    qts: totalQ(v.qes, v.qms),
    vas: v.vas,
    re,
    le: (d.le_mh ?? 0) / 1000,
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
  const built = BOX_KINDS[doc.box.type].build(doc.box, { air, driver, rs }, 'box');
  issues.push(...built.issues);
  if (!built.box || issues.some((i) => i.severity === 'error')) return { system: null, issues };

  const level = doc.listening.level ?? { mode: 'spl', spl_db: 85 };
  const system: SpeakerSystem = {
    name: doc.name,
    air,
    driver,
    box: built.box,
    amplifier: {
      power: doc.amplifier.power_w,
      load: doc.amplifier.load_ohm,
      rs,
      vPeak: Math.sqrt(2 * doc.amplifier.power_w * doc.amplifier.load_ohm),
      clip: doc.amplifier.clip ?? 'hard',
    },
    crossover: { type: doc.crossover.type, fx: doc.crossover.fx_hz ?? 0, highpassHz: doc.crossover.highpass_hz ?? 0 },
    listening: {
      distance: doc.listening.distance_m,
      space: doc.listening.space,
      omega: SOLID_ANGLE[doc.listening.space],
      channels: doc.listening.channels ?? 'pair',
      level: level.mode === 'spl' ? { mode: 'spl', splDb: level.spl_db } : { mode: 'volts', voltsFs: level.volts_fs },
      roomGainHz: doc.listening.room_gain_hz ?? 0,
      baffleWidth: (doc.listening.baffle_width_cm ?? 0) / 100,
    },
  };
  return { system, issues };
}
