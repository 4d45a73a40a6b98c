// A delay of any length in samples (an acoustic offset, a way's own delay): a whole-sample line plus,
// for the fraction, a Thiran all-pass (J.-P. Thiran, "Recursive digital filters with maximally flat
// group delay", IEEE Trans. Circuit Theory 18(6), 1971; reviewed in Laakso, Välimäki, Karjalainen
// and Laine, "Splitting the unit delay", IEEE Signal Processing Magazine 13(1), 1996). An all-pass
// keeps every frequency's level exactly, so a delayed way sums with the others without a treble
// loss; its delay is maximally flat at DC and drifts only near the Nyquist frequency. A whole
// number of samples is an exact copy.

import { keepShape } from '../keep-shape.ts';

/** All-pass order used when the delay is long enough (stable for a delay above order - 1). */
const THIRAN_ORDER = 3;

/** Coefficients a1..aN of the order-N Thiran all-pass with delay d samples (a0 = 1). */
export function thiranCoefficients(d: number, order: number): Float64Array {
  const a = new Float64Array(order);
  for (let k = 1; k <= order; k++) {
    let c = 1;
    // Binomial coefficient C(N, k) and the product over n = 0..N.
    for (let i = 1; i <= k; i++) c = (c * (order - k + i)) / i;
    let prod = 1;
    for (let n = 0; n <= order; n++) prod *= (d - order + n) / (d - order + k + n);
    a[k - 1] = (k % 2 === 0 ? 1 : -1) * c * prod;
  }
  return a;
}

export class FractionalDelay {
  /** Total delay, samples. */
  readonly samples: number;
  private readonly whole: number;
  private readonly line: Float64Array;
  private pos = 0;
  /** All-pass denominator a1..aN; empty for a whole-sample delay. */
  private readonly a: Float64Array;
  private readonly xHist: Float64Array;
  private readonly yHist: Float64Array;

  constructor(samples: number) {
    if (!(samples >= 0 && samples < 1e7)) throw new RangeError(`a delay must be 0 to 10^7 samples, got ${samples}`);
    this.samples = samples;
    const nearest = Math.round(samples);
    if (Math.abs(samples - nearest) < 1e-9) {
      this.whole = nearest;
      this.a = new Float64Array(0);
    } else {
      // The all-pass takes the last N (about) samples, where its delay is most accurate; shorter
      // delays use a lower order (order 1 below half a sample: still stable, delay above 0).
      const order = Math.min(THIRAN_ORDER, Math.max(1, nearest));
      this.whole = Math.max(0, nearest - order);
      this.a = thiranCoefficients(samples - this.whole, order);
    }
    this.line = new Float64Array(this.whole + 1);
    this.xHist = new Float64Array(this.a.length);
    this.yHist = new Float64Array(this.a.length);
    keepShape(this);
  }

  reset(): void {
    this.line.fill(0);
    this.xHist.fill(0);
    this.yHist.fill(0);
    this.pos = 0;
  }

  /** Delays buf[0..n-1] in place. */
  process(buf: Float64Array, n: number): void {
    if (this.whole > 0) {
      const line = this.line,
        len = line.length;
      let pos = this.pos;
      for (let k = 0; k < n; k++) {
        line[pos] = buf[k];
        pos = pos + 1 === len ? 0 : pos + 1;
        buf[k] = line[pos];
      }
      this.pos = pos;
    }
    const a = this.a,
      order = a.length;
    if (order === 0) return;
    // H(z) = (aN + aN-1 z^-1 + ... + z^-N) / (1 + a1 z^-1 + ... + aN z^-N), direct form I.
    const xh = this.xHist,
      yh = this.yHist;
    for (let k = 0; k < n; k++) {
      const x = buf[k];
      let y = a[order - 1] * x;
      for (let i = 1; i <= order; i++) {
        const num = i === order ? 1 : a[order - 1 - i];
        y += num * xh[i - 1] - a[i - 1] * yh[i - 1];
      }
      for (let i = order - 1; i > 0; i--) {
        xh[i] = xh[i - 1];
        yh[i] = yh[i - 1];
      }
      xh[0] = x;
      yh[0] = y;
      buf[k] = y;
    }
  }
}
