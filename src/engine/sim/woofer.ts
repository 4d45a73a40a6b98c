// The large-signal woofer-in-box model, integrated with a fixed step.
//
//   Le(x)·i' = u - R(T)·i - Le'(x)·v·i - Bl(x)·v [- R2·(i - j)]          (electrical)
//   L2·j' = R2·(i - j)                   (optional semi-inductance: L2 ∥ R2 in series, j through L2)
//   x' = v
//   Mms·v' = Bl(x)·i - Rms·v - Kms(x)·x + Sd·P + ½·Le'(x)·i^2           (mechanical, reluctance force)
//   the box: its own states and rows, owned by its kind (box/physics.ts); P is the net pressure it
//   puts on the cone (back face minus front face)
//   far field: p = rho/(Omega·r)·dU/dt with U the radiated volume velocity (cone, outlet and leaks)
// (lumped-parameter large-signal model, JAES 54 (2006) 907-939; boxes, ports and leaks after Small).
//
// Numerics: a linearly implicit theta scheme on M(y)·y' = f(y, u) — one Newton step of the
// trapezoidal rule per sample (A-stable, second order), with the sparse rows eliminated by hand.
// The electrical row leans towards backward Euler only when Le/R is shorter than a step (there
// the trapezoidal rule would leave a slowly dying ringing at the Nyquist rate); with Le = 0 it is
// the algebraic constraint at the new point. For constant coefficients the scheme is exactly the
// recurrence in ./linear.ts, so the residual (nonlinear - linear) carries no discretisation error.
// The cone stops at Xlim (an inelastic end stop): it can never pass through its suspension.
// The block loop keeps the whole state in locals; f(y, u) and the Jacobian entries at the current
// state are carried between calls in fields.
import type { WooferParams } from './params.ts';
import type { Chamber } from '../box/index.ts';
import { BL_FLOOR, KMS_FLOOR, LE_FLOOR, MAX_COEFFICIENTS } from './nonlinear.ts';
import type { LadderSim } from './ladder.ts';
import { keepShape } from '../keep-shape.ts';

export class WooferSim {
  p: WooferParams;
  i = 0;
  /** Current through the semi-inductance L2, A (0 without one). */
  j = 0;
  x = 0;
  v = 0;
  /** The box's own states and rows. */
  chamber: Chamber;
  /** Coil and magnet temperature rises over ambient, K. */
  riseV = 0;
  riseM = 0;
  /** R = Re(T) + Rs, ohm. */
  r = 0;
  /** Output pressure at the seat for the current state, Pa. */
  out = 0;
  private u0 = 0;
  private f1 = 0;
  private f2 = 0;
  private f3 = 0;
  private fj = 0;
  private leNow = 0;
  private le1 = 0;
  private j12 = 0;
  private j13 = 0;
  private j31 = 0;
  private j32 = 0;
  private readonly one = new Float64Array(1);
  private readonly oneOut = new Float64Array(1);
  private readonly oneAux = new Float64Array(1);

  constructor(p: WooferParams) {
    this.p = p;
    this.chamber = p.newChamber();
    this.reset();
    keepShape(this);
  }

  /** New constants (a parameter edit); the physical state carries on (the box's, if it is of the same kind). */
  setParams(p: WooferParams): void {
    this.p = p;
    this.r = p.re0 * (1 + p.alphaR * this.riseV) + p.rs;
    const chamber = p.newChamber();
    chamber.adopt(this.chamber);
    this.chamber = chamber;
  }

  /** Back to rest: f(y, u) and the Jacobian at rest follow from the parameters directly. */
  reset(): void {
    const p = this.p;
    this.i = this.j = this.fj = this.x = this.v = 0;
    this.chamber.reset();
    this.riseV = this.riseM = 0;
    this.r = p.re0 + p.rs;
    this.u0 = this.f1 = this.f2 = this.f3 = 0;
    this.leNow = p.le0;
    this.le1 = p.le0 > 0 && p.leC.length > 1 ? p.le0 * p.leC[1] : 0;
    this.j12 = 0;
    this.j13 = -p.bl0;
    this.j31 = p.bl0;
    this.j32 = -p.k0;
    this.out = 0;
  }

  /** Coil rise from the thermal network; R follows. */
  setCoilRise(riseV: number, riseM: number): void {
    this.riseV = riseV;
    this.riseM = riseM;
    const p = this.p;
    this.r = p.re0 * (1 + p.alphaR * riseV) + p.rs;
  }

  /**
   * For the two-lane loop (./woofer-pair.ts): the model's constants [h, te, R, Mms/h, Rms, Sd, Bl0,
   * K0, Le0, Xlim, kOut, 1/Mms, the three floors, then Bl's, Kms's and Le's nine coefficients each,
   * 0 past their ends], as processBlock computes them, to `at + 2·j + lane` of an array. R (j = 2)
   * changes as the coil heats: `pairR`.
   */
  writePairConstants(to: Float64Array, at: number, lane: number): void {
    const p = this.p;
    const head = [
      p.h,
      p.thetaE,
      this.r,
      p.mms / p.h,
      p.rms,
      p.sd,
      p.bl0,
      p.k0,
      p.le0,
      p.xlim,
      p.kOut,
      1 / p.mms,
      +BL_FLOOR,
      +KMS_FLOOR,
      +LE_FLOOR,
    ];
    let j = 0;
    for (const value of head) to[at + 2 * j++ + lane] = value;
    for (const c of [p.blC, p.kmsC, p.leC]) for (let t = 0; t <= MAX_COEFFICIENTS; t++) to[at + 2 * j++ + lane] = c[t] ?? 0;
  }

  /** Index of R among writePairConstants' values. */
  static readonly pairR = 2;

  /** The model's state [i, x, v, u0, f1, f2, f3, Le(x), Le'(x), j12, j13, j31, j32, out] for the two-lane loop. */
  writePairState(to: Float64Array, at: number, lane: number): void {
    const o = at + lane;
    to[o] = this.i;
    to[o + 2] = this.x;
    to[o + 4] = this.v;
    to[o + 6] = this.u0;
    to[o + 8] = this.f1;
    to[o + 10] = this.f2;
    to[o + 12] = this.f3;
    to[o + 14] = this.leNow;
    to[o + 16] = this.le1;
    to[o + 18] = this.j12;
    to[o + 20] = this.j13;
    to[o + 22] = this.j31;
    to[o + 24] = this.j32;
    to[o + 26] = this.out;
  }

  /** The state back from the two-lane loop (writePairState's order). */
  readPairState(from: Float64Array, at: number, lane: number): void {
    const o = at + lane;
    this.i = from[o];
    this.x = from[o + 2];
    this.v = from[o + 4];
    this.u0 = from[o + 6];
    this.f1 = from[o + 8];
    this.f2 = from[o + 10];
    this.f3 = from[o + 12];
    this.leNow = from[o + 14];
    this.le1 = from[o + 16];
    this.j12 = from[o + 18];
    this.j13 = from[o + 20];
    this.j31 = from[o + 22];
    this.j32 = from[o + 24];
    this.out = from[o + 26];
  }

  /** One step to input u1 (volts of amplifier EMF); returns the seat pressure, Pa. */
  step(u1: number): number {
    this.one[0] = u1;
    this.processBlock(this.one, 1, this.oneOut, this.oneAux);
    return this.oneOut[0];
  }

  /**
   * n steps. u[k] volts in; pOut[k] seat pressure (Pa); aux[k] the cone excursion (m).
   * Returns the sum of i^2 over the block (for the coil's heating).
   * With a passive network `net`, u[k] is the amplifier's EMF and the network, seen from the
   * terminals, is a Thevenin source each step: u = its Vth, and its Rth is in the parameters' rs.
   */
  processBlock(u: Float64Array, n: number, pOut: Float64Array, aux: Float64Array, portOut?: Float64Array, net?: LadderSim): number {
    const p = this.p;
    const box = this.chamber;
    const h = p.h,
      th = 0.5,
      te = p.thetaE,
      tt = th * th;
    const R = this.r,
      mms = p.mms,
      rms = p.rms,
      sd = p.sd;
    const bl0 = p.bl0,
      k0 = p.k0,
      le0 = p.le0,
      xlim = p.xlim,
      kOut = p.kOut;
    // Each polynomial's coefficients as locals (0 past its end; toPerMetre allows at most nine), and
    // Horner's rule below unrolled as a chain of ifs from the top term down: the same operations in
    // the same order as a loop over the array, so the same bits, but about a fifth less time per step
    // (no loop counter or bounds checks; vented example, 54 against 44 ns).
    const blC = p.blC,
      kmsC = p.kmsC,
      leC = p.leC;
    const nBl = blC.length,
      nK = kmsC.length,
      nL = leC.length;
    const b0 = blC[0],
      b1 = blC[1] ?? 0,
      b2 = blC[2] ?? 0,
      b3 = blC[3] ?? 0,
      b4 = blC[4] ?? 0,
      b5 = blC[5] ?? 0,
      b6 = blC[6] ?? 0,
      b7 = blC[7] ?? 0,
      b8 = blC[8] ?? 0;
    const k0c = kmsC[0],
      k1 = kmsC[1] ?? 0,
      k2 = kmsC[2] ?? 0,
      k3 = kmsC[3] ?? 0,
      k4 = kmsC[4] ?? 0,
      k5 = kmsC[5] ?? 0,
      k6 = kmsC[6] ?? 0,
      k7 = kmsC[7] ?? 0,
      k8 = kmsC[8] ?? 0;
    const e0 = leC[0],
      e1 = leC[1] ?? 0,
      e2 = leC[2] ?? 0,
      e3 = leC[3] ?? 0,
      e4 = leC[4] ?? 0,
      e5 = leC[5] ?? 0,
      e6 = leC[6] ?? 0,
      e7 = leC[7] ?? 0,
      e8 = leC[8] ?? 0;
    const invMms = 1 / mms;
    const mms_h = mms / h;
    const hasLe = le0 > 0;
    const l2 = p.l2,
      r2 = p.r2,
      hasL2 = l2 > 0;
    // The L2 row has its own weight: trapezoidal unless L2/R2 is shorter than a step.
    const tj = hasL2 ? Math.max(0.5, 1 - l2 / r2 / h) : 0.5;
    const dj = hasL2 ? l2 / h + tj * r2 : 1;
    const jGain = hasL2 ? (tj * r2) / dj : 0;
    const coneRadiates = box.coneRadiates;
    // The floors as local numbers. Bundled, a module's constant becomes a `var` of unknown type,
    // and merging one with a computed value (bl = blFloor) made the optimiser box the loop's
    // values as heap numbers: about 1.4 GB of garbage in a 5-minute stereo render.
    const blFloor = +BL_FLOOR,
      kmsFloor = +KMS_FLOOR,
      leFloor = +LE_FLOOR;
    let j = this.j,
      fj = this.fj;
    let i = this.i,
      x = this.x,
      v = this.v;
    let u0 = this.u0,
      f1 = this.f1,
      f2 = this.f2,
      f3 = this.f3;
    let leNow = this.leNow,
      le1 = this.le1,
      j12 = this.j12,
      j13 = this.j13,
      j31 = this.j31,
      j32 = this.j32;
    let i2 = 0,
      out = this.out;
    for (let k = 0; k < n; k++) {
      const u1 = net === undefined ? u[k] : net.thevenin(u[k]);
      // --- the step: (M/h - Theta·J)·Δ = f + Theta·b·Δu, rows eliminated by hand; the box's by its chamber ---
      const r1 = f1 + te * (u1 - u0);
      box.prepare();
      const P0 = box.p0,
        P1 = box.p1;
      let d1 = leNow / h + te * (R + le1 * v);
      let r1j = r1;
      if (hasL2) {
        // The L2 row, Δj = (fj + tj·R2·Δi)/dj, eliminated into the electrical row.
        d1 += te * r2 * (1 - jGain);
        r1j += (te * r2 * fj) / dj;
      }
      if (d1 < 1e-9) d1 = 1e-9;
      const I0 = (r1j + te * j12 * h * f2) / d1;
      const I1 = (te * (j12 * h * th + j13)) / d1;
      const dv = (f3 + th * j31 * I0 + th * j32 * h * f2 + th * sd * P0) / (mms_h + th * rms - th * j31 * I1 - tt * h * j32 - th * sd * P1);
      const di = I0 + I1 * dv;
      i += di;
      if (hasL2) j += (fj + tj * r2 * di) / dj;
      x += h * (f2 + th * dv);
      v += dv;
      box.advance(dv);
      if (x > xlim) {
        box.coneStopped(sd * (x - xlim));
        x = xlim;
        if (v > 0) v = 0;
      } else if (x < -xlim) {
        box.coneStopped(sd * (x + xlim));
        x = -xlim;
        if (v < 0) v = 0;
      }
      i2 += i * i;
      // --- f(y, u) and the Jacobian at the new state ---
      let bl = 0,
        bl1 = 0;
      if (nBl > 8) {
        bl1 = bl1 * x + bl;
        bl = bl * x + b8;
      }
      if (nBl > 7) {
        bl1 = bl1 * x + bl;
        bl = bl * x + b7;
      }
      if (nBl > 6) {
        bl1 = bl1 * x + bl;
        bl = bl * x + b6;
      }
      if (nBl > 5) {
        bl1 = bl1 * x + bl;
        bl = bl * x + b5;
      }
      if (nBl > 4) {
        bl1 = bl1 * x + bl;
        bl = bl * x + b4;
      }
      if (nBl > 3) {
        bl1 = bl1 * x + bl;
        bl = bl * x + b3;
      }
      if (nBl > 2) {
        bl1 = bl1 * x + bl;
        bl = bl * x + b2;
      }
      if (nBl > 1) {
        bl1 = bl1 * x + bl;
        bl = bl * x + b1;
      }
      bl1 = bl1 * x + bl;
      bl = bl * x + b0;
      if (bl < blFloor) {
        bl = blFloor;
        bl1 = 0;
      }
      bl *= bl0;
      bl1 *= bl0;
      let kr = 0,
        kr1 = 0;
      if (nK > 8) {
        kr1 = kr1 * x + kr;
        kr = kr * x + k8;
      }
      if (nK > 7) {
        kr1 = kr1 * x + kr;
        kr = kr * x + k7;
      }
      if (nK > 6) {
        kr1 = kr1 * x + kr;
        kr = kr * x + k6;
      }
      if (nK > 5) {
        kr1 = kr1 * x + kr;
        kr = kr * x + k5;
      }
      if (nK > 4) {
        kr1 = kr1 * x + kr;
        kr = kr * x + k4;
      }
      if (nK > 3) {
        kr1 = kr1 * x + kr;
        kr = kr * x + k3;
      }
      if (nK > 2) {
        kr1 = kr1 * x + kr;
        kr = kr * x + k2;
      }
      if (nK > 1) {
        kr1 = kr1 * x + kr;
        kr = kr * x + k1;
      }
      kr1 = kr1 * x + kr;
      kr = kr * x + k0c;
      if (kr < kmsFloor) {
        kr = kmsFloor;
        kr1 = 0;
      }
      const fk = k0 * x * kr;
      const fk1 = k0 * (kr + x * kr1);
      let le2 = 0,
        lrel1 = 0;
      if (hasLe) {
        let lr = 0,
          l1 = 0,
          l2 = 0;
        if (nL > 8) {
          l2 = l2 * x + 2 * l1;
          l1 = l1 * x + lr;
          lr = lr * x + e8;
        }
        if (nL > 7) {
          l2 = l2 * x + 2 * l1;
          l1 = l1 * x + lr;
          lr = lr * x + e7;
        }
        if (nL > 6) {
          l2 = l2 * x + 2 * l1;
          l1 = l1 * x + lr;
          lr = lr * x + e6;
        }
        if (nL > 5) {
          l2 = l2 * x + 2 * l1;
          l1 = l1 * x + lr;
          lr = lr * x + e5;
        }
        if (nL > 4) {
          l2 = l2 * x + 2 * l1;
          l1 = l1 * x + lr;
          lr = lr * x + e4;
        }
        if (nL > 3) {
          l2 = l2 * x + 2 * l1;
          l1 = l1 * x + lr;
          lr = lr * x + e3;
        }
        if (nL > 2) {
          l2 = l2 * x + 2 * l1;
          l1 = l1 * x + lr;
          lr = lr * x + e2;
        }
        if (nL > 1) {
          l2 = l2 * x + 2 * l1;
          l1 = l1 * x + lr;
          lr = lr * x + e1;
        }
        l2 = l2 * x + 2 * l1;
        l1 = l1 * x + lr;
        lr = lr * x + e0;
        if (lr < leFloor) {
          lr = leFloor;
          l1 = 0;
          l2 = 0;
        }
        leNow = le0 * lr;
        le1 = le0 * l1;
        le2 = le0 * l2;
        lrel1 = l1 / lr;
      }
      f1 = u1 - R * i - le1 * v * i - bl * v;
      if (hasL2) {
        fj = r2 * (i - j);
        f1 -= fj;
      }
      f2 = v;
      f3 = bl * i - rms * v - fk + sd * box.net() + 0.5 * le1 * i * i;
      // d/dx of the electrical row, with the mass-matrix term Le'(x)·i' folded in.
      j12 = -v * (i * le2 + bl1) - f1 * lrel1;
      j13 = -(le1 * i + bl);
      j31 = bl + le1 * i;
      j32 = bl1 * i - fk1 + 0.5 * le2 * i * i;
      const dU = box.evaluate(v, coneRadiates ? sd * f3 * invMms : 0);
      if (portOut) portOut[k] = box.probe();
      out = kOut * dU;
      pOut[k] = out;
      aux[k] = x;
      u0 = u1;
      if (net !== undefined) net.advance(i);
    }
    this.i = i;
    this.j = j;
    this.fj = fj;
    this.x = x;
    this.v = v;
    this.u0 = u0;
    this.f1 = f1;
    this.f2 = f2;
    this.f3 = f3;
    this.leNow = leNow;
    this.le1 = le1;
    this.j12 = j12;
    this.j13 = j13;
    this.j31 = j31;
    this.j32 = j32;
    this.out = out;
    return i2;
  }
}
