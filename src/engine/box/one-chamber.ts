// The one-chamber boxes (closed, ported, passive radiator) share the chamber's rows:
//   Cab·pb' = -Sd·v - Uo - pb/Ral   (Uo out through the port or radiator; the leak radiates too)
// and differ in the outlet. The large-signal rows are those of Small's circuits (JAES 1972, 1973)
// in the cone model's theta step; see physics.ts for the protocol.
import type { Air } from '../system.ts';
import { add, cx, inv, mul, scale, type Complex } from '../complex.ts';
import { toPerMetre, fitDefaultNonlinear, KMS_FLOOR } from '../sim/nonlinear.ts';
import { boxCompliance } from './common.ts';
import { polyAdd, polyMul } from '../filters/analog.ts';
import type { BoxAcoustics, Chamber, ChamberContext, LinearRowsTarget } from './physics.ts';
import { keepShape } from '../keep-shape.ts';

/** Small signal of a one-chamber box whose outlet has admittance yo (null: closed). */
export function oneChamberAcoustics(vb: number, ral: number, air: Air, w: number, yo: Complex | null): BoxAcoustics {
  const ybox = add(cx(1 / ral, w * boxCompliance(vb, air)), yo ?? cx(0));
  const zbox = inv(ybox);
  const chamber = scale(zbox, -1);
  return { zLoad: zbox, cone: 1, outlet: yo ? mul(yo, chamber) : cx(0), leak: scale(chamber, 1 / ral), chamber };
}

const TH = 0.5;
const TT = TH * TH;

/**
 * A chamber the two-lane model loop (sim/woofer-pair.ts) can run: its kind there (0 closed, 1
 * ported), its constants [cabH, g, cab, gOverCab, mapH, invMap, portLoss] and its state
 * [pb, q, f4, f5, d5, p0, p1], each written to or read from `at + 2·j + lane` of an array.
 */
export interface PairedChamber {
  readonly pairKind: 0 | 1;
  writePairConstants(to: Float64Array, at: number, lane: number): void;
  writePairState(to: Float64Array, at: number, lane: number): void;
  readPairState(from: Float64Array, at: number, lane: number): void;
}

/** The chamber's own state and rows; subclasses add the outlet. */
export abstract class OneChamber implements Chamber {
  abstract readonly states: number;
  readonly coneRadiates = true;
  p0 = 0;
  p1 = 0;
  pb = 0;
  protected f4 = 0;
  protected d4 = 0;
  protected readonly cab: number;
  protected readonly g: number;
  protected readonly sd: number;
  protected readonly h: number;
  protected readonly cabH: number;
  protected readonly gOverCab: number;

  constructor(vb: number, ral: number, ctx: ChamberContext) {
    this.cab = vb / (ctx.rho * ctx.c * ctx.c);
    this.g = Number.isFinite(ral) && ral > 0 ? 1 / ral : 0;
    this.sd = ctx.sd;
    this.h = ctx.h;
    this.cabH = this.cab / ctx.h;
    this.gOverCab = this.g / this.cab;
    keepShape(this);
  }

  reset(): void {
    this.pb = this.f4 = this.p0 = this.p1 = 0;
  }

  adopt(other: Chamber): void {
    if (other instanceof OneChamber) this.pb = other.pb;
  }

  coneStopped(volume: number): void {
    this.pb += volume / this.cab;
  }

  net(): number {
    return this.pb;
  }

  probe(): number {
    return 0;
  }

  /** The chamber's own constants for the two-lane loop: cabH, g, cab, gOverCab (see PairedChamber). */
  protected writeChamberConstants(to: Float64Array, at: number, lane: number): void {
    to[at + lane] = this.cabH;
    to[at + 2 + lane] = this.g;
    to[at + 4 + lane] = this.cab;
    to[at + 6 + lane] = this.gOverCab;
  }

  abstract prepare(): void;
  abstract advance(dv: number): void;
  abstract evaluate(v: number, dU: number): number;

  linearRows(t: LinearRowsTarget): void {
    const n = t.n;
    t.a[2 * n + 3] = this.sd;
    t.m[3 * n + 3] = this.cab;
    t.a[3 * n + 2] = -this.sd;
    t.a[3 * n + 3] = -this.g;
  }

  /** The leak's radiation in the output row, per unit of state k's rate (after the outlet's). */
  leakOut(t: LinearRowsTarget, k: number): number {
    return (t.kOut * this.g * t.a[3 * t.n + k]) / this.cab;
  }

  transfer(): { nz: number[]; dz: number[]; nr: number[] } {
    // zLoad = 1/Yb with Yb = nb/db; the radiated flow per cone flow is s·Cab/Yb (Small 1973's net compression flow).
    const { nb, db } = this.admittance();
    const nr = polyTimesS(scalePoly(db, this.cab));
    return { nz: db, dz: nb, nr };
  }

  /** The box admittance s·Cab + G + Y_outlet as nb/db. */
  protected abstract admittance(): { nb: number[]; db: number[] };
}

const scalePoly = (p: number[], k: number) => p.map((x) => x * k);
const polyTimesS = (p: number[]) => [0, ...p];

/** A closed box: the chamber alone. */
export class ClosedChamber extends OneChamber implements PairedChamber {
  readonly states = 1;
  readonly pairKind = 0;

  writePairConstants(to: Float64Array, at: number, lane: number): void {
    this.writeChamberConstants(to, at, lane);
    to[at + 8 + lane] = to[at + 10 + lane] = to[at + 12 + lane] = 0;
  }

  writePairState(to: Float64Array, at: number, lane: number): void {
    to[at + lane] = this.pb;
    to[at + 2 + lane] = 0;
    to[at + 4 + lane] = this.f4;
    to[at + 6 + lane] = to[at + 8 + lane] = 0;
    to[at + 10 + lane] = this.p0;
    to[at + 12 + lane] = this.p1;
  }

  readPairState(from: Float64Array, at: number, lane: number): void {
    this.pb = from[at + lane];
    this.f4 = from[at + 4 + lane];
    this.p0 = from[at + 10 + lane];
    this.p1 = from[at + 12 + lane];
  }

  prepare(): void {
    const d4 = this.cabH + TH * this.g;
    this.p0 = this.f4 / d4;
    this.p1 = (-TH * this.sd) / d4;
  }

  advance(dv: number): void {
    this.pb += this.p0 + this.p1 * dv;
  }

  evaluate(v: number, dU: number): number {
    this.f4 = -this.sd * v - this.g * this.pb;
    return dU + this.gOverCab * this.f4;
  }

  protected admittance() {
    return { nb: [this.g, this.cab], db: [1] };
  }
}

/** A ported box: Map·Up' = pb - ½·rho·K·u·|u| with u = Up/Sv (port compression). */
export class PortedChamber extends OneChamber implements PairedChamber {
  readonly states = 2;
  readonly pairKind = 1;
  q = 0;
  private f5 = 0;
  private d5 = 0;
  private readonly mapH: number;
  private readonly invMap: number;
  private readonly portLoss: number;

  constructor(
    vb: number,
    ral: number,
    private readonly map: number,
    sv: number,
    portLossK: number,
    ctx: ChamberContext,
  ) {
    super(vb, ral, ctx);
    this.mapH = map / ctx.h;
    this.invMap = map > 0 ? 1 / map : 0;
    this.portLoss = ctx.linear ? 0 : (0.5 * ctx.rho * (ctx.portLossK ?? portLossK)) / (sv * sv);
  }

  override reset(): void {
    super.reset();
    this.q = this.f5 = 0;
  }

  override adopt(other: Chamber): void {
    super.adopt(other);
    if (other instanceof PortedChamber) this.q = other.q;
  }

  prepare(): void {
    const q = this.q;
    const d5 = this.mapH + TH * 2 * this.portLoss * (q < 0 ? -q : q);
    const d4 = this.cabH + TH * this.g + TT / d5;
    const r4p = this.f4 - (TH * this.f5) / d5;
    this.d5 = d5;
    this.p0 = r4p / d4;
    this.p1 = (-TH * this.sd) / d4;
  }

  advance(dv: number): void {
    const dp = this.p0 + this.p1 * dv;
    this.pb += dp;
    this.q += (this.f5 + TH * dp) / this.d5;
  }

  evaluate(v: number, dU: number): number {
    const q = this.q,
      pb = this.pb;
    this.f4 = -this.sd * v - q - this.g * pb;
    this.f5 = pb - this.portLoss * q * (q < 0 ? -q : q);
    return dU + this.f5 * this.invMap + this.gOverCab * this.f4;
  }

  override probe(): number {
    return this.q;
  }

  writePairConstants(to: Float64Array, at: number, lane: number): void {
    this.writeChamberConstants(to, at, lane);
    to[at + 8 + lane] = this.mapH;
    to[at + 10 + lane] = this.invMap;
    to[at + 12 + lane] = this.portLoss;
  }

  writePairState(to: Float64Array, at: number, lane: number): void {
    to[at + lane] = this.pb;
    to[at + 2 + lane] = this.q;
    to[at + 4 + lane] = this.f4;
    to[at + 6 + lane] = this.f5;
    to[at + 8 + lane] = this.d5;
    to[at + 10 + lane] = this.p0;
    to[at + 12 + lane] = this.p1;
  }

  readPairState(from: Float64Array, at: number, lane: number): void {
    this.pb = from[at + lane];
    this.q = from[at + 2 + lane];
    this.f4 = from[at + 4 + lane];
    this.f5 = from[at + 6 + lane];
    this.d5 = from[at + 8 + lane];
    this.p0 = from[at + 10 + lane];
    this.p1 = from[at + 12 + lane];
  }

  override linearRows(t: LinearRowsTarget): void {
    super.linearRows(t);
    const n = t.n;
    t.a[3 * n + 4] = -1;
    t.m[4 * n + 4] = this.map;
    t.a[4 * n + 3] = 1;
    for (let k = 0; k < n; k++) t.c[k] += (t.kOut * t.a[4 * n + k]) / this.map;
  }

  protected admittance() {
    return { nb: [1, this.g * this.map, this.cab * this.map], db: [0, this.map] };
  }
}

/** A passive radiator's travel limit as a multiple of its Xmax (not in the design; an estimate). */
export const RADIATOR_XLIM_PER_XMAX = 2;

/**
 * A passive-radiator box: xp' = vp, Mmp·vp' = Sp·pb - Rmp·vp - Kmp(xp)·xp; its suspension stiffens
 * with the same default shape as a driver's, to its own travel limit (an end stop at RADIATOR_XLIM_PER_XMAX·Xmax).
 */
export class RadiatorChamber extends OneChamber {
  readonly states = 3;
  xp = 0;
  vp = 0;
  private f5 = 0;
  private f6 = 0;
  private kp1: number;
  private d6 = 0;
  private r6p = 0;
  private readonly mmpH: number;
  private readonly kmpC: Float64Array;
  private readonly xlimP: number;

  constructor(
    vb: number,
    ral: number,
    private readonly sp: number,
    private readonly mmp: number,
    private readonly kmp0: number,
    private readonly rmp: number,
    xmax: number,
    ctx: ChamberContext,
  ) {
    super(vb, ral, ctx);
    this.mmpH = mmp / ctx.h;
    this.xlimP = xmax * RADIATOR_XLIM_PER_XMAX;
    this.kmpC = ctx.linear ? Float64Array.of(1) : toPerMetre(fitDefaultNonlinear(xmax, this.xlimP).kmsRelPerMm);
    this.kp1 = kmp0;
  }

  override reset(): void {
    super.reset();
    this.xp = this.vp = this.f5 = this.f6 = 0;
    this.kp1 = this.kmp0;
  }

  override adopt(other: Chamber): void {
    super.adopt(other);
    if (other instanceof RadiatorChamber) {
      this.xp = other.xp;
      this.vp = other.vp;
    }
  }

  prepare(): void {
    const h = this.h,
      kp1 = this.kp1,
      sp = this.sp;
    const d6 = this.mmpH + TH * this.rmp + TT * h * kp1;
    const r6p = this.f6 - TH * h * kp1 * this.f5;
    const d4 = this.cabH + TH * this.g + (TT * sp * sp) / d6;
    const r4p = this.f4 - (TH * sp * r6p) / d6;
    this.d6 = d6;
    this.r6p = r6p;
    this.p0 = r4p / d4;
    this.p1 = (-TH * this.sd) / d4;
  }

  advance(dv: number): void {
    const dp = this.p0 + this.p1 * dv;
    this.pb += dp;
    const sp = this.sp;
    const dvp = (this.r6p + TH * sp * dp) / this.d6;
    this.vp += dvp;
    this.xp += this.h * (this.f5 + TH * dvp);
    // At the end stop the radiator sweeps no more air: the box pressure keeps step with it.
    const xlimP = this.xlimP;
    if (this.xp > xlimP) {
      this.pb += (sp * (this.xp - xlimP)) / this.cab;
      this.xp = xlimP;
      if (this.vp > 0) this.vp = 0;
    } else if (this.xp < -xlimP) {
      this.pb += (sp * (this.xp + xlimP)) / this.cab;
      this.xp = -xlimP;
      if (this.vp < 0) this.vp = 0;
    }
  }

  evaluate(v: number, dU: number): number {
    const xp = this.xp,
      vp = this.vp,
      sp = this.sp,
      pb = this.pb;
    const kmpC = this.kmpC;
    // A local number, not the module's constant: see the floors in sim/woofer.ts.
    const kmsFloor = +KMS_FLOOR;
    let kpr = 0,
      kpr1 = 0;
    for (let c = kmpC.length - 1; c >= 0; c--) {
      kpr1 = kpr1 * xp + kpr;
      kpr = kpr * xp + kmpC[c];
    }
    if (kpr < kmsFloor) {
      kpr = kmsFloor;
      kpr1 = 0;
    }
    this.f4 = -this.sd * v - sp * vp - this.g * pb;
    this.f5 = vp;
    this.f6 = sp * pb - this.rmp * vp - this.kmp0 * xp * kpr;
    this.kp1 = this.kmp0 * (kpr + xp * kpr1);
    return dU + (sp * this.f6) / this.mmp + this.gOverCab * this.f4;
  }

  override probe(): number {
    return this.xp;
  }

  override linearRows(t: LinearRowsTarget): void {
    super.linearRows(t);
    const n = t.n;
    t.a[3 * n + 5] = -this.sp;
    t.m[4 * n + 4] = 1;
    t.a[4 * n + 5] = 1;
    t.m[5 * n + 5] = this.mmp;
    t.a[5 * n + 3] = this.sp;
    t.a[5 * n + 4] = -this.kmp0;
    t.a[5 * n + 5] = -this.rmp;
    for (let k = 0; k < n; k++) t.c[k] += (t.kOut * this.sp * t.a[5 * n + k]) / this.mmp;
  }

  protected admittance() {
    // Yb = s·Cab + G + Sp^2·s/(s^2·Mmp + s·Rmp + Kmp) (Small 1974; Hurlburt 2000).
    const zr = [this.kmp0, this.rmp, this.mmp];
    const open = [this.g, this.cab];
    return { nb: polyAdd(polyMul(open, zr), [0, this.sp * this.sp]), db: zr };
  }
}
