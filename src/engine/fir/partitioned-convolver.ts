// FIR filtering of a stream by uniformly partitioned FFT convolution, without latency.
// The taps are split into partitions of P: the first runs as a direct convolution, sample by
// sample; the others by overlap-save with a frequency-domain delay line (the uniformly partitioned
// overlap-save scheme: Wefers, "Partitioned convolution algorithms for real-time auralization",
// 2015, ch. 5). The FFT part works on whole blocks of P inputs and its first partition starts P
// taps late, so its output for a block is ready before that block is heard: no latency for any
// length of input handed to `process`.
import FFT from 'fft.js';

/**
 * The partition that costs least per sample: the direct part takes P multiply-adds, the FFT part
 * about L/P complex ones (4 real), so P near √(2L), a power of two from 16 to 512.
 */
export function partitionFor(length: number): number {
  let p = 16;
  while (p < 512 && p * p < 2 * length) p <<= 1;
  return p;
}

export class PartitionedConvolver {
  readonly length: number;
  private readonly p: number;
  private readonly head: Float64Array;
  /** Spectra of the tail partitions (2P-point FFTs, bins 0..P interleaved re/im). */
  private readonly parts: Float64Array[];
  /** Spectra of the last inputs' 2P frames, newest at `newest`. */
  private readonly fdl: Float64Array[];
  private newest = 0;
  private readonly fft: FFT;
  /** The previous block of P inputs, then the current one. */
  private readonly frame: Float64Array;
  private pos = 0;
  /** The tail's output for the current block. */
  private readonly tailOut: Float64Array;
  private readonly spec: Float64Array;
  private readonly acc: Float64Array;
  private readonly time: Float64Array;

  constructor(taps: ArrayLike<number>, partition = partitionFor(taps.length)) {
    if (!(partition >= 2 && (partition & (partition - 1)) === 0)) throw new Error('the partition must be a power of two');
    const p = partition;
    this.p = p;
    this.length = taps.length;
    this.head = new Float64Array(p);
    for (let i = 0; i < Math.min(p, taps.length); i++) this.head[i] = taps[i];
    this.fft = new FFT(2 * p);
    const count = Math.max(0, Math.ceil((taps.length - p) / p));
    const padded = new Array<number>(2 * p);
    const out = this.fft.createComplexArray() as number[];
    this.parts = [];
    for (let k = 0; k < count; k++) {
      padded.fill(0);
      for (let i = 0; i < p; i++) {
        const t = p + k * p + i;
        if (t < taps.length) padded[i] = taps[t];
      }
      this.fft.realTransform(out, padded);
      this.parts.push(Float64Array.from(out.slice(0, 2 * (p + 1))));
    }
    this.fdl = this.parts.map(() => new Float64Array(2 * (p + 1)));
    this.frame = new Float64Array(2 * p);
    this.tailOut = new Float64Array(p);
    // Typed arrays throughout: fft.js only indexes them, and the spectral loop stays on doubles.
    this.spec = new Float64Array(4 * p);
    this.acc = new Float64Array(4 * p);
    this.time = new Float64Array(4 * p);
  }

  /** Filters buf[0..n) in place. */
  process(buf: Float64Array, n: number): void {
    const p = this.p;
    const head = this.head;
    const frame = this.frame;
    const tail = this.tailOut;
    let k = 0;
    while (k < n) {
      // Up to the end of the current block of P inputs.
      const run = Math.min(n - k, p - this.pos);
      let at = p + this.pos;
      for (let j = 0; j < run; j++, at++, k++) {
        frame[at] = buf[k];
        let y = tail[at - p];
        for (let m = 0; m < p; m++) y += head[m] * frame[at - m];
        buf[k] = y;
      }
      this.pos += run;
      if (this.pos === p) this.endBlock();
    }
  }

  /** A block of P inputs is complete: the tail's output for the next block, then the frame moves on. */
  private endBlock(): void {
    const p = this.p;
    const count = this.parts.length;
    if (count > 0) {
      this.newest = this.newest + 1 === count ? 0 : this.newest + 1;
      const fdl = this.fdl;
      const parts = this.parts;
      const x = fdl[this.newest];
      const spec = this.spec;
      this.fft.realTransform(spec as unknown as number[], this.frame as unknown as number[]);
      const bins = 2 * (p + 1);
      for (let i = 0; i < bins; i++) x[i] = spec[i];
      const acc = this.acc;
      acc.fill(0);
      let slot = this.newest;
      for (let k = 0; k < count; k++) {
        const xs = fdl[slot];
        const h = parts[k];
        for (let i = 0; i < bins; i += 2) {
          const xr = xs[i],
            xi = xs[i + 1],
            hr = h[i],
            hi = h[i + 1];
          acc[i] += xr * hr - xi * hi;
          acc[i + 1] += xr * hi + xi * hr;
        }
        slot = slot === 0 ? count - 1 : slot - 1;
      }
      // The upper half of a real signal's spectrum: the conjugate of the lower.
      for (let b = p + 1; b < 2 * p; b++) {
        acc[2 * b] = acc[2 * (2 * p - b)];
        acc[2 * b + 1] = -acc[2 * (2 * p - b) + 1];
      }
      this.fft.inverseTransform(this.time as unknown as number[], acc as unknown as number[]);
      // Overlap-save: the last P samples of the circular convolution are the linear one's.
      const time = this.time;
      const tail = this.tailOut;
      for (let i = 0; i < p; i++) tail[i] = time[2 * (p + i)];
    }
    this.frame.copyWithin(0, p, 2 * p);
    this.pos = 0;
  }
}
