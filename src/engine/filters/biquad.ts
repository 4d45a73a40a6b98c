// Second-order sections (biquads) in direct form II transposed, Float64 state.
// A section is 5 numbers [b0, b1, b2, a1, a2] with a0 = 1; a cascade packs them in one Float64Array.

import { keepShape } from '../keep-shape.ts';

/** Coefficients of an analog second-order section (b2 s^2 + b1 s + b0) / (a2 s^2 + a1 s + a0). */
export interface AnalogSection {
  b: [number, number, number];
  a: [number, number, number];
}

/**
 * Bilinear transform of one analog section, s = K (1 - z^-1)/(1 + z^-1).
 * K = 2·fs, or K = w0 / tan(w0 / (2 fs)) to prewarp w0 onto its own digital frequency.
 */
export function bilinearSection(sec: AnalogSection, k: number): Float64Array {
  const [b0, b1, b2] = sec.b;
  const [a0, a1, a2] = sec.a;
  const k2 = k * k;
  const B0 = b2 * k2 + b1 * k + b0;
  const B1 = 2 * (b0 - b2 * k2);
  const B2 = b2 * k2 - b1 * k + b0;
  const A0 = a2 * k2 + a1 * k + a0;
  const A1 = 2 * (a0 - a2 * k2);
  const A2 = a2 * k2 - a1 * k + a0;
  return Float64Array.of(B0 / A0, B1 / A0, B2 / A0, A1 / A0, A2 / A0);
}

/** K for the bilinear transform: plain (2 fs) or prewarped at fWarp Hz. */
export function bilinearK(sampleRate: number, fWarp?: number): number {
  if (fWarp === undefined || !(fWarp > 0) || fWarp >= sampleRate / 2) return 2 * sampleRate;
  const w = 2 * Math.PI * fWarp;
  return w / Math.tan(w / (2 * sampleRate));
}

/** Concatenates single sections or already packed cascades into one packed cascade. */
export function packSections(sections: Float64Array[]): Float64Array {
  const out = new Float64Array(sections.reduce((n, s) => n + s.length, 0));
  let o = 0;
  for (const s of sections) {
    out.set(s, o);
    o += s.length;
  }
  return out;
}

/** A cascade of biquads with its own state; `step` per sample, `processInPlace` per block. */
export class BiquadCascade {
  readonly coef: Float64Array;
  readonly n: number;
  private readonly s1: Float64Array;
  private readonly s2: Float64Array;
  gain: number;

  constructor(coef: Float64Array, gain = 1) {
    this.coef = coef;
    this.n = coef.length / 5;
    this.s1 = new Float64Array(this.n);
    this.s2 = new Float64Array(this.n);
    this.gain = gain;
    keepShape(this);
  }

  reset(): void {
    this.s1.fill(0);
    this.s2.fill(0);
  }

  step(xIn: number): number {
    const c = this.coef;
    const s1 = this.s1;
    const s2 = this.s2;
    let x = xIn * this.gain;
    for (let k = 0, o = 0; k < this.n; k++, o += 5) {
      const y = c[o] * x + s1[k];
      s1[k] = c[o + 1] * x - c[o + 3] * y + s2[k];
      s2[k] = c[o + 2] * x - c[o + 4] * y;
      x = y;
    }
    return x;
  }

  /**
   * Whole block, sections in groups of up to four per pass over the block (cache-friendly for long
   * buffers). Each section's recurrence is a chain of dependent multiply-adds, so one section per
   * pass waits on its own latency; the sections of a group are independent from one sample to the
   * next and overlap in the CPU. The arithmetic per section and sample is unchanged (bit-identical
   * for Float64 buffers, which hold every section's output exactly).
   */
  processInPlace(buf: Float64Array | Float32Array, start = 0, end = buf.length): void {
    const g = this.gain;
    if (g !== 1) for (let j = start; j < end; j++) buf[j] *= g;
    const n = this.n;
    let k = 0;
    // Float32 storage rounds between sections: keep that rounding, one section per pass.
    if (!(buf instanceof Float64Array)) {
      for (; k < n; k++) this.one(buf, k, start, end);
      return;
    }
    for (; k + 4 <= n; k += 4) this.four(buf, k, start, end);
    for (; k + 2 <= n; k += 2) this.two(buf, k, start, end);
    if (k < n) this.one(buf, k, start, end);
  }

  private one(buf: Float64Array | Float32Array, k: number, start: number, end: number): void {
    const c = this.coef,
      o = 5 * k;
    const b0 = c[o],
      b1 = c[o + 1],
      b2 = c[o + 2],
      a1 = c[o + 3],
      a2 = c[o + 4];
    let z1 = this.s1[k],
      z2 = this.s2[k];
    for (let j = start; j < end; j++) {
      const x = buf[j];
      const y = b0 * x + z1;
      z1 = b1 * x - a1 * y + z2;
      z2 = b2 * x - a2 * y;
      buf[j] = y;
    }
    this.s1[k] = z1;
    this.s2[k] = z2;
  }

  private two(buf: Float64Array | Float32Array, k: number, start: number, end: number): void {
    const c = this.coef,
      o = 5 * k,
      s1 = this.s1,
      s2 = this.s2;
    const b0 = c[o],
      b1 = c[o + 1],
      b2 = c[o + 2],
      a1 = c[o + 3],
      a2 = c[o + 4];
    const c0 = c[o + 5],
      c1 = c[o + 6],
      c2 = c[o + 7],
      d1 = c[o + 8],
      d2 = c[o + 9];
    let z1 = s1[k],
      z2 = s2[k],
      w1 = s1[k + 1],
      w2 = s2[k + 1];
    for (let j = start; j < end; j++) {
      const x = buf[j];
      const y = b0 * x + z1;
      z1 = b1 * x - a1 * y + z2;
      z2 = b2 * x - a2 * y;
      const y2 = c0 * y + w1;
      w1 = c1 * y - d1 * y2 + w2;
      w2 = c2 * y - d2 * y2;
      buf[j] = y2;
    }
    s1[k] = z1;
    s2[k] = z2;
    s1[k + 1] = w1;
    s2[k + 1] = w2;
  }

  private four(buf: Float64Array | Float32Array, k: number, start: number, end: number): void {
    const c = this.coef,
      o = 5 * k,
      s1 = this.s1,
      s2 = this.s2;
    const b0 = c[o],
      b1 = c[o + 1],
      b2 = c[o + 2],
      a1 = c[o + 3],
      a2 = c[o + 4];
    const c0 = c[o + 5],
      c1 = c[o + 6],
      c2 = c[o + 7],
      d1 = c[o + 8],
      d2 = c[o + 9];
    const e0 = c[o + 10],
      e1 = c[o + 11],
      e2 = c[o + 12],
      f1 = c[o + 13],
      f2 = c[o + 14];
    const g0 = c[o + 15],
      g1 = c[o + 16],
      g2 = c[o + 17],
      h1 = c[o + 18],
      h2 = c[o + 19];
    let z1 = s1[k],
      z2 = s2[k],
      w1 = s1[k + 1],
      w2 = s2[k + 1],
      u1 = s1[k + 2],
      u2 = s2[k + 2],
      v1 = s1[k + 3],
      v2 = s2[k + 3];
    for (let j = start; j < end; j++) {
      const x = buf[j];
      const y = b0 * x + z1;
      z1 = b1 * x - a1 * y + z2;
      z2 = b2 * x - a2 * y;
      const y2 = c0 * y + w1;
      w1 = c1 * y - d1 * y2 + w2;
      w2 = c2 * y - d2 * y2;
      const y3 = e0 * y2 + u1;
      u1 = e1 * y2 - f1 * y3 + u2;
      u2 = e2 * y2 - f2 * y3;
      const y4 = g0 * y3 + v1;
      v1 = g1 * y3 - h1 * y4 + v2;
      v2 = g2 * y3 - h2 * y4;
      buf[j] = y4;
    }
    s1[k] = z1;
    s2[k] = z2;
    s1[k + 1] = w1;
    s2[k + 1] = w2;
    s1[k + 2] = u1;
    s2[k + 2] = u2;
    s1[k + 3] = v1;
    s2[k + 3] = v2;
  }
}

/** Complex response of a packed cascade at f Hz (for tests and charts). Returns [re, im]. */
export function cascadeResponse(coef: Float64Array, gain: number, f: number, sampleRate: number): [number, number] {
  const w = (2 * Math.PI * f) / sampleRate;
  const c1 = Math.cos(w),
    s1 = -Math.sin(w);
  const c2 = Math.cos(2 * w),
    s2 = -Math.sin(2 * w);
  let re = gain,
    im = 0;
  for (let o = 0; o < coef.length; o += 5) {
    const nr = coef[o] + coef[o + 1] * c1 + coef[o + 2] * c2;
    const ni = coef[o + 1] * s1 + coef[o + 2] * s2;
    const dr = 1 + coef[o + 3] * c1 + coef[o + 4] * c2;
    const di = coef[o + 3] * s1 + coef[o + 4] * s2;
    const d2 = dr * dr + di * di;
    const hr = (nr * dr + ni * di) / d2;
    const hi = (ni * dr - nr * di) / d2;
    const r = re * hr - im * hi;
    im = re * hi + im * hr;
    re = r;
  }
  return [re, im];
}

/** A section that passes its input through unchanged (pads a joined cascade's last group). */
const PASS_THROUGH = Float64Array.of(1, 0, 0, 0, 0);

/**
 * Cascades run one after the other as one cascade of groups of four sections per pass, each stage's
 * gain applied before its first section and the last group padded with pass-through sections. One
 * section alone waits on its own latency (about 2.4x the time per section of a group of four), so
 * a way's chain followed by a weighting filter runs about twice as fast joined. Bit for bit the
 * stages' processInPlace one after the other on a Float64 buffer: the same products in the same
 * order (a gain of 1 and a pass-through section leave every value as it was, but for the sign of a
 * zero).
 */
export class JoinedCascade {
  private readonly coef: Float64Array;
  /** Gain before each section: its stage's gain at the stage's first section, else 1. */
  private readonly pre: Float64Array;
  private readonly s1: Float64Array;
  private readonly s2: Float64Array;

  constructor(stages: BiquadCascade[]) {
    const n = stages.reduce((m, s) => m + s.n, 0);
    const padded = Math.ceil(n / 4) * 4;
    const sections: Float64Array[] = [];
    this.pre = new Float64Array(padded).fill(1);
    for (const s of stages) {
      if (s.n > 0) this.pre[sections.length] = s.gain;
      for (let k = 0; k < s.n; k++) sections.push(s.coef.subarray(5 * k, 5 * k + 5));
    }
    while (sections.length < padded) sections.push(PASS_THROUGH);
    this.coef = packSections(sections);
    this.s1 = new Float64Array(padded);
    this.s2 = new Float64Array(padded);
    keepShape(this);
  }

  processInPlace(buf: Float64Array, start = 0, end = buf.length): void {
    for (let k = 0; k < this.pre.length; k += 4) this.four(buf, k, start, end);
  }

  /** Sections, a multiple of four (pass-through sections pad the last group). */
  get sections(): number {
    return this.pre.length;
  }

  /**
   * For the two-lane loop (./cascade-pair.ts): section k's [gain, b0, b1, b2, a1, a2] to
   * `at + 12·k + 2·j + lane` and its state [s1, s2] to `stateAt + 4·k + 2·j + lane`; sections past
   * its own up to `sections` pass through from rest.
   */
  writePair(to: Float64Array, at: number, stateAt: number, lane: number, sections: number): void {
    for (let k = 0; k < sections; k++) {
      const own = k < this.pre.length;
      const o = at + 12 * k + lane;
      to[o] = own ? this.pre[k] : 1;
      for (let j = 0; j < 5; j++) to[o + 2 * (j + 1)] = own ? this.coef[5 * k + j] : PASS_THROUGH[j];
      to[stateAt + 4 * k + lane] = own ? this.s1[k] : 0;
      to[stateAt + 4 * k + 2 + lane] = own ? this.s2[k] : 0;
    }
  }

  /** Its sections' state back from the two-lane loop (writePair's layout). */
  readPairState(from: Float64Array, stateAt: number, lane: number): void {
    for (let k = 0; k < this.pre.length; k++) {
      this.s1[k] = from[stateAt + 4 * k + lane];
      this.s2[k] = from[stateAt + 4 * k + 2 + lane];
    }
  }

  private four(buf: Float64Array, k: number, start: number, end: number): void {
    const c = this.coef,
      o = 5 * k,
      s1 = this.s1,
      s2 = this.s2,
      pre = this.pre;
    const p0 = pre[k],
      p1 = pre[k + 1],
      p2 = pre[k + 2],
      p3 = pre[k + 3];
    const b0 = c[o],
      b1 = c[o + 1],
      b2 = c[o + 2],
      a1 = c[o + 3],
      a2 = c[o + 4];
    const c0 = c[o + 5],
      c1 = c[o + 6],
      c2 = c[o + 7],
      d1 = c[o + 8],
      d2 = c[o + 9];
    const e0 = c[o + 10],
      e1 = c[o + 11],
      e2 = c[o + 12],
      f1 = c[o + 13],
      f2 = c[o + 14];
    const g0 = c[o + 15],
      g1 = c[o + 16],
      g2 = c[o + 17],
      h1 = c[o + 18],
      h2 = c[o + 19];
    let z1 = s1[k],
      z2 = s2[k],
      w1 = s1[k + 1],
      w2 = s2[k + 1],
      u1 = s1[k + 2],
      u2 = s2[k + 2],
      v1 = s1[k + 3],
      v2 = s2[k + 3];
    for (let j = start; j < end; j++) {
      const x = buf[j] * p0;
      const y = b0 * x + z1;
      z1 = b1 * x - a1 * y + z2;
      z2 = b2 * x - a2 * y;
      const x2 = y * p1;
      const y2 = c0 * x2 + w1;
      w1 = c1 * x2 - d1 * y2 + w2;
      w2 = c2 * x2 - d2 * y2;
      const x3 = y2 * p2;
      const y3 = e0 * x3 + u1;
      u1 = e1 * x3 - f1 * y3 + u2;
      u2 = e2 * x3 - f2 * y3;
      const x4 = y3 * p3;
      const y4 = g0 * x4 + v1;
      v1 = g1 * x4 - h1 * y4 + v2;
      v2 = g2 * x4 - h2 * y4;
      buf[j] = y4;
    }
    s1[k] = z1;
    s2[k] = z2;
    s1[k + 1] = w1;
    s2[k + 1] = w2;
    s1[k + 2] = u1;
    s2[k + 2] = u2;
    s1[k + 3] = v1;
    s2[k + 3] = v2;
  }
}
