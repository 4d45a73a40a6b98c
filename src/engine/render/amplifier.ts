// The amplifier's output stage: rail from rated power into the nominal load, hard or soft clipping.

import { keepShape } from '../keep-shape.ts';

/** Peak output voltage from rated power into the nominal load: V = sqrt(2·P·Z). */
export function railVolts(powerW: number, loadOhm: number): number {
  return Math.sqrt(2 * powerW * loadOhm);
}

/** Where soft clipping starts, as a fraction of the rail. */
export const SOFT_KNEE = 0.8;

/** Output voltage for a demanded voltage: linear inside the rail, limited to it. */
export function clipVolts(u: number, rail: number, soft: boolean): number {
  const a = u < 0 ? -u : u;
  if (!soft) return a > rail ? (u < 0 ? -rail : rail) : u;
  const knee = SOFT_KNEE * rail;
  if (a <= knee) return u;
  const span = rail - knee;
  const y = knee + span * Math.tanh((a - knee) / span);
  return u < 0 ? -y : y;
}

/**
 * The clipping stage at twice the audio rate, so its harmonics above the audio band are filtered
 * away instead of folding back. It runs the half-band filters only while the drive comes near the
 * rail; elsewhere the stage is linear and a plain delay of the same length (M frames) gives the
 * same samples (to within the filters' 70 dB ripple), so the switch is seamless.
 */
export class OversampledClipper {
  readonly delay: number;
  private readonly odd: Float64Array;
  private readonly t: number;
  /** Input history (4t, stored twice) for the interpolator and for priming. */
  private readonly hist: Float64Array;
  private hpos = 0;
  private readonly hlen: number;
  /** Decimator histories: even-phase (folded taps) and odd-phase (centre tap) samples. */
  private readonly ev: Float64Array;
  private readonly od: Float64Array;
  private dpos = 0;
  private hot = 0;
  private readonly span: number;

  constructor(design: { odd: Float64Array; m: number }) {
    this.odd = design.odd;
    this.t = design.odd.length;
    this.delay = design.m;
    this.hlen = 4 * this.t + 4;
    this.hist = new Float64Array(2 * this.hlen);
    this.ev = new Float64Array(4 * this.t);
    this.od = new Float64Array(4 * this.t);
    this.span = 4 * this.t + 2;
    keepShape(this);
  }

  reset(): void {
    this.hist.fill(0);
    this.ev.fill(0);
    this.od.fill(0);
    this.hpos = this.dpos = this.hot = 0;
  }

  /** Interpolated pair for the input `back` samples before the newest. */
  private interp(back: number, out: Float64Array): void {
    const b = this.hist,
      p = this.hpos + back,
      odd = this.odd,
      t = this.t;
    let acc = 0;
    for (let j = 0; j < t; j++) acc += odd[j] * (b[p + t - 1 - j] + b[p + t + j]);
    out[0] = 2 * acc;
    out[1] = b[p + t - 1];
  }

  private decimate(a: number, b: number): number {
    const n2 = 2 * this.t;
    this.dpos = this.dpos === 0 ? n2 - 1 : this.dpos - 1;
    const p = this.dpos,
      e = this.ev,
      odd = this.odd,
      t = this.t;
    e[p] = a;
    e[p + n2] = a;
    this.od[p] = b;
    this.od[p + n2] = b;
    let acc = 0;
    for (let j = 0; j < t; j++) acc += odd[j] * (e[p + t - 1 - j] + e[p + t + j]);
    return acc + 0.5 * this.od[p + t];
  }

  private readonly pair = new Float64Array(2);

  /**
   * u: demanded volts; writes the clipped drive (delayed by `delay`) to `clipped` and the
   * unclipped demand with the same delay to `delayed`.
   */
  process(u: Float64Array, n: number, rail: number, soft: boolean, clipped: Float64Array, delayed: Float64Array): void {
    const thr = 0.6 * rail;
    const hl = this.hlen,
      hist = this.hist,
      d = this.delay,
      pair = this.pair,
      span = this.span;
    // The history's position and the hot count in locals (the idle path is most of the samples);
    // the filters read the position from the field, so it is stored before they run.
    let hpos = this.hpos,
      hot = this.hot;
    for (let k = 0; k < n; k++) {
      const x = u[k];
      hpos = hpos === 0 ? hl - 1 : hpos - 1;
      hist[hpos] = x;
      hist[hpos + hl] = x;
      const old = hist[hpos + d];
      delayed[k] = old;
      if (x > thr || x < -thr) {
        if (hot === 0) {
          this.hpos = hpos;
          this.prime(rail, soft);
        }
        hot = span;
      }
      if (hot > 0) {
        hot--;
        this.hpos = hpos;
        this.interp(0, pair);
        clipped[k] = this.decimate(clipVolts(pair[0], rail, soft), clipVolts(pair[1], rail, soft));
      } else clipped[k] = old;
    }
    this.hpos = hpos;
    this.hot = hot;
  }

  /** Fills the decimator's history with the interpolated (still linear) recent past. */
  private prime(rail: number, soft: boolean): void {
    const pair = this.pair;
    for (let back = 2 * this.t; back >= 1; back--) {
      this.interp(back, pair);
      this.decimate(clipVolts(pair[0], rail, soft), clipVolts(pair[1], rail, soft));
    }
  }
}
