// Level logic of the listening bench, as pure functions of the engine's numbers.
//
// Two different levels are at play and never mixed up:
//  - the planned level (the design's listening.level) decides the physics: the amplifier volts per
//    full scale, hence excursion, heat and overload. The engine computes it; nothing here changes it.
//  - the monitor gain decides how loud the user listens on their own headphones or speakers. It starts
//    low and going above a threshold needs an explicit confirmation (hearing caution).
// "Match levels" scales the heard lanes so A and B have the same passband level, so the ear judges
// bass and overload rather than loudness: the policy lives in engine/level/matching.ts, shared
// with the CLI's `compare`.
import { P_REF } from '../engine/units.ts';

/** Field-quantity decibels: 20·log10 of an amplitude ratio. */
export const dbToGain = (db: number): number => Math.pow(10, db / 20);
export const gainToDb = (g: number): number => 20 * Math.log10(g);

export {
  commonPaPerFs,
  type LaneGains,
  type LaneLevel,
  laneGains,
  passbandDifferenceDb,
  passbandPa,
} from '../engine/level/matching.ts';

// Monitor gain (how loud the user listens), dB relative to the calibrated output.
/** Where the monitor starts on every visit: low. */
export const MONITOR_START_DB = -24;
export const MONITOR_MIN_DB = -60;
export const MONITOR_MAX_DB = 0;
/** Above this the user is asked first (common practice, no source: leave 12 dB below full output). */
export const MONITOR_CONFIRM_ABOVE_DB = -12;

export interface MonitorDecision {
  /** The gain to use now. */
  gainDb: number;
  /** True when the request goes above the caution threshold and has not been confirmed. */
  needsConfirmation: boolean;
  /** What the user asked for (clamped to the range), to apply once confirmed. */
  requestedDb: number;
}

/**
 * A request to change the monitor gain. Going above MONITOR_CONFIRM_ABOVE_DB needs `loudConfirmed`
 * (the user said yes once in this session); until then the gain stops at the threshold.
 */
export function requestMonitorGain(requestedDb: number, loudConfirmed: boolean): MonitorDecision {
  if (typeof requestedDb !== 'number' || Number.isNaN(requestedDb))
    throw new RangeError(`monitor gain must be a number of dB, got ${requestedDb}`);
  const r = Math.min(MONITOR_MAX_DB, Math.max(MONITOR_MIN_DB, requestedDb));
  if (r > MONITOR_CONFIRM_ABOVE_DB && !loudConfirmed) return { gainDb: MONITOR_CONFIRM_ABOVE_DB, needsConfirmation: true, requestedDb: r };
  return { gainDb: r, needsConfirmation: false, requestedDb: r };
}

/** A saved or restored monitor gain never comes back above the caution threshold. */
export function restoredMonitorGain(savedDb: number | undefined): number {
  if (typeof savedDb !== 'number' || !Number.isFinite(savedDb)) return MONITOR_START_DB;
  return Math.min(MONITOR_CONFIRM_ABOVE_DB, Math.max(MONITOR_MIN_DB, savedDb));
}

/** Reference sound pressure, Pa (ISO 1683). */

/** SPL at the seat of a full-scale sine in the passband whose peak pressure is `peakPa`, dB. */
export function fullScaleSineSplDb(peakPa: number): number {
  return gainToDb(peakPa / Math.SQRT2 / P_REF);
}
