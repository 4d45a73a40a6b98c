// Two-tone intermodulation from the large-signal model, in steady state.
// The method: a low tone f1 and a high tone f2 at 4:1 amplitude (SMPTE RP 120's ratio), together
// at the peak of a sine at the given drive (A1 + A2 = sqrt(2)·V), through the way's filter, run
// until the transient has died, then analysed over whole periods of their common base frequency.
// The figures, IEC 60268-5's modulation distortion (value from memory: that standard's definition,
// order n from the sideband pair f2 ± (n-1)·f1 summed arithmetically, relative to f2):
//   IM2 = (|P(f2 - f1)| + |P(f2 + f1)|) / |P(f2)|
//   IM3 = (|P(f2 - 2f1)| + |P(f2 + 2f1)|) / |P(f2)|
//   total = sqrt(IM2^2 + IM3^2), each as a percent and in dB (20·log10 of the ratio),
// and each product alone in dB relative to f2. A quadratic term in the model makes IM2, a cubic IM3.
// f2 must not be a whole multiple of f1: a harmonic of the low tone would then sit on a product.
import { abs, add, cx, hypot, type Complex } from '../complex.ts';
import { wayFilterAt } from '../filters/way-filter.ts';
import { wayPressure } from '../response/frequency.ts';
import { wooferParams } from '../sim/params.ts';
import { WooferSim } from '../sim/woofer.ts';
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { toSeat } from './stepped-sine.ts';

/** The low tone's amplitude over the high tone's (SMPTE RP 120 uses 4:1). */
export const TONE_RATIO = 4;

/** The products, by their offset from f2 in multiples of f1. */
export const PRODUCT_OFFSETS = [-2, -1, 1, 2] as const;

export interface IntermodulationFigure {
  f1Hz: number;
  f2Hz: number;
  /** Second- and third-order modulation distortion and their root sum of squares, percent. */
  im2Pct: number;
  im3Pct: number;
  totalPct: number;
  /** The same in dB relative to f2. */
  im2Db: number;
  im3Db: number;
  totalDb: number;
  /** Each product f2 + k·f1 (k = -2, -1, 1, 2) relative to f2, dB. */
  productsDb: { offset: number; freqHz: number; db: number }[];
}

/** A message naming what is wrong with the pair, or null when it can be measured. */
export function checkTonePair(f1Hz: number, f2Hz: number): string | null {
  if (!Number.isFinite(f1Hz) || !Number.isFinite(f2Hz)) return 'both tone frequencies must be numbers';
  const a = Math.round(f1Hz);
  const b = Math.round(f2Hz);
  if (a < 10 || a > 2000) return `the low tone must be between 10 and 2000 Hz (got ${f1Hz} Hz)`;
  if (b > 20000) return `the high tone must be at most 20000 Hz (got ${f2Hz} Hz)`;
  if (b < 3 * a) return `the high tone must be at least three times the low tone (got ${f1Hz} and ${f2Hz} Hz)`;
  if (b % a === 0)
    return `the high tone (${b} Hz) is a whole multiple of the low tone (${a} Hz), so the low tone's harmonics would sit on the products: move it a few hertz`;
  return null;
}

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

/** The analysis grid of a pair: both tones rounded to whole hertz, their common base frequency. */
export function toneGrid(f1Hz: number, f2Hz: number) {
  const f1 = Math.round(f1Hz);
  const f2 = Math.round(f2Hz);
  const base = gcd(f1, f2);
  // At least 192 kHz and 16 samples per period of the highest product.
  const perBase = Math.max(Math.ceil(192000 / base), Math.ceil((16 * (f2 + 2 * f1)) / base));
  // Whole base periods covering at least 8 periods of the low tone.
  const periods = Math.max(1, Math.ceil((8 * base) / f1));
  return { f1, f2, base, k1: f1 / base, k2: f2 / base, perBase, fs: perBase * base, periods };
}

/** The peak phasor of bin k (k cycles per `perPeriod` samples) over `periods` periods from `start`. */
export function binPhasor(x: ArrayLike<number>, start: number, perPeriod: number, periods: number, k: number): Complex {
  const n = perPeriod * periods;
  const w = (2 * Math.PI * k) / perPeriod;
  // A rotating phasor with a periodic re-anchor: one cos/sin per 4096 samples keeps it accurate.
  let c = 0;
  let s = 0;
  let cr = 1;
  let sr = 0;
  const cw = Math.cos(w);
  const sw = Math.sin(w);
  for (let i = 0; i < n; i++) {
    if ((i & 4095) === 0) {
      cr = Math.cos(w * i);
      sr = Math.sin(w * i);
    }
    const v = x[start + i];
    c += v * cr;
    s += v * sr;
    const t = cr * cw - sr * sw;
    sr = sr * cw + cr * sw;
    cr = t;
  }
  return cx((2 * c) / n, (-2 * s) / n);
}

/** The figure from the magnitudes at f2 and at the four products (order of PRODUCT_OFFSETS). */
export function imFigureOf(f1Hz: number, f2Hz: number, atF2: number, products: number[]): IntermodulationFigure {
  const im2 = (products[1] + products[2]) / atF2;
  const im3 = (products[0] + products[3]) / atF2;
  const total = hypot(im2, im3);
  const db = (r: number) => 20 * Math.log10(Math.max(r, 1e-15));
  return {
    f1Hz,
    f2Hz,
    im2Pct: 100 * im2,
    im3Pct: 100 * im3,
    totalPct: 100 * total,
    im2Db: db(im2),
    im3Db: db(im3),
    totalDb: db(total),
    productsDb: PRODUCT_OFFSETS.map((k, i) => ({ offset: k, freqHz: f2Hz + k * f1Hz, db: db(products[i] / atF2) })),
  };
}

/** The figure of a signal sampled on a pair's grid (x holds `periods` base periods from `start`). */
export function imOfSignal(x: ArrayLike<number>, start: number, g: ReturnType<typeof toneGrid>): IntermodulationFigure {
  const at = (k: number) => abs(binPhasor(x, start, g.perBase, g.periods, k));
  return imFigureOf(
    g.f1,
    g.f2,
    at(g.k2),
    PRODUCT_OFFSETS.map((o) => at(g.k2 + o * g.k1)),
  );
}

/** The two-tone drive of a way at `voltsRms` peak-equivalent: sample i of the filtered tones. */
export function twoToneDrive(way: DriverWay, g: ReturnType<typeof toneGrid>, voltsRms: number) {
  const peak = Math.SQRT2 * voltsRms;
  const a2 = peak / (TONE_RATIO + 1);
  const a1 = TONE_RATIO * a2;
  const tone = (f: number, a: number) => {
    const h = wayFilterAt(way.filter, 2 * Math.PI * f);
    return { amp: a * abs(h), phase: Math.atan2(h.im, h.re), w: (2 * Math.PI * f) / g.fs };
  };
  return { low: tone(g.f1, a1), high: tone(g.f2, a2) };
}

export interface WayIntermodulation {
  /** The driver model's own output (for checks against the model). */
  model: IntermodulationFigure;
  /** Rms phasors at the seat at f2 and the four products (order of PRODUCT_OFFSETS), Pa. */
  atSeatF2: Complex;
  atSeatProducts: Complex[];
  point: IntermodulationFigure;
}

/** One driver way's two-tone figure in steady state. */
export function wayIntermodulation(
  system: SpeakerSystem,
  way: DriverWay,
  f1Hz: number,
  f2Hz: number,
  voltsRms: number,
): WayIntermodulation {
  const g = toneGrid(f1Hz, f2Hz);
  const sim = new WooferSim(wooferParams(system, way, 1 / g.fs));
  const { low, high } = twoToneDrive(way, g, voltsRms);
  // Settle for 0.4 s or 40 periods of the low tone, whichever is longer, the first 10 faded in.
  const perLow = g.fs / g.f1;
  const settle = Math.ceil(Math.max(0.4 * g.fs, 40 * perLow) / g.perBase) * g.perBase;
  const fade = Math.round(10 * perLow);
  const n = g.perBase * g.periods;
  const y = new Float64Array(n);
  for (let i = 0; i < settle + n; i++) {
    const env = i < fade ? 0.5 - 0.5 * Math.cos((Math.PI * i) / fade) : 1;
    const u = env * (low.amp * Math.cos(low.w * i + low.phase) + high.amp * Math.cos(high.w * i + high.phase));
    const p = sim.step(u);
    if (i >= settle) y[i - settle] = p;
  }
  const bin = (k: number) => binPhasor(y, 0, g.perBase, g.periods, k);
  const hF2 = bin(g.k2);
  const hProducts = PRODUCT_OFFSETS.map((o) => bin(g.k2 + o * g.k1));
  const model = imFigureOf(g.f1, g.f2, abs(hF2), hProducts.map(abs));
  const atSeatF2 = toSeat(system, way, hF2, g.f2);
  const atSeatProducts = hProducts.map((h, i) => toSeat(system, way, h, g.f2 + PRODUCT_OFFSETS[i] * g.f1));
  const point = imFigureOf(g.f1, g.f2, abs(atSeatF2), atSeatProducts.map(abs));
  return { model, atSeatF2, atSeatProducts, point };
}

export interface IntermodulationResult {
  voltsRms: number;
  ways: { name: string; figure: IntermodulationFigure }[];
  /** Every way at the seat: products add as phasors; flat ways add their (clean) high tone. */
  sum: IntermodulationFigure;
}

/** Every driver way and the sum at the seat, for the pair at `voltsRms` peak-equivalent. */
export function intermodulation(system: SpeakerSystem, f1Hz: number, f2Hz: number, voltsRms: number): IntermodulationResult {
  const problem = checkTonePair(f1Hz, f2Hz);
  if (problem) throw new Error(problem);
  const g = toneGrid(f1Hz, f2Hz);
  const ways: IntermodulationResult['ways'] = [];
  let f2Sum = cx(0);
  let products: Complex[] = PRODUCT_OFFSETS.map(() => cx(0));
  const highVolts = voltsRms / (TONE_RATIO + 1);
  for (const way of system.ways) {
    if (way.kind !== 'driver') {
      f2Sum = add(f2Sum, wayPressure(system, way, g.f2, highVolts));
      continue;
    }
    const r = wayIntermodulation(system, way, g.f1, g.f2, voltsRms);
    ways.push({ name: way.name, figure: r.point });
    f2Sum = add(f2Sum, r.atSeatF2);
    products = products.map((p, i) => add(p, r.atSeatProducts[i]));
  }
  return { voltsRms, ways, sum: imFigureOf(g.f1, g.f2, abs(f2Sum), products.map(abs)) };
}
