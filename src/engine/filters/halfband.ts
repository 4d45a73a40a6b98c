// Polyphase half-band FIR interpolator and decimator (factor 2), linear phase.
// Design: Kaiser-windowed sinc (Kaiser, "Nonrecursive digital filter design using the I0-sinh
// window function", 1974; beta and length from Kaiser's formulas as given by Oppenheim & Schafer).
// A half-band filter has every other tap zero and a centre tap of 1/2, so each output costs half
// the taps, and the symmetric taps are folded.

import { besselI0 } from './kaiser.ts';
import { keepShape } from '../keep-shape.ts';

export interface HalfbandDesign {
  /** The odd-offset taps h[1], h[3], ..., h[M] (h[-k] = h[k]); the centre tap is 1/2. */
  odd: Float64Array;
  /** Half-length M (odd): the filter spans -M..M, delay M samples at the high rate. */
  m: number;
}

/**
 * Half-band low-pass at the high rate with stopband attenuation attenDb and a transition band of
 * `transition` (fraction of the high rate, centred on a quarter of it).
 */
export function designHalfband(attenDb: number, transition: number): HalfbandDesign {
  const beta = attenDb > 50 ? 0.1102 * (attenDb - 8.7) : 0.5842 * Math.pow(attenDb - 21, 0.4) + 0.07886 * (attenDb - 21);
  const nMinus1 = (attenDb - 7.95) / (2.285 * 2 * Math.PI * transition);
  let m = Math.ceil(nMinus1 / 2);
  if (m % 2 === 0) m += 1;
  const odd = new Float64Array((m + 1) / 2);
  const i0b = besselI0(beta);
  for (let j = 0; j < odd.length; j++) {
    const k = 2 * j + 1;
    const sinc = Math.sin((Math.PI * k) / 2) / ((Math.PI * k) / 2);
    const r = k / m;
    const w = besselI0(beta * Math.sqrt(Math.max(0, 1 - r * r))) / i0b;
    odd[j] = 0.5 * sinc * w;
  }
  // Exact DC gain of 1 for the odd phase (the centre phase is exactly 1/2 by construction).
  let sum = 0;
  for (let j = 0; j < odd.length; j++) sum += 2 * odd[j];
  for (let j = 0; j < odd.length; j++) odd[j] *= 0.5 / sum;
  return { odd, m };
}

/** Default used by the renderer: 70 dB stopband, passband to 0.42 of the low rate. */
export const RENDER_HALFBAND = designHalfband(70, 0.08);

/** Factor-2 interpolator. Each input sample gives two output samples; delay M high-rate samples. */
export class Upsampler2 {
  private readonly odd: Float64Array;
  private readonly t: number;
  private readonly buf: Float64Array;
  private pos = 0;
  private readonly centreDelay: number;

  constructor(design: HalfbandDesign = RENDER_HALFBAND) {
    this.odd = design.odd;
    this.t = design.odd.length;
    // History of 2t input samples, stored twice so a window is always contiguous.
    this.buf = new Float64Array(4 * this.t);
    this.centreDelay = (design.m - 1) / 2;
    keepShape(this);
  }

  reset(): void {
    this.buf.fill(0);
    this.pos = 0;
  }

  /** Pushes x; writes the two high-rate outputs to out[o], out[o + 1]. */
  push(x: number, out: Float64Array, o: number): void {
    const n2 = 2 * this.t;
    this.pos = this.pos === 0 ? n2 - 1 : this.pos - 1;
    this.buf[this.pos] = x;
    this.buf[this.pos + n2] = x;
    // Window w[i] = x[n - i], i = 0 .. 2t-1; taps g[2i] are the odd-offset taps, mirrored.
    const b = this.buf,
      p = this.pos,
      odd = this.odd,
      t = this.t;
    let acc = 0;
    for (let j = 0; j < t; j++) acc += odd[j] * (b[p + t - 1 - j] + b[p + t + j]);
    out[o] = 2 * acc;
    out[o + 1] = b[p + this.centreDelay];
  }
}

/** Factor-2 decimator. Two high-rate samples in, one out. */
export class Decimator2 {
  private readonly odd: Float64Array;
  private readonly t: number;
  /** Even-phase history (the folded taps) and odd-phase history (the centre tap). */
  private readonly ev: Float64Array;
  private readonly od: Float64Array;
  private pos = 0;
  constructor(design: HalfbandDesign = RENDER_HALFBAND) {
    this.odd = design.odd;
    this.t = design.odd.length;
    this.ev = new Float64Array(4 * this.t);
    this.od = new Float64Array(4 * this.t);
    keepShape(this);
  }

  reset(): void {
    this.ev.fill(0);
    this.od.fill(0);
    this.pos = 0;
  }

  /**
   * a = high-rate sample 2n, b = sample 2n+1. The output is aligned to sample 2n, so the
   * interpolator followed by this decimator delays by exactly M low-rate samples.
   */
  push(a: number, b: number): number {
    const n2 = 2 * this.t;
    this.pos = this.pos === 0 ? n2 - 1 : this.pos - 1;
    const p = this.pos;
    this.ev[p] = a;
    this.ev[p + n2] = a;
    this.od[p] = b;
    this.od[p + n2] = b;
    const e = this.ev,
      odd = this.odd,
      t = this.t;
    let acc = 0;
    for (let j = 0; j < t; j++) acc += odd[j] * (e[p + t - 1 - j] + e[p + t + j]);
    return acc + 0.5 * this.od[p + t];
  }
}
