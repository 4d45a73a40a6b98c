// The large-signal woofer-in-box model, one fixed step per call.
//
//   Le(x)·i' = u - R(T)·i - Le'(x)·v·i - Bl(x)·v                       (electrical)
//   x' = v
//   Mms·v' = Bl(x)·i - Rms·v - Kms(x)·x + Sd·pb + ½·Le'(x)·i^2            (mechanical, reluctance force)
//   Cab·pb' = -Sd·v - Up - pb/Ral      (sealed: Up = 0; radiator: Up = Sp·vp)
//   Map·Up' = pb - ½·rho·K·(Up/Sv)·|Up/Sv|·Sv·... (port loss Δp = ½·rho·K·u·|u|, u = Up/Sv)
//   radiator: xp' = vp, Mmp·vp' = Sp·pb - Rmp·vp - Kmp(xp)·xp
//   far field: p = rho/(Omega·r)·dU/dt, U = Sd·v + Up (or + Sp·vp)
// (lumped-parameter large-signal model, JAES 54 (2006) 907-939; box and port after Small/Thiele).
//
// Numerics: a linearly implicit theta scheme on M(y)·y' = f(y, u): one Newton step per sample of
// the trapezoidal rule (A-stable, second order), solved by eliminating the sparse rows by hand.
// The electrical row leans towards backward Euler only when Le/R is shorter than a step (then the
// trapezoidal rule would leave a slowly dying ringing at the Nyquist rate); with Le = 0 it becomes
// the algebraic constraint at the new point. For constant coefficients the scheme is exactly the
// recurrence in ./linear.ts, so the residual (nonlinear - linear) is free of discretisation error.
// The cone stops at Xlim (an inelastic end stop): it can never pass through its suspension.
import { BOX_RADIATOR, BOX_SEALED, BOX_VENTED, type WooferParams } from './params.ts';
import { polyWithDerivatives } from './nonlinear.ts';
import { BL_FLOOR, KMS_FLOOR, LE_FLOOR } from './nonlinear.ts';

export class WooferSim {
  p: WooferParams;
  // State.
  i = 0;
  x = 0;
  v = 0;
  pb = 0;
  q = 0;
  xp = 0;
  vp = 0;
  /** Coil and magnet temperature rises over ambient, K. */
  riseV = 0;
  riseM = 0;
  /** R = Re(T) + Rs, ohm. */
  r = 0;
  /** Running sum of i^2 since the last thermal update, and its count. */
  i2Sum = 0;
  i2Count = 0;
  /** Last input, and f(y, u), the Jacobian entries and the output at the current state. */
  private u0 = 0;
  private f1 = 0;
  private f2 = 0;
  private f3 = 0;
  private f4 = 0;
  private f5 = 0;
  private f6 = 0;
  private leNow = 0;
  private le1 = 0;
  private j12 = 0;
  private j13 = 0;
  private j31 = 0;
  private j32 = 0;
  private kp1 = 0;
  /** Output pressure at the seat, Pa (for the current state). */
  out = 0;
  /** Whether the last step hit the end stop. */
  stopped = false;
  private readonly poly = new Float64Array(3);

  constructor(p: WooferParams) {
    this.p = p;
    this.r = p.re0 + p.rs;
    this.evaluate(0);
  }

  /** New constants (a parameter edit); the state is kept. */
  setParams(p: WooferParams): void {
    this.p = p;
    this.r = p.re0 * (1 + p.alphaR * this.riseV) + p.rs;
    if (p.boxCode !== BOX_VENTED) this.q = 0;
    if (p.boxCode !== BOX_RADIATOR) {
      this.xp = 0;
      this.vp = 0;
    }
    this.evaluate(this.u0);
  }

  reset(): void {
    this.i = this.x = this.v = this.pb = this.q = this.xp = this.vp = 0;
    this.riseV = this.riseM = 0;
    this.i2Sum = 0;
    this.i2Count = 0;
    this.r = this.p.re0 + this.p.rs;
    this.evaluate(0);
  }

  /** Sets the coil rise (from the thermal network); R follows. */
  setCoilRise(riseV: number, riseM: number): void {
    this.riseV = riseV;
    this.riseM = riseM;
    const p = this.p;
    this.r = p.re0 * (1 + p.alphaR * riseV) + p.rs;
  }

  /** f(y, u) and the Jacobian entries that are not constant, at the current state. */
  private evaluate(u: number): void {
    const p = this.p;
    const poly = this.poly;
    const i = this.i, v = this.v;
    const x = this.x > p.xlim ? p.xlim : this.x < -p.xlim ? -p.xlim : this.x;
    polyWithDerivatives(p.blC, x, poly);
    let bl = poly[0], bl1 = poly[1];
    if (bl < BL_FLOOR) {
      bl = BL_FLOOR;
      bl1 = 0;
    }
    bl *= p.bl0;
    bl1 *= p.bl0;
    polyWithDerivatives(p.kmsC, x, poly);
    let kr = poly[0], kr1 = poly[1];
    if (kr < KMS_FLOOR) {
      kr = KMS_FLOOR;
      kr1 = 0;
    }
    const fk = p.k0 * x * kr;
    const fk1 = p.k0 * (kr + x * kr1);
    let le = 0, le1 = 0, le2 = 0, lrel1 = 0;
    if (p.le0 > 0) {
      polyWithDerivatives(p.leC, x, poly);
      let lr = poly[0];
      lrel1 = poly[1];
      let lr2 = poly[2];
      if (lr < LE_FLOOR) {
        lr = LE_FLOOR;
        lrel1 = 0;
        lr2 = 0;
      }
      le = p.le0 * lr;
      le1 = p.le0 * lrel1;
      le2 = p.le0 * lr2;
      lrel1 /= lr;
    }
    const f1 = u - this.r * i - le1 * v * i - bl * v;
    this.f1 = f1;
    this.f2 = v;
    this.f3 = bl * i - p.rms * v - fk + p.sd * this.pb + 0.5 * le1 * i * i;
    this.leNow = le;
    this.le1 = le1;
    // d/dx of the electrical row, with the mass-matrix term Le'(x)·i' moved into it.
    this.j12 = -v * (i * le2 + bl1) - f1 * lrel1;
    this.j13 = -(le1 * i + bl);
    this.j31 = bl + le1 * i;
    this.j32 = bl1 * i - fk1 + 0.5 * le2 * i * i;
    let dU = (p.sd * this.f3) / p.mms;
    if (p.boxCode === BOX_VENTED) {
      this.f4 = -p.sd * v - this.q - p.g * this.pb;
      this.f5 = this.pb - p.portLoss * this.q * (this.q < 0 ? -this.q : this.q);
      dU += this.f5 / p.map;
    } else if (p.boxCode === BOX_RADIATOR) {
      const xpc = this.xp > p.xlimP ? p.xlimP : this.xp < -p.xlimP ? -p.xlimP : this.xp;
      polyWithDerivatives(p.kmpC, xpc, poly);
      let kpr = poly[0], kpr1 = poly[1];
      if (kpr < KMS_FLOOR) {
        kpr = KMS_FLOOR;
        kpr1 = 0;
      }
      this.f4 = -p.sd * v - p.sp * this.vp - p.g * this.pb;
      this.f5 = this.vp;
      this.f6 = p.sp * this.pb - p.rmp * this.vp - p.kmp0 * xpc * kpr;
      this.kp1 = p.kmp0 * (kpr + xpc * kpr1);
      dU += (p.sp * this.f6) / p.mmp;
    } else {
      this.f4 = -p.sd * v - p.g * this.pb;
    }
    this.out = p.kOut * dU;
    this.u0 = u;
  }

  /** Advances one step to the new input voltage u1 (V at the amplifier's EMF); returns the seat pressure, Pa. */
  step(u1: number): number {
    const p = this.p;
    const h = p.h, th = 0.5, te = p.thetaE;
    const r1 = this.f1 + te * (u1 - this.u0);
    const r2 = this.f2, r3 = this.f3, r4 = this.f4, r5 = this.f5;
    let d4: number, r4p: number, d5 = 1, d6 = 1, r6p = 0;
    const box = p.boxCode;
    if (box === BOX_VENTED) {
      d5 = p.map / h + th * 2 * p.portLoss * (this.q < 0 ? -this.q : this.q);
      d4 = p.cab / h + th * p.g + (th * th) / d5;
      r4p = r4 - (th * r5) / d5;
    } else if (box === BOX_RADIATOR) {
      d6 = p.mmp / h + th * p.rmp + th * th * h * this.kp1;
      r6p = this.f6 - th * h * this.kp1 * r5;
      d4 = p.cab / h + th * p.g + (th * th * p.sp * p.sp) / d6;
      r4p = r4 - (th * p.sp * r6p) / d6;
    } else {
      d4 = p.cab / h + th * p.g;
      r4p = r4;
    }
    const P0 = r4p / d4, P1 = (-th * p.sd) / d4;
    let d1 = this.leNow / h + te * (this.r + this.le1 * this.v);
    if (d1 < 1e-9) d1 = 1e-9;
    const j12 = this.j12, j13 = this.j13, j31 = this.j31, j32 = this.j32;
    const I0 = (r1 + te * j12 * h * r2) / d1;
    const I1 = (te * (j12 * h * th + j13)) / d1;
    const dv =
      (r3 + th * j31 * I0 + th * j32 * h * r2 + th * p.sd * P0) /
      (p.mms / h + th * p.rms - th * j31 * I1 - th * th * h * j32 - th * p.sd * P1);
    const dx = h * (r2 + th * dv);
    const dp = P0 + P1 * dv;
    this.i += I0 + I1 * dv;
    this.x += dx;
    this.v += dv;
    this.pb += dp;
    if (box === BOX_VENTED) {
      this.q += (r5 + th * dp) / d5;
    } else if (box === BOX_RADIATOR) {
      const dvp = (r6p + th * p.sp * dp) / d6;
      this.vp += dvp;
      this.xp += h * (r5 + th * dvp);
      if (this.xp > p.xlimP) {
        this.xp = p.xlimP;
        if (this.vp > 0) this.vp = 0;
      } else if (this.xp < -p.xlimP) {
        this.xp = -p.xlimP;
        if (this.vp < 0) this.vp = 0;
      }
    }
    this.stopped = false;
    if (this.x > p.xlim) {
      this.x = p.xlim;
      if (this.v > 0) this.v = 0;
      this.stopped = true;
    } else if (this.x < -p.xlim) {
      this.x = -p.xlim;
      if (this.v < 0) this.v = 0;
      this.stopped = true;
    }
    this.i2Sum += this.i * this.i;
    this.i2Count++;
    this.evaluate(u1);
    return this.out;
  }

  /** Port air speed, m/s (vented), radiator excursion is `xp`. */
  portSpeed(): number {
    return this.p.boxCode === BOX_VENTED ? this.q / this.p.sv : 0;
  }

  /** True when the model is back at rest (all states negligible). */
  atRest(tol = 1e-12): boolean {
    return Math.abs(this.x) < tol && Math.abs(this.v) < tol && Math.abs(this.i) < tol && Math.abs(this.pb) < tol * 1e6;
  }
}

export { BOX_SEALED };
