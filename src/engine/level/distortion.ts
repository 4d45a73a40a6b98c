// The sliding-window measures behind the `distortion` and output `compression` stress events.
//
// The residual (nonlinear minus linear output) holds two things: a change of the linear output
// itself (level and phase: port compression, a stiffening suspension at the fundamental) and new
// content (harmonics, intermodulation). Per window the residual is fitted by least squares on the
// linear output u and its first difference d = u[k] - u[k-1] (together they span any gain and
// phase change of a narrow band); the fitted part is the coherent change, reported as compression
// in dB, and only what is left counts as distortion. Every average is a one-pole filter with the
// same time constant, so all the figures describe the same window.

import { keepShape } from '../keep-shape.ts';
import { hypot } from '../complex.ts';

export class ResidualMeter {
  private readonly alpha: number;
  eOut = 0;
  eRes = 0;
  /** Sliding averages of u·u, u·d, d·d, u·r, d·r. */
  private uu = 0;
  private ud = 0;
  private dd = 0;
  private ur = 0;
  private dr = 0;
  private uPrev = 0;

  constructor(sampleRate: number, windowS: number) {
    this.alpha = 1 - Math.exp(-1 / (windowS * sampleRate));
    keepShape(this);
  }

  reset(): void {
    this.eOut = this.eRes = 0;
    this.uu = this.ud = this.dd = this.ur = this.dr = this.uPrev = 0;
  }

  /**
   * Feeds n samples of output, linear output and residual. Wherever the output's mean square exceeds
   * floor2: ratio[k] becomes max(ratio[k], incoherent residual energy / output energy) and
   * loss[k] max(loss[k], dB by which the coherent part lowers the linear output's level; negative
   * when it raises it). With `asLevel`, loss[k] becomes min(loss[k], that level as a power ratio)
   * instead (1 where it is not lowered): no logarithm per sample, for a caller that wants the dB of
   * only a few frames (-10·log10 of the ratio is the dB figure, bit for bit).
   */
  processBlock(
    out: ArrayLike<number>,
    lin: ArrayLike<number>,
    res: ArrayLike<number>,
    n: number,
    floor2: number,
    ratio: Float64Array,
    loss: Float64Array,
    asLevel = false,
  ): void {
    const a = this.alpha;
    let eOut = this.eOut,
      eRes = this.eRes,
      uu = this.uu,
      ud = this.ud,
      dd = this.dd,
      ur = this.ur,
      dr = this.dr,
      uPrev = this.uPrev;
    for (let k = 0; k < n; k++) {
      const u = lin[k],
        r = res[k],
        d = u - uPrev;
      uPrev = u;
      eOut += a * (out[k] * out[k] - eOut);
      eRes += a * (r * r - eRes);
      uu += a * (u * u - uu);
      ud += a * (u * d - ud);
      dd += a * (d * d - dd);
      ur += a * (u * r - ur);
      dr += a * (d * r - dr);
      if (eOut > floor2) {
        // Least squares r ≈ g·u + h·d: [uu ud; ud dd]·[g h] = [ur dr].
        const det = uu * dd - ud * ud;
        let g: number, h: number;
        if (det > 1e-9 * uu * dd) {
          g = (ur * dd - dr * ud) / det;
          h = (dr * uu - ur * ud) / det;
        } else {
          g = uu > 0 ? ur / uu : 0;
          h = 0;
        }
        const coherent = g * ur + h * dr;
        const rest = eRes - coherent;
        const q = (rest > 0 ? rest : 0) / eOut;
        if (q > ratio[k]) ratio[k] = q;
        if (uu > 0) {
          // Level of u + g·u + h·d against u's.
          const fitted = (1 + g) * (1 + g) * uu + 2 * (1 + g) * h * ud + h * h * dd;
          if (asLevel) {
            const x = fitted > 0 ? fitted / uu : 1;
            if (x < loss[k]) loss[k] = x;
          } else {
            const l = fitted > 0 ? -10 * Math.log10(fitted / uu) : 0;
            if (l > loss[k]) loss[k] = l;
          }
        }
      }
    }
    this.eOut = eOut;
    this.eRes = eRes;
    this.uu = uu;
    this.ud = ud;
    this.dd = dd;
    this.ur = ur;
    this.dr = dr;
    this.uPrev = uPrev;
  }
}

/** Amplitude of the component at f Hz (Goertzel over whole periods of the window), for tests and reports. */
export function toneAmplitude(x: ArrayLike<number>, start: number, length: number, f: number, sampleRate: number): number {
  const w = (2 * Math.PI * f) / sampleRate;
  let c = 0,
    s = 0;
  for (let k = 0; k < length; k++) {
    const v = x[start + k];
    c += v * Math.cos(w * k);
    s += v * Math.sin(w * k);
  }
  return (2 * hypot(c, s)) / length;
}
