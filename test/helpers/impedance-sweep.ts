// Synthetic impedance sweeps of an invented driver, written from its mechanical elements (Bl, Mms,
// Cms, Rms, the coil) independently of the fit's own model, with seeded noise.
import { airAt } from '../../src/engine/air.ts';
import type { ImpedanceTable } from '../../src/engine/fit/impedance-table.ts';

export const air = airAt();
export const rhoC2 = air.rho * air.c * air.c;

/** An invented 6.5-inch woofer. */
export const D = { re: 5.8, le: 0.35e-3, l2: 0.9e-3, r2: 6.5, bl: 7.2, mms: 0.022, cms: 0.65e-3, rms: 1.1, sd: 0.0133 };
const ws = 1 / Math.sqrt(D.mms * D.cms);
export const truth = {
  fs: ws / (2 * Math.PI),
  qes: (ws * D.mms * D.re) / D.bl ** 2,
  qms: (ws * D.mms) / D.rms,
  vas: rhoC2 * D.sd ** 2 * D.cms,
};

/** Seeded uniform numbers (mulberry32) and Box–Muller normals, so the noise is the same every run. */
function normals(seed: number): () => number {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(uniform() + 1e-300)) * Math.cos(2 * Math.PI * uniform());
}

/**
 * A sweep from 10 Hz to 20 kHz, 24 points an octave: Z = Re + jwLe + (jwL2 || R2) + Bl^2/Zm, with
 * Zm = Rms + jwM + 1/(jwC). Noise: each point multiplied by (1 + n1 + j·n2), n1, n2 normal with a
 * standard deviation of `noise` (0.5% by default: a careful bench measurement).
 */
export function sweep(opts: { mms?: number; cms?: number; noise?: number; seed?: number; phase?: boolean } = {}): ImpedanceTable {
  const { mms = D.mms, cms = D.cms, noise = 0.005, seed = 7, phase = true } = opts;
  const n = normals(seed);
  const freq: number[] = [];
  const magnitude: number[] = [];
  const phaseDeg: number[] = [];
  for (let k = 0; k <= 11 * 24; k++) {
    const f = 10 * 2 ** (k / 24);
    const w = 2 * Math.PI * f;
    // L2 || R2: jwL2·R2/(R2 + jwL2)
    const den = D.r2 ** 2 + (w * D.l2) ** 2;
    const semiRe = (D.r2 * (w * D.l2) ** 2) / den;
    const semiIm = (w * D.l2 * D.r2 ** 2) / den;
    const xm = w * mms - 1 / (w * cms);
    const zmDen = D.rms ** 2 + xm ** 2;
    const motRe = (D.bl ** 2 * D.rms) / zmDen;
    const motIm = -(D.bl ** 2 * xm) / zmDen;
    let re = D.re + semiRe + motRe;
    let im = w * D.le + semiIm + motIm;
    const n1 = noise * n();
    const n2 = noise * n();
    [re, im] = [re * (1 + n1) - im * n2, im * (1 + n1) + re * n2];
    freq.push(f);
    magnitude.push(Math.hypot(re, im));
    phaseDeg.push((Math.atan2(im, re) * 180) / Math.PI);
  }
  return { freq, magnitude, phaseDeg: phase ? phaseDeg : null };
}

/** A sweep as a text table with a header: frequency, |Z|, phase. */
export const sweepText = (t: ImpedanceTable): string =>
  `Freq (Hz)\tImpedance (Ohm)\tPhase (deg)\n${t.freq.map((f, i) => `${f.toFixed(4)}\t${t.magnitude[i].toFixed(5)}\t${t.phaseDeg?.[i].toFixed(4) ?? 0}`).join('\n')}\n`;
