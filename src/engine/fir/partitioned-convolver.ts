// FIR filtering of a stream (or of two streams through the same taps) by uniformly partitioned
// FFT convolution, without latency. The taps are split into partitions of P and run by
// overlap-save with a frequency-domain delay line (the uniformly partitioned overlap-save scheme:
// Wefers, "Partitioned convolution algorithms for real-time auralization", 2015, ch. 5).
//
// No latency for any length of input handed to `process`: a whole block of P inputs that starts on
// a block boundary is convolved at once in the frequency domain, every partition included (the
// block is all there, so its output needs nothing later). A call that starts or ends inside a block
// runs that block sample by sample: its first partition as a direct sum, the later ones from the
// delay line's earlier blocks (ready at the block's start). Callers whose blocks are multiples of P
// (the renderer's chunks, the Web Audio render quantum) only ever take the first, cheap path.
//
// Two streams through the same real taps share one complex FFT each way: z = a + i·b, so
// h * z = h * a + i·(h * b) (the convolution is linear and h is real).
import FFT from 'fft.js';

/** The Web Audio render quantum: the worklet's block, and a divisor of the renderer's chunk. */
export const RENDER_QUANTUM = 128;

/**
 * The partition for `length` taps heard in calls of `block` frames: the largest power of two up to
 * the block (fewer partitions and a cheaper FFT per sample), no longer than the taps need, at least 16.
 */
export function partitionFor(length: number, block = RENDER_QUANTUM): number {
  let p = 16;
  while (p < block && p < length) p <<= 1;
  return p;
}

export class PartitionedConvolver {
  readonly length: number;
  readonly partition: number;
  /** 2 when the convolver filters a pair of streams (processPair), else 1. */
  readonly streams: 1 | 2;
  private readonly p: number;
  /** The first partition's taps, for blocks run sample by sample. */
  private readonly head: Float64Array;
  /** Spectra of the partitions (2P-point FFTs, interleaved re/im: bins 0..P for one stream, all 2P for two). */
  private readonly parts: Float64Array[];
  /** Spectra of the last inputs' 2P frames, newest at `newest`. */
  private readonly fdl: Float64Array[];
  private newest = 0;
  private readonly fft: FFT;
  /** The previous block of P inputs, then the current one (interleaved re/im for two streams). */
  private readonly frame: Float64Array;
  private pos = 0;
  /** The later partitions' output for the current block (valid when `tailReady`), interleaved for two streams. */
  private readonly tail: Float64Array;
  private tailReady = false;
  /** conj(Y) of the block being summed, then the block's output in time as conj(y). */
  private readonly acc: Float64Array;
  private readonly time: Float64Array;
  /** For two blocks of one stream at once (twoBlocks): the second block's conj(Y), the packed frames, their spectrum. */
  private readonly acc2: Float64Array;
  private readonly pairFrame: Float64Array;
  private readonly pairSpec: Float64Array;
  /** Complex values per spectrum the spectral products run over. */
  private readonly bins: number;

  constructor(taps: ArrayLike<number>, partition = partitionFor(taps.length), streams: 1 | 2 = 1) {
    if (!(partition >= 2 && (partition & (partition - 1)) === 0)) throw new Error('the partition must be a power of two');
    const p = partition;
    this.p = p;
    this.partition = p;
    this.streams = streams;
    this.length = taps.length;
    this.head = new Float64Array(p);
    for (let i = 0; i < Math.min(p, taps.length); i++) this.head[i] = taps[i];
    this.fft = new FFT(2 * p);
    // A real stream's spectrum is known from its lower half; a complex pair needs every bin.
    this.bins = streams === 2 ? 2 * p : p + 1;
    const count = Math.max(1, Math.ceil(taps.length / p));
    const padded = new Float64Array(2 * p);
    const out = new Float64Array(4 * p);
    this.parts = [];
    for (let k = 0; k < count; k++) {
      padded.fill(0);
      for (let i = 0; i < p && k * p + i < taps.length; i++) padded[i] = taps[k * p + i];
      this.fft.realTransform(out, padded);
      this.fft.completeSpectrum(out);
      // With the inverse transform's 1/N: the output comes back through a forward transform (spectralSum).
      for (let i = 0; i < 4 * p; i++) out[i] /= 2 * p;
      this.parts.push(out.slice(0, 2 * this.bins));
    }
    this.fdl = this.parts.map(() => new Float64Array(4 * p));
    this.frame = new Float64Array(2 * p * streams);
    this.tail = new Float64Array(p * streams);
    this.acc = new Float64Array(4 * p);
    this.time = new Float64Array(4 * p);
    const alone = streams === 1 ? 4 * p : 0;
    this.acc2 = new Float64Array(alone);
    this.pairFrame = new Float64Array(alone);
    this.pairSpec = new Float64Array(alone);
  }

  /** Filters buf[0..n) in place. */
  process(buf: Float64Array, n: number): void {
    if (this.streams !== 1) throw new Error('this convolver filters a pair of streams');
    this.run(buf, buf, n);
  }

  /** Filters a[0..n) and b[0..n) in place, each through the taps. */
  processPair(a: Float64Array, b: Float64Array, n: number): void {
    if (this.streams !== 2) throw new Error('this convolver filters one stream');
    this.run(a, b, n);
  }

  private run(a: Float64Array, b: Float64Array, n: number): void {
    const p = this.p;
    let k = 0;
    while (k < n) {
      if (this.pos === 0 && this.streams === 1 && n - k >= 2 * p) {
        this.twoBlocks(a, k);
        k += 2 * p;
      } else if (this.pos === 0 && n - k >= p) {
        this.wholeBlock(a, b, k);
        k += p;
      } else {
        const run = Math.min(n - k, p - this.pos);
        this.sampleBySample(a, b, k, run);
        k += run;
      }
    }
  }

  /** A block of P inputs from a[k..] (and b[k..]): transformed, pushed on the delay line, convolved whole. */
  private wholeBlock(a: Float64Array, b: Float64Array, k: number): void {
    const p = this.p;
    const frame = this.frame;
    if (this.streams === 1) frame.set(a.subarray(k, k + p), p);
    else
      for (let i = 0; i < p; i++) {
        frame[2 * (p + i)] = a[k + i];
        frame[2 * (p + i) + 1] = b[k + i];
      }
    this.push();
    this.spectralSum(0);
    const time = this.time;
    if (this.streams === 1) for (let i = 0; i < p; i++) a[k + i] = time[2 * (p + i)];
    else
      for (let i = 0; i < p; i++) {
        a[k + i] = time[2 * (p + i)];
        b[k + i] = -time[2 * (p + i) + 1];
      }
    this.shift();
  }

  /**
   * Two blocks of one stream, 2P inputs from a[k..], through one complex transform each way: the
   * two frames (which overlap by a block) as z = f1 + i·f2, split by the symmetry of real signals'
   * spectra, F1[m] = (Z[m] + conj Z[N−m])/2 and F2[m] = (Z[m] − conj Z[N−m])/(2i); the two outputs
   * back as the real and imaginary parts of one inverse.
   */
  private twoBlocks(a: Float64Array, k: number): void {
    const p = this.p;
    const n2 = 2 * p;
    const frame = this.frame;
    const z = this.pairFrame;
    for (let i = 0; i < p; i++) {
      z[2 * i] = frame[p + i];
      z[2 * i + 1] = a[k + i];
      z[2 * (p + i)] = a[k + i];
      z[2 * (p + i) + 1] = a[k + p + i];
    }
    const spec = this.pairSpec;
    this.fft.transform(spec, z);
    const count = this.fdl.length;
    for (let half = 0; half < 2; half++) {
      this.newest = this.newest + 1 === count ? 0 : this.newest + 1;
      const x = this.fdl[this.newest];
      for (let m = 0; m <= p; m++) {
        const j = m === 0 ? 0 : n2 - m;
        const zr = spec[2 * m],
          zi = spec[2 * m + 1],
          cr = spec[2 * j],
          ci = -spec[2 * j + 1];
        if (half === 0) {
          x[2 * m] = 0.5 * (zr + cr);
          x[2 * m + 1] = 0.5 * (zi + ci);
        } else {
          // (Z − conj Z[N−m]) / (2i) = −i/2 · (Z − conj Z[N−m])
          x[2 * m] = 0.5 * (zi - ci);
          x[2 * m + 1] = -0.5 * (zr - cr);
        }
      }
      this.accumulate(0, half === 0 ? this.acc : this.acc2);
    }
    // conj(W) with W = Y1 + i·Y2 on every bin (Y1, Y2 Hermitian; acc and acc2 hold conj Y1, conj Y2 on bins 0..P).
    const w = this.pairSpec;
    const c1 = this.acc,
      c2 = this.acc2;
    for (let m = 0; m < n2; m++) {
      let y1r: number, y1i: number, y2r: number, y2i: number;
      if (m <= p) {
        y1r = c1[2 * m];
        y1i = -c1[2 * m + 1];
        y2r = c2[2 * m];
        y2i = -c2[2 * m + 1];
      } else {
        const j = n2 - m;
        y1r = c1[2 * j];
        y1i = c1[2 * j + 1];
        y2r = c2[2 * j];
        y2i = c2[2 * j + 1];
      }
      // W = (y1r − y2i) + i(y1i + y2r); store its conjugate.
      w[2 * m] = y1r - y2i;
      w[2 * m + 1] = -(y1i + y2r);
    }
    const time = this.time;
    this.fft.transform(time, w);
    for (let i = 0; i < p; i++) {
      const second = a[k + p + i];
      frame[p + i] = second;
      a[k + i] = time[2 * (p + i)];
      a[k + p + i] = -time[2 * (p + i) + 1];
    }
    this.shift();
  }

  /** `run` inputs inside one block: the first partition directly, the later ones from the delay line. */
  private sampleBySample(a: Float64Array, b: Float64Array, k: number, run: number): void {
    const p = this.p;
    const head = this.head;
    const frame = this.frame;
    const tail = this.tail;
    if (this.pos === 0 || !this.tailReady) {
      if (this.parts.length > 1) {
        this.spectralSum(1);
        const time = this.time;
        if (this.streams === 1) for (let i = 0; i < p; i++) tail[i] = time[2 * (p + i)];
        else
          for (let i = 0; i < p; i++) {
            tail[2 * i] = time[2 * (p + i)];
            tail[2 * i + 1] = -time[2 * (p + i) + 1];
          }
      } else tail.fill(0);
      this.tailReady = true;
    }
    let at = p + this.pos;
    if (this.streams === 1) {
      for (let j = 0; j < run; j++, at++) {
        frame[at] = a[k + j];
        let y = tail[at - p];
        for (let m = 0; m < p; m++) y += head[m] * frame[at - m];
        a[k + j] = y;
      }
    } else {
      for (let j = 0; j < run; j++, at++) {
        frame[2 * at] = a[k + j];
        frame[2 * at + 1] = b[k + j];
        let yr = tail[2 * (at - p)];
        let yi = tail[2 * (at - p) + 1];
        for (let m = 0; m < p; m++) {
          const h = head[m];
          yr += h * frame[2 * (at - m)];
          yi += h * frame[2 * (at - m) + 1];
        }
        a[k + j] = yr;
        b[k + j] = yi;
      }
    }
    this.pos += run;
    if (this.pos === p) {
      this.push();
      this.shift();
    }
  }

  /** The current frame's spectrum onto the delay line. */
  private push(): void {
    const count = this.fdl.length;
    this.newest = this.newest + 1 === count ? 0 : this.newest + 1;
    const x = this.fdl[this.newest];
    if (this.streams === 1) this.fft.realTransform(x, this.frame);
    else this.fft.transform(x, this.frame);
  }

  /**
   * time = conj(IFFT(Y)), Y = Σ_{k ≥ from} X[newest − k + from]·H[k]: from 0, the newest block's whole
   * output; from 1 (before the newest block's frame is pushed), the later partitions' share of the
   * next. The inverse as conj(FFT(conj(Y)))/N with the 1/N in H: fft.js's inverse transform costs
   * about a third more than its forward one (a division per value), measured here.
   */
  private spectralSum(from: number): void {
    const acc = this.acc;
    this.accumulate(from, acc);
    if (this.streams === 1) {
      // The upper half of a real signal's spectrum (and of its conjugate): the conjugate of the lower.
      const p = this.p;
      for (let b = p + 1; b < 2 * p; b++) {
        acc[2 * b] = acc[2 * (2 * p - b)];
        acc[2 * b + 1] = -acc[2 * (2 * p - b) + 1];
      }
    }
    this.fft.transform(this.time, acc);
  }

  /** acc = conj(Σ_{k ≥ from} X[newest − k + from]·H[k]) on the bins the products run over. */
  private accumulate(from: number, acc: Float64Array): void {
    const count = this.parts.length;
    const fdl = this.fdl;
    const parts = this.parts;
    const n = 2 * this.bins;
    acc.fill(0, 0, n);
    let slot = this.newest;
    for (let k = from; k < count; k++) {
      const xs = fdl[slot];
      const h = parts[k];
      for (let i = 0; i < n; i += 2) {
        const xr = xs[i],
          xi = xs[i + 1],
          hr = h[i],
          hi = h[i + 1];
        acc[i] += xr * hr - xi * hi;
        acc[i + 1] -= xr * hi + xi * hr;
      }
      slot = slot === 0 ? count - 1 : slot - 1;
    }
  }

  /** The block is done: the current inputs become the previous ones. */
  private shift(): void {
    const half = this.frame.length / 2;
    this.frame.copyWithin(0, half);
    this.pos = 0;
    this.tailReady = false;
  }
}
