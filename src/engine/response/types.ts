import type { SpeakerSystem } from '../system.ts';
import type { Issue } from '../issues.ts';

export type MaxSplLimit = 'excursion' | 'thermal' | 'amplifier' | 'radiator';

/** Small-signal curves on one log-spaced frequency grid; all arrays have freqHz.length entries. */
export interface Curves {
  freqHz: Float64Array;
  /** SPL at the listening seat for the analysis drive voltage (rms), dB re 20 µPa. */
  splDb: Float64Array;
  /** Cone alone and port (or radiator) alone, same drive and seat. */
  coneSplDb: Float64Array;
  portSplDb: Float64Array | null;
  /** Flat passband level of the ideal system (the reference line). */
  referenceSplDb: Float64Array;
  /** Peak one-way cone excursion at the analysis drive, mm. */
  excursionMm: Float64Array;
  /** Peak one-way cone excursion at the planned level, mm. */
  plannedExcursionMm: Float64Array;
  radiatorExcursionMm: Float64Array | null;
  /** Driver terminal impedance (series resistance excluded). */
  impedanceOhm: Float64Array;
  phaseDeg: Float64Array;
  groupDelayMs: Float64Array;
  /** Peak port air speed at the analysis drive, m/s (vented only). */
  portAirSpeed: Float64Array | null;
  /** Peak port air speed at the planned level, m/s (vented only). */
  plannedPortAirSpeed: Float64Array | null;
  /** Highest SPL at the seat for a sine at each frequency, and what limits it. */
  maxSplDb: Float64Array;
  maxSplLimit: MaxSplLimit[];
}

export interface Figures {
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
  /** Physical length of one port, cm (vented). */
  portLengthCm: number | null;
  /** Small's reference efficiency (half space), percent. */
  eta0Pct: number;
  /** Passband SPL for 2.83 V at 1 m in the design's own space (series resistance included). */
  sensitivityDb: number;
  /** Passband SPL at the seat for the analysis drive. */
  passbandSplDb: number;
  /** Peak excursion over 10 Hz..fx at the analysis drive, mm, and where. */
  peakExcursionMm: number;
  peakExcursionHz: number;
  /** Peak port air speed over the grid at the analysis drive, m/s. */
  peakPortSpeed: number | null;
  /** Peak excursion (20 Hz..fx) and port air speed for a sine at the planned level, and where. */
  plannedPeakExcursionMm: number;
  plannedPeakExcursionHz: number;
  plannedPeakPortSpeed: number | null;
  plannedPeakPortSpeedHz: number | null;
  /** Minimum impedance above the first resonance, ohm. */
  zMinOhm: number;
  zMinHz: number;
  /** Amplifier volts (rms) for the planned level, from the design's sensitivity. */
  plannedVoltsRms: number;
  plannedSplDb: number;
  /** SPL at the seat at 30/40/50 Hz for the analysis drive. */
  spl30Db: number;
  spl40Db: number;
  spl50Db: number;
  groupDelay40Ms: number;
}

export interface Analysis {
  system: SpeakerSystem;
  /** Analysis drive, V rms at the amplifier (default 2.83). */
  driveV: number;
  figures: Figures;
  curves: Curves;
  warnings: Issue[];
}
