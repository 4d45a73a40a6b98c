import type { CrossoverFigures } from './crossover-figures.ts';
import type { RoomAnalysis } from '../room/analysis.ts';
import type { DriverWay, SpeakerSystem } from '../system.ts';
import type { Issue } from '../issues.ts';
import type { BoxFigure } from '../box/physics.ts';
import type { AmplifierShortfall } from '../level/programme.ts';

/** What sets a way's highest sine level at a frequency (analyze.ts `maxSine`). */
export type MaxSplLimit = 'excursion' | 'port' | 'radiator' | 'amplifier' | 'thermal';

/**
 * Small-signal curves of one driver way on one log-spaced frequency grid; all arrays have
 * freqHz.length entries. Each way is shown as it plays: through its whole filter (high-pass,
 * low-pass, gain and delay), before its polarity and acoustic offset place it in the sum.
 */
export interface Curves {
  freqHz: Float64Array;
  /** SPL at the listening seat for the analysis drive voltage (rms), dB re 20 µPa. */
  splDb: Float64Array;
  /** Cone alone and port (or radiator) alone, same drive and seat. */
  coneSplDb: Float64Array;
  portSplDb: Float64Array | null;
  /**
   * A measured response's level (response/measured-points.ts) where its table has points, NaN
   * elsewhere; null for a way without one.
   */
  measuredSplDb: Float64Array | null;
  /** The way's flat passband level through its filter's gain (the reference line). */
  referenceSplDb: Float64Array;
  /** Peak one-way cone excursion at the analysis drive, mm. */
  excursionMm: Float64Array;
  /** Peak one-way cone excursion at the planned level, mm. */
  plannedExcursionMm: Float64Array;
  radiatorExcursionMm: Float64Array | null;
  /** Terminal impedance of the way as the amplifier sees it (all its drivers as wired; series resistance excluded). */
  impedanceOhm: Float64Array;
  /** Phase of that impedance, degrees. */
  phaseDeg: Float64Array;
  /** Group delay of the way's acoustic output, filter included. */
  groupDelayMs: Float64Array;
  /** Peak port air speed at the analysis drive, m/s (boxes with a port). */
  portAirSpeed: Float64Array | null;
  /** Peak port air speed at the planned level, m/s (boxes with a port). */
  plannedPortAirSpeed: Float64Array | null;
  /**
   * Highest SPL of the way at the seat for a sine at each frequency (a sine figure), and what limits
   * it: Xmax, port air speed, radiator travel, the amplifier's rail, or the coil at its rated
   * temperature; every limit with the coil at its thermal equilibrium at that drive (hot Re).
   */
  maxSplDb: Float64Array;
  maxSplLimit: MaxSplLimit[];
  /** A passive way's network (null for an active way). */
  network: NetworkCurves | null;
}

/** A passive way's network on the grid. `impedanceOhm` of such a way is what the amplifier sees. */
export interface NetworkCurves {
  /** Driver-terminal volts over amplifier volts, dB and degrees (the network loaded by the drivers). */
  transferDb: Float64Array;
  transferDeg: Float64Array;
  /** The drivers' own terminal impedance, ohm. */
  driverImpedanceOhm: Float64Array;
  /** Each part, amplifier end first: heat (W) and current (A rms) for a sine at the planned level. */
  parts: { label: string; plannedPowerW: Float64Array; plannedCurrentA: Float64Array }[];
}

/** One part of a passive network at the planned level (a sine swept over 20 Hz to 20 kHz). */
export interface PartFigure {
  label: string;
  /** Highest heat in the part, W, and where. */
  peakPowerW: number;
  peakPowerHz: number;
  /** Highest rms current through it, A, and where. */
  peakCurrentA: number;
  peakCurrentHz: number;
  /** The rated power given for its resistor, W; null when none. */
  ratedW: number | null;
}

export interface Figures {
  /**
   * Where the way's low end falls 3/6/10 dB under its passband level: its high-pass, gain and
   * delay included, its low-pass left out (the upper edge belongs to the crossover and the sum).
   */
  f3Hz: number;
  f6Hz: number;
  f10Hz: number;
  /** Sealed: system resonance and total Q. */
  fcHz: number | null;
  qtc: number | null;
  /** Vented: tuning; passive radiator: tuning sqrt((Kmp + rho c^2 Sp^2/Vb)/Mmp)/(2 pi). */
  fbHz: number | null;
  /** Passive radiator free-air resonance (the notch). */
  fpHz: number | null;
  /** Physical length of one port, cm (vented, bandpass). */
  portLengthCm: number | null;
  /** Every figure the box kind gives (tuning, port length, pipe resonance, chamber volumes...). */
  box: BoxFigure[];
  /** Small's reference efficiency (half space) of the way's drivers together, percent. */
  eta0Pct: number;
  /**
   * Passband SPL of the way's drivers in their box for 2.83 V at 1 m in the design's own space (no
   * filter; series resistance included; without the baffle step, which the curves at the seat include).
   */
  sensitivityDb: number;
  /** Passband SPL at the seat for the analysis drive, through the filter's gain. */
  passbandSplDb: number;
  /** Peak excursion over the grid at the analysis drive, mm, and where. */
  peakExcursionMm: number;
  peakExcursionHz: number;
  /** Peak port air speed over the grid at the analysis drive, m/s. */
  peakPortSpeed: number | null;
  /** Peak excursion (20 Hz and up) and port air speed for a sine at the planned level, and where. */
  plannedPeakExcursionMm: number;
  plannedPeakExcursionHz: number;
  plannedPeakPortSpeed: number | null;
  plannedPeakPortSpeedHz: number | null;
  /** Minimum impedance above the first resonance, ohm. */
  zMinOhm: number;
  zMinHz: number;
  /** Amplifier volts (rms) for the planned level: the programme stand-in's, the system's (one drive for every way). */
  plannedVoltsRms: number;
  /** The planned level at the seat: the programme stand-in's long-term Leq,C, both speakers (level/programme.ts). */
  plannedSplDb: number;
  /** SPL at the seat at 30/40/50 Hz for the analysis drive. */
  spl30Db: number;
  spl40Db: number;
  spl50Db: number;
  groupDelay40Ms: number;
  /** A passive way's parts at the planned level (null for an active way). */
  parts: PartFigure[] | null;
}

/** One driver way's analysis. */
export interface WayAnalysis {
  way: DriverWay;
  /** Its index in system.ways. */
  index: number;
  figures: Figures;
  curves: Curves;
  /** What the planned level does to this way. */
  warnings: Issue[];
}

/** The summed output of every way at the seat, on the same grid as the ways' curves. */
export interface SumCurves {
  freqHz: Float64Array;
  /** SPL of the complex sum (each way's filter, polarity and offset delay included). */
  splDb: Float64Array;
  /** Acoustic phase of the sum, degrees (the time of flight to the seat left out). */
  phaseDeg: Float64Array;
  groupDelayMs: Float64Array;
  /** Each way's SPL as it enters the sum, in system.ways order (flat ways included). */
  ways: { name: string; kind: 'driver' | 'flat'; splDb: Float64Array }[];
  /** The impedance of the passive ways together on their one amplifier channel, ohm; null without one. */
  passiveLoadOhm: Float64Array | null;
}

export interface SumFigures {
  /** Where the sum's low end falls 3/6/10 dB under its passband level (no room gain). */
  f3Hz: number;
  f6Hz: number;
  f10Hz: number;
  /** Passband SPL of the sum for 2.83 V at 1 m in the design's own space, without the baffle step. */
  sensitivityDb: number;
  /** Passband SPL of the sum at the seat for the analysis drive. */
  passbandSplDb: number;
  /** Amplifier volts (rms) for the planned level (the programme stand-in's), and that level at the seat (its Leq,C). */
  plannedVoltsRms: number;
  plannedSplDb: number;
  groupDelay40Ms: number;
  /** The lowest impedance of the passive ways' amplifier channel from 20 Hz to 20 kHz, and where; null without one. */
  passiveLoadMinOhm: number | null;
  passiveLoadMinHz: number | null;
  /** Each way's acoustic -6 dB points and the sum's deviation from flat, from the sum's f3 up (no room gain in the level). */
  crossover: CrossoverFigures;
}

export interface SumAnalysis {
  figures: SumFigures;
  curves: SumCurves;
}

/**
 * The analysis of a design. The top-level way fields (`way`, `figures`, `curves`) are those of the
 * first driver way, as the first version's single woofer; `ways` has every driver way and `sum`
 * the whole system at the seat. `warnings` gathers every way's.
 */
export interface Analysis extends WayAnalysis {
  system: SpeakerSystem;
  /**
   * The planned level with the programme stand-in (level/programme.ts): its channel volts rms, its
   * Leq,C at the seat per volt, and each way whose amplifier channel cannot give its peaks.
   */
  programme: { voltsRms: number; leqCPerVoltDb: number; shortfalls: AmplifierShortfall[] };
  /** Analysis drive, V rms at the amplifier (default 2.83). */
  driveV: number;
  ways: WayAnalysis[];
  sum: SumAnalysis;
  /** The listening room's effect on the sum at the seat, when the design has a room. */
  room?: RoomAnalysis;
}
