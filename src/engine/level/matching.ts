// The one level-matching policy of preheard, for the listening bench (src/audio) and the CLI's
// `compare`: both designs are heard through one calibration, the louder design's full-scale
// passband at -6 dBFS (room for bass boost and overshoot before the true-peak guard acts), and
// "match levels" brings the louder one down to the quieter one's passband (nothing is raised
// towards full scale). The planned level (the physics) is never changed by it.

/** The lanes the policy sets gains for: the two designs and the flat reference. */
export type MatchedLane = 'a' | 'b' | 'ref';

export interface LaneLevel {
  /** Passband seat pressure per amplifier volt, Pa/V (the engine's renderer.passbandPaPerV). */
  passbandPaPerV: number;
  /** Amplifier peak volts for a full-scale sample (the planned level, resolved by the engine). */
  voltsFs: number;
}

/** Seat pressure of a full-scale input in the passband, Pa: what the design makes of the planned level. */
export function passbandPa(l: LaneLevel): number {
  if (!(l.passbandPaPerV > 0) || !Number.isFinite(l.passbandPaPerV))
    throw new RangeError(`passbandPaPerV must be a positive number, got ${l.passbandPaPerV}`);
  if (!(l.voltsFs > 0) || !Number.isFinite(l.voltsFs)) throw new RangeError(`voltsFs must be a positive number, got ${l.voltsFs}`);
  return l.passbandPaPerV * l.voltsFs;
}

/**
 * The one calibration both designs are heard through (Pa per full-scale output sample): the louder
 * design's full-scale passband lands at -6 dBFS, as the engine does for a single design, leaving
 * room for bass boost and overshoot before its true-peak guard acts.
 */
export function commonPaPerFs(a: LaneLevel, b: LaneLevel): number {
  return 2 * Math.max(passbandPa(a), passbandPa(b));
}

export interface LaneGains {
  /** Linear gains applied to each lane after rendering (1 = as calibrated). */
  gains: Record<MatchedLane, number>;
  /** Passband pressure the flat reference plays at, Pa per full-scale input. */
  referencePa: number;
}

/**
 * Gains that put A, B and the reference at one passband level when `match` is on: the quieter
 * design's level (so nothing is raised towards full scale). With `match` off, A and B play as their
 * planned levels make them and the reference follows A.
 */
export function laneGains(a: LaneLevel, b: LaneLevel, match: boolean): LaneGains {
  const pa = passbandPa(a);
  const pb = passbandPa(b);
  if (!match) return { gains: { a: 1, b: 1, ref: 1 }, referencePa: pa };
  const target = Math.min(pa, pb);
  return { gains: { a: target / pa, b: target / pb, ref: 1 }, referencePa: target };
}

/** How much louder A's passband is than B's at their planned levels, dB. */
export function passbandDifferenceDb(a: LaneLevel, b: LaneLevel): number {
  return 20 * Math.log10(passbandPa(a) / passbandPa(b));
}
