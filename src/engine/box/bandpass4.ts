// A fourth-order bandpass box: the driver between a sealed rear chamber and a vented front chamber;
// only the front chamber's port (and the leaks) radiate. Acoustic circuit (signs as everywhere:
// the cone moves outward into the front chamber; pressures over ambient):
//   Cr·pr' = -Sd·v - Gr·pr                 (rear: the cone moving out enlarges it)
//   Cf·pf' =  Sd·v - Up - Gf·pf            (front)
//   Map·Up' = pf - ½·rho·K·u·|u|, u = Up/Sv (port, with the same loss as a vented box's)
//   force on the cone Sd·(pr - pf); radiated U = Up + Gf·pf + Gr·pr.
// Tuning: the front chamber with its port, fb = 1/(2 pi·sqrt(Map·Cf)); losses by Small's QL at fb.
import * as v from 'valibot';
import { num, portsSchema, qlSchema, volumeSchema } from '../design/schema.ts';
import { add, cx, inv, mul, scale } from '../complex.ts';
import { polyAdd, polyMul, polyScale } from '../filters/analog.ts';
import { error, fmt, type Issue } from '../issues.ts';
import { PORT_SPEED_LIMIT } from '../units.ts';
import { boxCompliance, DEFAULT_QL, leakageResistance } from './common.ts';
import type { BoxAcoustics, Chamber, ChamberContext, LinearRowsTarget } from './physics.ts';
import type { BoxKind } from './types.ts';
import { pipeResonanceHz, portGeometry, portLengthFor, portsLossK } from './vented.ts';
import { keepShape } from '../keep-shape.ts';

export interface Bandpass4Box {
  type: 'bandpass4';
  /** Both chambers, m^3. */
  vb: number;
  vbNet: number;
  vbRear: number;
  vbFront: number;
  /** Leakage resistances of the rear and front chambers, Pa·s/m^3 (Infinity = lossless). */
  ralRear: number;
  ralFront: number;
  ql: number | null;
  fb: number;
  /** Total port area, m^2, and the physical length of one port, m. */
  sv: number;
  portLength: number;
  /** Acoustic mass of all ports together, kg/m^4. */
  map: number;
  /** Effective length of one port, m, and the loss coefficient of the ports' ends. */
  portLeff: number;
  portLossK: number;
}

const schema = v.strictObject({
  type: v.literal('bandpass4'),
  vb_rear_l: volumeSchema,
  vb_front_l: volumeSchema,
  fb_hz: num(5, 2000, 'Hz'),
  ql: qlSchema,
  ports: portsSchema,
});

const TH = 0.5;
const TT = TH * TH;
const conductance = (ral: number) => (Number.isFinite(ral) && ral > 0 ? 1 / ral : 0);

class BandpassChambers implements Chamber {
  readonly states = 3;
  readonly coneRadiates = false;
  p0 = 0;
  p1 = 0;
  pr = 0;
  pf = 0;
  q = 0;
  private fr = 0;
  private ff = 0;
  private fq = 0;
  private dr = 0;
  private df = 0;
  private dq = 0;
  private f0 = 0;
  private readonly cr: number;
  private readonly cf: number;
  private readonly gr: number;
  private readonly gf: number;
  private readonly map: number;
  private readonly sd: number;
  private readonly h: number;
  private readonly portLoss: number;

  constructor(box: Bandpass4Box, ctx: ChamberContext) {
    const k = ctx.rho * ctx.c * ctx.c;
    this.cr = box.vbRear / k;
    this.cf = box.vbFront / k;
    this.gr = conductance(box.ralRear);
    this.gf = conductance(box.ralFront);
    this.map = box.map;
    this.sd = ctx.sd;
    this.h = ctx.h;
    this.portLoss = ctx.linear ? 0 : (0.5 * ctx.rho * (ctx.portLossK ?? box.portLossK)) / (box.sv * box.sv);
    keepShape(this);
  }

  reset(): void {
    this.pr = this.pf = this.q = this.fr = this.ff = this.fq = this.p0 = this.p1 = 0;
  }

  adopt(other: Chamber): void {
    if (other instanceof BandpassChambers) {
      this.pr = other.pr;
      this.pf = other.pf;
      this.q = other.q;
    }
  }

  prepare(): void {
    const h = this.h,
      sd = this.sd,
      q = this.q;
    this.dr = this.cr / h + TH * this.gr;
    this.dq = this.map / h + TH * 2 * this.portLoss * (q < 0 ? -q : q);
    this.df = this.cf / h + TH * this.gf + TT / this.dq;
    // dpr = (fr - th·Sd·dv)/dr; dpf = f0 + th·Sd·dv/df; dP = dpr - dpf.
    this.f0 = (this.ff - (TH * this.fq) / this.dq) / this.df;
    this.p0 = this.fr / this.dr - this.f0;
    this.p1 = (-TH * sd) / this.dr - (TH * sd) / this.df;
  }

  advance(dv: number): void {
    const dpf = this.f0 + ((TH * this.sd) / this.df) * dv;
    this.pr += (this.fr - TH * this.sd * dv) / this.dr;
    this.pf += dpf;
    this.q += (this.fq + TH * dpf) / this.dq;
  }

  coneStopped(volume: number): void {
    this.pr += volume / this.cr;
    this.pf -= volume / this.cf;
  }

  net(): number {
    return this.pr - this.pf;
  }

  evaluate(v: number, dU: number): number {
    const q = this.q;
    this.fr = -this.sd * v - this.gr * this.pr;
    this.ff = this.sd * v - q - this.gf * this.pf;
    this.fq = this.pf - this.portLoss * q * (q < 0 ? -q : q);
    return dU + this.fq / this.map + (this.gf * this.ff) / this.cf + (this.gr * this.fr) / this.cr;
  }

  probe(): number {
    return this.q;
  }

  linearRows(t: LinearRowsTarget): void {
    const n = t.n,
      sd = this.sd;
    // States [.., pr, pf, Up] at 3, 4, 5.
    t.a[2 * n + 3] = sd;
    t.a[2 * n + 4] = -sd;
    t.m[3 * n + 3] = this.cr;
    t.a[3 * n + 2] = -sd;
    t.a[3 * n + 3] = -this.gr;
    t.m[4 * n + 4] = this.cf;
    t.a[4 * n + 2] = sd;
    t.a[4 * n + 4] = -this.gf;
    t.a[4 * n + 5] = -1;
    t.m[5 * n + 5] = this.map;
    t.a[5 * n + 4] = 1;
    for (let k = 0; k < n; k++) t.c[k] += (t.kOut * t.a[5 * n + k]) / this.map;
  }

  leakOut(t: LinearRowsTarget, k: number): number {
    const n = t.n;
    return t.kOut * ((this.gf * t.a[4 * n + k]) / this.cf + (this.gr * t.a[3 * n + k]) / this.cr);
  }

  transfer() {
    // Zr = 1/(s·Cr + Gr); Zf = s·Map/Df with Df = s^2·Cf·Map + s·Gf·Map + 1.
    const dr = [this.gr, this.cr];
    const df = [1, this.gf * this.map, this.cf * this.map];
    const dz = polyMul(dr, df);
    const nz = polyAdd(df, polyMul([0, this.map], dr));
    // Radiated per cone flow: Zf·(1/(s·Map) + Gf) - Gr·Zr = (1 + s·Gf·Map)/Df - Gr/(s·Cr + Gr).
    const nr = polyAdd(polyMul([1, this.gf * this.map], dr), polyScale(df, -this.gr));
    return { nz, dz, nr };
  }
}

export const bandpass4: BoxKind<typeof schema, Bandpass4Box> = {
  type: 'bandpass4',
  label: 'Bandpass (4th order)',
  schema,
  build(doc, { air }, path) {
    const issues: Issue[] = [];
    const vbRear = doc.vb_rear_l / 1000;
    const vbFront = doc.vb_front_l / 1000;
    const ql = doc.ql === undefined ? DEFAULT_QL : doc.ql;
    const geoms = doc.ports.map(portGeometry);
    const sv = geoms.reduce((s, g) => s + g.area * g.count, 0);
    const length = portLengthFor(geoms, vbFront, doc.fb_hz, air.c);
    if (length <= 0) {
      issues.push(
        error(
          `${path}.ports`,
          `ports of ${fmt(sv * 1e4)} cm² cannot tune the ${fmt(doc.vb_front_l)} l front chamber to ${fmt(doc.fb_hz)} Hz; use a larger port area`,
        ),
      );
      return { box: null, issues };
    }
    if (sv * length >= vbFront) {
      issues.push(
        error(`${path}.ports`, `the ports (${fmt(sv * length * 1000)} l) are larger than the ${fmt(doc.vb_front_l)} l front chamber`),
      );
      return { box: null, issues };
    }
    const wb = 2 * Math.PI * doc.fb_hz;
    const cf = boxCompliance(vbFront, air);
    const box: Bandpass4Box = {
      type: 'bandpass4',
      vb: vbRear + vbFront,
      vbNet: vbRear + vbFront,
      vbRear,
      vbFront,
      ralRear: leakageResistance(ql, wb, boxCompliance(vbRear, air)),
      ralFront: leakageResistance(ql, wb, cf),
      ql,
      fb: doc.fb_hz,
      sv,
      portLength: length,
      map: 1 / (wb * wb * cf),
      portLeff: length + geoms[0].endCorrection,
      portLossK: portsLossK(geoms),
    };
    return { box, issues };
  },
  acoustics(box, air, w): BoxAcoustics {
    const zr = inv(cx(conductance(box.ralRear), w * boxCompliance(box.vbRear, air)));
    const yPort = inv(cx(0, w * box.map));
    const zf = inv(add(cx(conductance(box.ralFront), w * boxCompliance(box.vbFront, air)), yPort));
    const leak = add(scale(zf, conductance(box.ralFront)), scale(zr, -conductance(box.ralRear)));
    return { zLoad: add(zr, zf), cone: 0, outlet: mul(yPort, zf), leak, chamber: zf };
  },
  chamber: (box, ctx) => new BandpassChambers(box, ctx),
  // Port air speed over about 17 m/s (common practice, roughly 5% of c).
  probe: (box) => ({ kind: 'port-speed', toUnit: 1 / box.sv, limit: PORT_SPEED_LIMIT }),
  figures: (box, air) => [
    { id: 'fb', label: 'Front chamber tuning fb', value: box.fb, unit: 'Hz' },
    { id: 'port-length', label: 'Port length (each)', value: box.portLength * 100, unit: 'cm' },
    { id: 'pipe-resonance', label: 'Port pipe resonance', value: pipeResonanceHz(air.c, box.portLeff), unit: 'Hz' },
    {
      id: 'volumes',
      label: 'Rear / front chamber',
      value: box.vbRear * 1000,
      unit: `l / ${Number((box.vbFront * 1000).toPrecision(3))} l`,
    },
  ],
};
