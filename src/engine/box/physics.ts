// What a box kind provides to the physics: the acoustic load on the cone, small and large signal.
//
// Small signal (frequency domain), per unit cone volume velocity Uc = Sd·v (outward):
//   the force on the cone is -Sd·zLoad·Uc, and the air radiated is Uc·(cone + outlet + leak).
// Large signal (time domain): a `Chamber` holds the box's own states and their rows in the cone
// model's linearly implicit theta step (sim/woofer.ts). Each step the chamber first gives the change
// of the net pressure pushing the cone, dP = p0 + p1·dv, in terms of the cone's velocity change dv
// (its rows eliminated by hand); the cone row is solved; then the chamber advances by dv and, at the
// new state, evaluates its rows and the radiated volume velocity's rate of change.
import type { Complex } from '../complex.ts';
import type { Poly } from '../filters/analog.ts';

export interface BoxAcoustics {
  /** Acoustic impedance loading the cone (both faces together), Pa·s/m^3. */
  zLoad: Complex;
  /** Radiated volume velocity per unit cone volume velocity: the cone's own face, 1 or 0. */
  cone: number;
  /** Volume velocity out through the port or radiator per unit cone volume velocity. */
  outlet: Complex;
  /** Leakage flow (which radiates too) per unit cone volume velocity. */
  leak: Complex;
  /** Pressure in the chamber the outlet opens from (the only chamber of a one-chamber box), per unit cone volume velocity. */
  chamber: Complex;
}

/** Constants for a box's large-signal model. */
export interface ChamberContext {
  /** Cone area of the way (all drivers), m^2. */
  sd: number;
  /** Step length, s. */
  h: number;
  rho: number;
  c: number;
  /** Nonlinear terms off (port loss, radiator suspension): the linearised model. */
  linear: boolean;
  /** Loss coefficient K of the port's Δp = ½·rho·K·u·|u| in place of the box's own (tests); undefined = the box's. */
  portLossK?: number;
}

/** A figure of the box for the figure tables: a number with its unit and what it means. */
export interface BoxFigure {
  id: string;
  label: string;
  value: number;
  unit: string;
}

/** The stress a box adds to the driver's own: a probe value per sample and its limit. */
export interface BoxProbe {
  /** Event kind (see render/events.ts). */
  kind: 'port-speed' | 'radiator';
  /** Probe value (the chamber's `probe()`) times this gives the quantity in the event's unit (m/s, mm). */
  toUnit: number;
  /** Limit in the event's unit. */
  limit: number;
}

/**
 * The linear rows of the box in the state-space model, appended after [i, x, v] (sim/linear.ts).
 * `m` and `a` are row-major n×n; the cone row is row 2 and the cone velocity column 2.
 */
export interface LinearRowsTarget {
  n: number;
  m: Float64Array;
  a: Float64Array;
  /** Seat-pressure output row per unit rate of change of radiated volume velocity, added into by the chamber. */
  c: Float64Array;
  /** rho/(Omega·r): seat pressure per unit dU/dt. */
  kOut: number;
}

export interface Chamber {
  /** Number of states after [i, x, v]. */
  readonly states: number;
  /** Whether the cone's own face radiates (false inside a bandpass box). */
  readonly coneRadiates: boolean;
  /** Coefficients of the net pressure change on the cone this step: dP = p0 + p1·dv. */
  p0: number;
  p1: number;
  reset(): void;
  /** Takes over the state of a chamber of the same kind (a live edit), else stays at rest. */
  adopt(other: Chamber): void;
  /** Computes p0 and p1 for the coming step (th = 0.5: the trapezoidal weight). */
  prepare(): void;
  /** Advances the box states with the cone's velocity change dv (and dP = p0 + p1·dv). */
  advance(dv: number): void;
  /** The cone stopped at its end stop short by `volume` m^3 (Sd·overshoot, signed): the chambers keep that air. */
  coneStopped(volume: number): void;
  /** Net pressure pushing the cone outward, Pa (its back face minus its front face). */
  net(): number;
  /** Rows at the new state for cone velocity v; returns `dU` plus the rate of change of the air the box radiates. */
  evaluate(v: number, dU: number): number;
  /** The probed quantity of the last evaluated state (port volume velocity, radiator excursion), or 0. */
  probe(): number;
  /** Writes the box's linear rows and its outlet's part of the output row (sim/linear.ts). */
  linearRows(t: LinearRowsTarget): void;
  /** The leaks' part of the output row for state k (added after the cone's own). */
  leakOut(t: LinearRowsTarget, k: number): number;
  /**
   * The load as rational functions of s: zLoad = nz/dz (acoustic impedance on the cone) and the
   * radiated volume velocity per cone volume velocity nr/dz (sim/transfer.ts).
   */
  transfer(): { nz: Poly; dz: Poly; nr: Poly };
}
