// Rational analog transfer functions: polynomial arithmetic, roots, and conversion to biquads.
// Polynomials are number[] in ascending powers of s: [c0, c1, c2, ...].
import { bilinearK, bilinearSection, packSections, type AnalogSection } from './biquad.ts';
import { hypot } from '../complex.ts';

export type Poly = number[];

export function polyMul(a: Poly, b: Poly): Poly {
  const out = new Array<number>(a.length + b.length - 1).fill(0);
  for (let i = 0; i < a.length; i++) for (let j = 0; j < b.length; j++) out[i + j] += a[i] * b[j];
  return out;
}

export function polyAdd(a: Poly, b: Poly): Poly {
  const n = Math.max(a.length, b.length);
  const out = new Array<number>(n).fill(0);
  for (let i = 0; i < n; i++) out[i] = (a[i] ?? 0) + (b[i] ?? 0);
  return out;
}

export function polyScale(a: Poly, k: number): Poly {
  return a.map((c) => c * k);
}

/** Drops zero leading (highest-power) coefficients. */
export function polyTrim(a: Poly): Poly {
  const out = a.slice();
  while (out.length > 1 && out[out.length - 1] === 0) out.pop();
  return out;
}

/** Value at s = (re, im). */
export function polyEval(a: Poly, re: number, im: number): [number, number] {
  let pr = 0,
    pi = 0;
  for (let k = a.length - 1; k >= 0; k--) {
    const r = pr * re - pi * im + a[k];
    pi = pr * im + pi * re;
    pr = r;
  }
  return [pr, pi];
}

export interface Root {
  re: number;
  im: number;
}

/**
 * All complex roots (Durand-Kerner with Newton polishing). The variable is scaled first so that the
 * roots are of order one: loudspeaker polynomials span 10 Hz to 100 kHz and would lose precision.
 * Exact zeros at s = 0 (common: high-pass numerators) are split off before the iteration.
 */
export function polyRoots(pIn: Poly): Root[] {
  let p = polyTrim(pIn);
  const roots: Root[] = [];
  while (p.length > 1 && p[0] === 0) {
    roots.push({ re: 0, im: 0 });
    p = p.slice(1);
  }
  const n = p.length - 1;
  if (n <= 0) return roots;
  const scale = Math.pow(Math.abs(p[0] / p[n]), 1 / n) || 1;
  const q = p.map((c, k) => (c * Math.pow(scale, k)) / (p[n] * Math.pow(scale, n)));
  const zr = new Float64Array(n),
    zi = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const ang = (2 * Math.PI * k) / n + 0.4;
    zr[k] = 0.9 * Math.cos(ang);
    zi[k] = 0.9 * Math.sin(ang);
  }
  for (let it = 0; it < 2000; it++) {
    let moved = 0;
    for (let k = 0; k < n; k++) {
      let [nr, ni] = polyEval(q, zr[k], zi[k]);
      let dr = 1,
        di = 0;
      for (let j = 0; j < n; j++) {
        if (j === k) continue;
        const er = zr[k] - zr[j],
          ei = zi[k] - zi[j];
        const r = dr * er - di * ei;
        di = dr * ei + di * er;
        dr = r;
      }
      const d2 = dr * dr + di * di || 1e-300;
      const cr = (nr * dr + ni * di) / d2,
        ci = (ni * dr - nr * di) / d2;
      zr[k] -= cr;
      zi[k] -= ci;
      moved = Math.max(moved, hypot(cr, ci));
    }
    if (moved < 1e-15) break;
  }
  for (let k = 0; k < n; k++) {
    let re = zr[k] * scale,
      im = zi[k] * scale;
    if (Math.abs(im) < 1e-9 * hypot(re, im)) im = 0;
    roots.push({ re, im });
  }
  return roots;
}

/** Groups roots into real quadratics [c0, c1, c2] (conjugate pairs, or two real roots) and at most one linear factor. */
function rootsToFactors(roots: Root[]): Poly[] {
  const cplx = roots.filter((r) => r.im > 0);
  const reals = roots.filter((r) => r.im === 0).sort((a, b) => Math.abs(a.re) - Math.abs(b.re));
  const out: Poly[] = cplx.map((r) => [r.re * r.re + r.im * r.im, -2 * r.re, 1]);
  for (let k = 0; k + 1 < reals.length; k += 2) out.push([reals[k].re * reals[k + 1].re, -(reals[k].re + reals[k + 1].re), 1]);
  if (reals.length % 2 === 1) out.push([-reals[reals.length - 1].re, 1]);
  return out;
}

/**
 * num(s)/den(s) -> digital biquads by the bilinear transform (optionally prewarped at fWarp).
 * Returns packed sections and an overall gain.
 */
export function rationalToBiquads(num: Poly, den: Poly, sampleRate: number, fWarp?: number): { coef: Float64Array; gain: number } {
  let n = polyTrim(num),
    d = polyTrim(den);
  // Cancel common factors of s exactly (a lossless sealed box has one).
  while (n.length > 1 && d.length > 1 && n[0] === 0 && d[0] === 0) {
    n = n.slice(1);
    d = d.slice(1);
  }
  const zf = rootsToFactors(polyRoots(n));
  const pf = rootsToFactors(polyRoots(d));
  // Order: poles by natural frequency; zeros handed out in the same order.
  pf.sort((a, b) => a[0] / (a[2] ?? a[1]) - b[0] / (b[2] ?? b[1]));
  zf.sort((a, b) => Math.abs(a[0]) - Math.abs(b[0]));
  const k = bilinearK(sampleRate, fWarp);
  const sections: Float64Array[] = [];
  const nSec = Math.max(pf.length, zf.length);
  for (let s = 0; s < nSec; s++) {
    const zp = zf[s] ?? [1];
    const pp = pf[s] ?? [1];
    const sec: AnalogSection = {
      b: [zp[0], zp[1] ?? 0, zp[2] ?? 0],
      a: [pp[0], pp[1] ?? 0, pp[2] ?? 0],
    };
    sections.push(bilinearSection(sec, k));
  }
  // Gain: the factors are monic, so the leading coefficient ratio is what remains.
  const gain = n[n.length - 1] / d[d.length - 1];
  return { coef: packSections(sections), gain };
}
