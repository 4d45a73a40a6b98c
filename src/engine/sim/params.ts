// Constants of the large-signal model for one design at one step length, SI units, computed once
// when the design changes (never per sample).
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { effectiveNonlinear, toPerMetre } from './nonlinear.ts';
import { BOX_KINDS, type BoxProbe, type Chamber } from '../box/index.ts';

export interface WooferParams {
  /** Step length, s. */
  h: number;
  /** Weight of the new end in the electrical row (0.5 = trapezoidal; towards 1 when Le/R < h). */
  thetaE: number;
  re0: number;
  rs: number;
  alphaR: number;
  le0: number;
  /** Semi-inductance L2 ∥ R2 in series with the coil, H and ohm; l2 = 0 when absent. */
  l2: number;
  r2: number;
  bl0: number;
  k0: number;
  mms: number;
  rms: number;
  sd: number;
  xmax: number;
  xlim: number;
  /** Per-metre polynomials [1, c1, c2, ...]. */
  blC: Float64Array;
  kmsC: Float64Array;
  leC: Float64Array;
  /** Far-field pressure per rate of change of volume velocity: rho/(Omega·r). */
  kOut: number;
  /** Passband pressure per volt at the seat: kOut·Bl·Sd/((Re + Rs)·Mms). */
  passbandPaPerV: number;
  /** The box kind's large-signal model: a new chamber (at rest) for each simulation. */
  newChamber: () => Chamber;
  /** The stress the box adds (port air speed, radiator travel), or null. */
  probe: BoxProbe | null;
}

export interface ParamOptions {
  /** Nonlinear parameters off (constant Bl, Kms, Le; no port loss): the linearised model. */
  linear?: boolean;
  /** Port loss coefficient K in place of the one the port's end shape gives. */
  portLossK?: number;
}

/** The constants of one driver way's model (the way's equivalent driver in its box). */
export function wooferParams(sys: SpeakerSystem, way: DriverWay, h: number, opt: ParamOptions = {}): WooferParams {
  const d = way.driver;
  const box = way.box;
  const rho = sys.air.rho,
    c = sys.air.c;
  const nl = effectiveNonlinear(d);
  const linear = opt.linear === true;
  const one = Float64Array.of(1);
  const rsum = d.re + sys.amplifier.rs;
  const tau = d.le / rsum;
  const kOut = rho / (sys.listening.omega * sys.listening.distance);
  const kind = BOX_KINDS[box.type];
  const ctx = { sd: d.sd, h, rho, c, linear, portLossK: opt.portLossK };
  return {
    h,
    thetaE: Math.max(0.5, 1 - tau / h),
    re0: d.re,
    rs: sys.amplifier.rs,
    alphaR: d.thermal.alphaR,
    le0: d.le,
    l2: d.l2,
    r2: d.r2,
    bl0: d.bl,
    k0: 1 / d.cms,
    mms: d.mms,
    rms: d.rms,
    sd: d.sd,
    xmax: d.xmax,
    xlim: Math.max(d.xlim, d.xmax * 1.05),
    blC: linear ? one : toPerMetre(nl.blRelPerMm),
    kmsC: linear ? one : toPerMetre(nl.kmsRelPerMm),
    leC: linear ? one : toPerMetre(nl.leRelPerMm),
    kOut,
    passbandPaPerV: (kOut * d.bl * d.sd) / (rsum * d.mms),
    newChamber: () => kind.chamber(box, ctx),
    probe: kind.probe(box),
  };
}
