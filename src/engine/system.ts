// The validated speaker system in SI units: what every engine module consumes.
// Built from a DesignDoc by `toSystem` (design/convert.ts); never edited in place.

export interface Air {
  /** Speed of sound, m/s. */
  c: number;
  /** Density, kg/m^3. */
  rho: number;
  temperatureC: number;
  pressurePa: number;
}

export interface ThermalParams {
  /** Coil to magnet, K/W. */
  rtv: number;
  /** Coil heat capacity, J/K. */
  ctv: number;
  /** Magnet to air, K/W. */
  rtm: number;
  /** Magnet heat capacity, J/K. */
  ctm: number;
  /** Temperature coefficient of the coil's resistance, 1/K (at 20 °C). */
  alphaR: number;
  material: 'copper' | 'aluminium';
  /** Coil temperature rating, °C. */
  coilMaxC: number;
}

export interface Driver {
  fs: number;
  qes: number;
  qms: number;
  qts: number;
  /** m^3 */
  vas: number;
  /** ohm, cold */
  re: number;
  /** H */
  le: number;
  /**
   * Semi-inductance: a lossy inductance L2 in parallel with R2, in series with Le (the published
   * L2R2 coil model); both 0 when not given.
   */
  l2: number;
  r2: number;
  /** m^2 */
  sd: number;
  /** T·m */
  bl: number;
  /** kg */
  mms: number;
  /** m/N */
  cms: number;
  /** kg/s (N·s/m) */
  rms: number;
  /** m, one way */
  xmax: number;
  /** m, one way: the mechanical limit */
  xlim: number;
  /** W, thermal rating */
  pe: number;
  /** Relative polynomial coefficients in x in mm: Bl(x) = bl·(1 + c1·x + c2·x^2 + ...). Empty = linear. */
  blRelPerMm: number[];
  kmsRelPerMm: number[];
  leRelPerMm: number[];
  /** True where the polynomial was fitted from xmax/xlim rather than typed. */
  nonlinearFitted: boolean;
  /** Even-order asymmetry of the fitted shapes (0 = symmetric): where Bl peaks, m; Kms(+Xmax) vs Kms(-Xmax). */
  blOffset?: number;
  kmsAsymmetry?: number;
  thermal: ThermalParams;
}

export type { Box, SealedBox, VentedBox, PassiveRadiatorBox } from './box/index.ts';
import type { MeasuredResponse } from './fir/correction.ts';
import type { Box } from './box/index.ts';

export interface Amplifier {
  /** Rated power into the nominal load, W. */
  power: number;
  load: number;
  /** Output plus cable resistance, ohm. */
  rs: number;
  /** Rail: peak output voltage sqrt(2·P·Z), V. */
  vPeak: number;
  clip: 'hard' | 'soft';
}

/** One filter band of a way: a Linkwitz-Riley or Butterworth slope at a corner frequency. */
export interface FilterBand {
  shape: 'lr2' | 'lr4' | 'lr8' | 'bw2' | 'bw3' | 'bw4';
  hz: number;
}

/** An active filter in front of a way's amplifier channel. */
export interface ActiveFilter {
  type: 'active';
  highpass: FilterBand | null;
  lowpass: FilterBand | null;
  /** Linear gain (from gain_db). */
  gain: number;
  /** Signal delay, s. */
  delay: number;
}

/**
 * One part of a passive ladder in SI: a two-terminal impedance in the line (`series`) or across it
 * (`shunt`). Its inductance carries its winding's resistance `dcr` in series; `rc` and `rlc` are
 * their elements in series; `lc-parallel` is L (with its dcr) parallel C, parallel `r` when r > 0.
 */
export interface LadderPart {
  at: 'series' | 'shunt';
  part: 'l' | 'c' | 'r' | 'rc' | 'rlc' | 'lc-parallel';
  /** ohm; 0 when the part has no resistor. */
  r: number;
  /** H; 0 when none. */
  l: number;
  /** F; 0 when none. */
  c: number;
  /** The inductor's winding resistance, ohm. */
  dcr: number;
  /** The resistor's rated power, W; 0 when not given. */
  ratedW: number;
}

interface WayCommon {
  name: string;
  filter: ActiveFilter;
  /** 1 or -1. */
  polarity: number;
  /** Acoustic-centre depth behind the baffle reference, m: a delay of offset/c in the sum. */
  offset: number;
}

/**
 * A way of driven drivers in its own box. `driver` is the electrical and mechanical equivalent of
 * all `count` drivers as wired (what the physics uses); `unit` is one of them as entered.
 */
export interface DriverWay extends WayCommon {
  kind: 'driver';
  driver: Driver;
  unit: Driver;
  count: number;
  wiring: 'series' | 'parallel';
  box: Box;
  /**
   * A passive network between the way's amplifier channel and its drivers, amplifier end first;
   * absent for an active way. A passive way's `filter` is the identity (gain 1, no bands, no delay).
   */
  network?: LadderPart[];
  /** A measured response replacing the model's above its blend frequency (fir/correction.ts); absent = the model alone. */
  measured?: MeasuredResponse;
}

/** An ideal flat band at a given passband pressure per volt (the first version's upper path). */
export interface FlatWay extends WayCommon {
  kind: 'flat';
  /** Seat pressure per amplifier volt in the passband, Pa/V (at the design's distance and space). */
  paPerV: number;
}

export type Way = DriverWay | FlatWay;

export type PlannedLevel = { mode: 'spl'; splDb: number } | { mode: 'volts'; voltsFs: number };

export interface Listening {
  distance: number;
  space: 'full' | 'half' | 'quarter' | 'eighth';
  /** Solid angle of radiation, sr: 4 pi full, 2 pi half, pi quarter, pi/2 eighth space. */
  omega: number;
  channels: 'pair' | 'mono-sum';
  level: PlannedLevel;
  /** Room-gain corner, Hz; 0 = none. */
  roomGainHz: number;
  /** Baffle width for the baffle step, m; 0 or absent = none. */
  baffleWidth?: number;
  /** A rectangular room around speakers and seat; absent = the free or half space of `space`. */
  room?: Room;
}

export type Vec3 = [number, number, number];
export type RoomSurface = 'floor' | 'ceiling' | 'front' | 'back' | 'left' | 'right';

/** A rectangular room, m: x along its length from the front wall, y from the left wall, z from the floor. */
export interface Room {
  size: Vec3;
  /** One position per speaker of the pair: left, right. */
  speakers: Vec3[];
  seat: Vec3;
  /** Absorption coefficient of each surface. */
  absorption: Record<RoomSurface, number>;
}

export interface SpeakerSystem {
  name: string;
  air: Air;
  /** One to four ways; at least one is a driver way. */
  ways: Way[];
  amplifier: Amplifier;
  listening: Listening;
}
