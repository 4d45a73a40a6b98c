// Second-order sections (biquads) in direct form II transposed, Float64 state.
// A section is 5 numbers [b0, b1, b2, a1, a2] with a0 = 1; a cascade packs them in one Float64Array.

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

  /** Whole block, section by section (cache-friendly for long buffers). */
  processInPlace(buf: Float64Array | Float32Array, start = 0, end = buf.length): void {
    const c = this.coef;
    const g = this.gain;
    if (g !== 1) for (let j = start; j < end; j++) buf[j] *= g;
    for (let k = 0, o = 0; k < this.n; k++, o += 5) {
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
