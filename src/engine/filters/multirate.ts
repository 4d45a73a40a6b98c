// Sample-rate change by a power of two as a cascade of polyphase half-band stages (./halfband.ts),
// streaming over blocks of any length. The signal of interest occupies 0..bandEdge Hz, a fixed
// fraction of the low rate, so only the stage next to the low rate needs a narrow transition band;
// the stages nearer the audio rate have a wide one and few taps (the classic multistage design:
// Crochiere & Rabiner, "Interpolation and decimation of digital signals: a tutorial review",
// Proc. IEEE 69(3), 1981).
import { designHalfband, type HalfbandDesign } from './halfband.ts';

/** The band kept, as a fraction of the low rate (the half-band stage next to it: 0.42, as the renderer's clipping stage). */
export const KEPT_BAND = 0.42;
/** Stopband attenuation of every stage unless told, dB. */
export const STAGE_ATTEN_DB = 70;

/**
 * Stage designs from the audio rate down: stage j runs between fs/2^j and fs/2^(j+1). `band`: the
 * band kept as a fraction of the final low rate; `attenDb`: each stage's stopband.
 */
export function stageDesigns(factor: number, band = KEPT_BAND, attenDb = STAGE_ATTEN_DB): HalfbandDesign[] {
  const stages = Math.round(Math.log2(factor));
  if (2 ** stages !== factor || stages < 1) throw new Error(`rate factor ${factor} is not a power of two above 1`);
  const out: HalfbandDesign[] = [];
  for (let j = 0; j < stages; j++) {
    // The stage's low rate in units of the final low rate; images of the kept band start at r - band.
    const r = 2 ** (stages - 1 - j);
    out.push(designHalfband(attenDb, (r - 2 * band) / (2 * r)));
  }
  return out;
}

/** Audio-rate frames a cascade of these designs delays by going down (or, the same, coming up). */
export function cascadeDelay(designs: HalfbandDesign[]): number {
  let frames = 0;
  designs.forEach((d, j) => {
    frames += d.m * 2 ** j;
  });
  return frames;
}

/**
 * One factor-2 decimating stage over blocks: its input's recent past and the new block in one
 * buffer, so the folded taps run over plain indices. An output is ready with every second input
 * sample; its centre tap sits M samples back (the stage's delay).
 */
class HalfDown {
  private readonly odd: Float64Array;
  private readonly m: number;
  buf: Float64Array;
  len: number;
  /** Buffer index of the next output's centre tap. */
  next: number;

  constructor(d: HalfbandDesign, maxIn: number) {
    this.odd = d.odd;
    this.m = d.m;
    this.buf = new Float64Array(2 * d.m + 2 + maxIn);
    this.len = 2 * d.m;
    this.next = d.m + 1;
  }

  reset(): void {
    this.buf.fill(0);
    this.len = 2 * this.m;
    this.next = this.m + 1;
  }

  copyFrom(o: HalfDown): void {
    this.buf.set(o.buf);
    this.len = o.len;
    this.next = o.next;
  }

  /** x[0..n-1] in, outputs to out from 0; returns their count. */
  process(x: Float64Array, n: number, out: Float64Array): number {
    const buf = this.buf,
      odd = this.odd,
      t = odd.length,
      m = this.m;
    buf.set(x.subarray(0, n), this.len);
    const len = this.len + n;
    let c = this.next,
      k = 0;
    for (; c + m < len; c += 2) {
      let acc = 0.5 * buf[c];
      for (let j = 0; j < t; j++) acc += odd[j] * (buf[c - 2 * j - 1] + buf[c + 2 * j + 1]);
      out[k++] = acc;
    }
    const drop = c - m;
    buf.copyWithin(0, drop, len);
    this.len = len - drop;
    this.next = c - drop;
    return k;
  }
}

/**
 * One factor-2 interpolating stage over blocks: each input sample gives the interpolated point
 * before it and the sample itself, M high-rate samples late (the stage's delay).
 */
class HalfUp {
  private readonly odd: Float64Array;
  private readonly h: number;
  buf: Float64Array;

  constructor(d: HalfbandDesign, maxIn: number) {
    this.odd = d.odd;
    this.h = 2 * d.odd.length - 1;
    this.buf = new Float64Array(this.h + maxIn);
  }

  reset(): void {
    this.buf.fill(0);
  }

  /** x[0..m-1] in; 2m outputs to out from `at`. */
  process(x: Float64Array, m: number, out: Float64Array, at: number): void {
    const buf = this.buf,
      odd = this.odd,
      t = odd.length,
      h = this.h;
    buf.set(x.subarray(0, m), h);
    for (let k = 0; k < m; k++) {
      // Newest sample at q = h + k; the window's middle pair is q - t + 1 and q - t.
      const q = h + k;
      let acc = 0;
      for (let j = 0; j < t; j++) acc += odd[j] * (buf[q - t + 1 + j] + buf[q - t - j]);
      out[at + 2 * k] = 2 * acc;
      out[at + 2 * k + 1] = buf[q - t + 1];
    }
    buf.copyWithin(0, m, m + h);
  }
}

/** Audio-rate samples in, every factor-th (band-limited) out, over blocks of up to maxBlock. */
export class Downsampler {
  private readonly stages: HalfDown[];
  private readonly scratch: Float64Array[];

  constructor(designs: HalfbandDesign[], maxBlock: number) {
    this.stages = designs.map((d, j) => new HalfDown(d, Math.ceil(maxBlock / 2 ** j) + 2));
    this.scratch = designs.map((_, j) => new Float64Array(Math.ceil(maxBlock / 2 ** (j + 1)) + 2));
  }

  reset(): void {
    for (const s of this.stages) s.reset();
  }

  /** Takes over another's state (same designs): the two then run alike on the same input. */
  copyFrom(o: Downsampler): void {
    for (let j = 0; j < this.stages.length; j++) this.stages[j].copyFrom(o.stages[j]);
  }

  /** x[0..n-1] in; writes the low-rate samples to out from index 0 and returns how many. */
  process(x: Float64Array, n: number, out: Float64Array): number {
    const stages = this.stages,
      depth = stages.length;
    let src = x,
      count = n;
    for (let j = 0; j < depth; j++) {
      const dst = j === depth - 1 ? out : this.scratch[j];
      count = stages[j].process(src, count, dst);
      src = dst;
    }
    return count;
  }
}

/** Low-rate samples in, factor times as many out (images of the kept band removed). */
export class Upsampler {
  private readonly stages: HalfUp[];
  private readonly scratch: Float64Array[];
  readonly factor: number;

  /** maxIn: the most low-rate samples per call. */
  constructor(designs: HalfbandDesign[], maxIn: number) {
    const depth = designs.length;
    this.factor = 2 ** depth;
    // Applied from the low rate up: the last design first; stage i takes maxIn·2^i samples.
    this.stages = designs
      .slice()
      .reverse()
      .map((d, i) => new HalfUp(d, maxIn * 2 ** i));
    this.scratch = this.stages.map((_, i) => new Float64Array(maxIn * 2 ** (i + 1)));
  }

  reset(): void {
    for (const s of this.stages) s.reset();
  }

  /** x[0..m-1] in; writes factor·m samples to out from index `at`. */
  process(x: Float64Array, m: number, out: Float64Array, at: number): void {
    const stages = this.stages,
      depth = stages.length;
    let src = x,
      count = m;
    for (let i = 0; i < depth; i++) {
      const last = i === depth - 1;
      stages[i].process(src, count, last ? out : this.scratch[i], last ? at : 0);
      src = this.scratch[i];
      count *= 2;
    }
  }
}
