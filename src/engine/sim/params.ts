// Constants of the large-signal model for one design at one step length, SI units, computed once
// when the design changes (never per sample).
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { effectiveNonlinear, toPerMetre, fitDefaultNonlinear } from './nonlinear.ts';

/** Loss coefficient K of the port's Δp = ½·rho·K·u·|u| (K of order 1 for sharp edges: Backman, AES 1995). */
export const PORT_LOSS_K = 1.0;
/** A passive radiator's travel limit as a multiple of its Xmax (not in the design; an estimate). */
export const RADIATOR_XLIM_PER_XMAX = 2;

export const BOX_SEALED = 0;
export const BOX_VENTED = 1;
export const BOX_RADIATOR = 2;

export interface WooferParams {
  boxCode: number;
  /** Step length, s. */
  h: number;
  /** Weight of the new end in the electrical row (0.5 = trapezoidal; towards 1 when Le/R < h). */
  thetaE: number;
  re0: number;
  rs: number;
  alphaR: number;
  le0: number;
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
  cab: number;
  /** 1/Ral, S (0 = lossless box). */
  g: number;
  map: number;
  sv: number;
  /** ½·rho·K/Sv^2: port loss Δp = portLoss·q·|q|. */
  portLoss: number;
  mmp: number;
  kmp0: number;
  rmp: number;
  sp: number;
  kmpC: Float64Array;
  xmaxP: number;
  xlimP: number;
  /** Far-field pressure per rate of change of volume velocity: rho/(Omega·r). */
  kOut: number;
  /** Passband pressure per volt at the seat: kOut·Bl·Sd/((Re + Rs)·Mms). */
  passbandPaPerV: number;
}

export interface ParamOptions {
  /** Nonlinear parameters off (constant Bl, Kms, Le; no port loss): the linearised model. */
  linear?: boolean;
  /** Port loss coefficient K (default PORT_LOSS_K). */
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
  const p: WooferParams = {
    boxCode: box.type === 'sealed' ? BOX_SEALED : box.type === 'vented' ? BOX_VENTED : BOX_RADIATOR,
    h,
    thetaE: Math.max(0.5, 1 - tau / h),
    re0: d.re,
    rs: sys.amplifier.rs,
    alphaR: d.thermal.alphaR,
    le0: d.le,
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
    cab: box.vb / (rho * c * c),
    g: Number.isFinite(box.ral) && box.ral > 0 ? 1 / box.ral : 0,
    map: 0,
    sv: 0,
    portLoss: 0,
    mmp: 0,
    kmp0: 0,
    rmp: 0,
    sp: 0,
    kmpC: one,
    xmaxP: 0,
    xlimP: 0,
    kOut,
    passbandPaPerV: (kOut * d.bl * d.sd) / (rsum * d.mms),
  };
  if (box.type === 'vented') {
    p.map = box.map;
    p.sv = box.sv;
    p.portLoss = linear ? 0 : (0.5 * rho * (opt.portLossK ?? PORT_LOSS_K)) / (box.sv * box.sv);
  } else if (box.type === 'passive-radiator') {
    p.mmp = box.mmp;
    p.kmp0 = box.kmp;
    p.rmp = box.rmp;
    p.sp = box.sp;
    p.xmaxP = box.xmax;
    p.xlimP = box.xmax * RADIATOR_XLIM_PER_XMAX;
    // The radiator's suspension: the same default shape as a driver's, to its own travel limit.
    p.kmpC = linear ? one : toPerMetre(fitDefaultNonlinear(p.xmaxP, p.xlimP).kmsRelPerMm);
  }
  return p;
}
