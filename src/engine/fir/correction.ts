// A measured response as a correction of a driver way's modelled response.
//
// Correction C(f) = measured(f) / model(f), where model is the small-signal pressure of the way's
// drivers in their box at constant voltage (no filter, no network, no room gain; the baffle step
// included, as a measurement in the cabinet includes it). The measured level is matched to the
// model: the table is shifted by the mean dB difference over the blend octave, so a table in any
// dB reference (any distance, any drive) fits. The correction is faded in over one octave centred
// on the blend frequency fb, in log frequency (a raised cosine of log2 f from fb/√2 to fb·√2),
// applied to the log of C: ln C_blend = w(f)·ln C. Below fb/√2 the way is the model; above fb·√2
// it is the measurement; above the table's last point the correction holds its last value.
//
// Phase: without a phase column, C_blend is the minimum-phase response of |C_blend| (the real
// cepstrum, min-phase.ts); the model's own response is minimum phase, so the way's response is the
// minimum-phase form of the blended magnitude. With a phase column, the measured phase less the
// model's is used, after removing a pure delay (the measurement's time of flight, which the way's
// offset_mm sets instead: the straight-line trend of the excess phase, the measured phase less the
// minimum phase of the measured level, above the blend octave) and the nearest whole turn.
import FFT from 'fft.js';
import { cx, type Complex } from '../complex.ts';
import { minimumPhaseSpectrum } from './min-phase.ts';

export interface MeasuredResponse {
  /** Hz, strictly rising. */
  freqHz: number[];
  /** dB, any reference. */
  splDb: number[];
  /** Degrees, or null for the minimum phase. */
  phaseDeg: number[] | null;
  /** Centre of the blend octave, Hz. */
  blendHz: number;
}

/** Model points per octave when the model is sampled for the correction. */
const MODEL_POINTS_PER_OCTAVE = 48;
/** The rate of the grid the analysis reads the minimum phase from, Hz. */
export const ANALYSIS_RATE = 96_000;
/** FIR taps are cut where the rest of the impulse holds less than this share of its energy (-80 dB: below what a table to 0.001 dB resolves). */
const TAIL_ENERGY = 1e-8;
export const MAX_TAPS = 32_768;

/** The crossfade weight: 0 below fb/√2, 1 above fb·√2, a raised cosine of log2 f between. */
export function blendWeight(f: number, blendHz: number): number {
  const u = Math.log2(f / blendHz);
  if (!(u > -0.5)) return 0;
  if (u >= 0.5) return 1;
  return 0.5 - 0.5 * Math.cos(Math.PI * (u + 0.5));
}

/** Linear interpolation in log2 f over rising abscissae, held at both ends. */
function interpolator(log2f: Float64Array, y: Float64Array): (f: number) => number {
  const n = log2f.length;
  return (f: number) => {
    const x = Math.log2(f);
    if (!(x > log2f[0])) return y[0];
    if (x >= log2f[n - 1]) return y[n - 1];
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (log2f[mid] <= x) lo = mid;
      else hi = mid;
    }
    const t = (x - log2f[lo]) / (log2f[hi] - log2f[lo]);
    return y[lo] + t * (y[hi] - y[lo]);
  };
}

/** Unwraps a phase sequence (rad) so that no step exceeds π. */
function unwrap(ph: ArrayLike<number>): Float64Array {
  const out = new Float64Array(ph.length);
  let turns = 0;
  for (let i = 0; i < ph.length; i++) {
    if (i > 0) {
      const step = ph[i] + turns - out[i - 1];
      turns -= 2 * Math.PI * Math.round(step / (2 * Math.PI));
    }
    out[i] = ph[i] + turns;
  }
  return out;
}

const dbOf = (c: Complex) => 10 * Math.log10(c.re * c.re + c.im * c.im);

export interface CorrectionCurve {
  blendHz: number;
  /** Last frequency of the table, Hz: the correction holds above it. */
  topHz: number;
  /** dB added to the table so that it meets the model over the blend octave. */
  levelOffsetDb: number;
  /** The delay taken out of the measured phase, s (0 without a phase column). */
  removedDelayS: number;
  hasPhase: boolean;
  /** The blended correction's level at f, dB. */
  db(f: number): number;
  /** The level-matched table less the model at f, dB, before the blend (held above the table). */
  deviationDb(f: number): number;
  /** The blended correction's phase at f from the table, rad (0 without a phase column). */
  phase(f: number): number;
}

/** The correction of a model (its complex pressure at any f) by a measured response. */
export function correctionCurve(m: MeasuredResponse, model: (f: number) => Complex): CorrectionCurve {
  const fb = m.blendHz;
  const lowHz = fb / Math.SQRT2;
  const topHz = m.freqHz[m.freqHz.length - 1];
  const octaves = Math.log2(topHz / lowHz);
  const nModel = Math.max(2, Math.ceil(octaves * MODEL_POINTS_PER_OCTAVE) + 1);
  const mLog = new Float64Array(nModel);
  const mDb = new Float64Array(nModel);
  const mPhRaw = new Float64Array(nModel);
  for (let i = 0; i < nModel; i++) {
    mLog[i] = Math.log2(lowHz) + (octaves * i) / (nModel - 1);
    const p = model(2 ** mLog[i]);
    mDb[i] = dbOf(p);
    mPhRaw[i] = Math.atan2(p.im, p.re);
  }
  const modelDb = interpolator(mLog, mDb);
  const tLog = Float64Array.from(m.freqHz, Math.log2);
  const tableDb = interpolator(tLog, Float64Array.from(m.splDb));
  // The level match: the mean difference over the blend octave, sampled evenly in log f.
  const matchPoints = 33;
  let offset = 0;
  for (let i = 0; i < matchPoints; i++) {
    const f = fb * 2 ** (i / (matchPoints - 1) - 0.5);
    offset += modelDb(f) - tableDb(f);
  }
  offset /= matchPoints;
  const hold = (f: number) => Math.min(f, topHz);
  const deviationDb = (f: number) => tableDb(hold(f)) + offset - modelDb(hold(f));
  const db = (f: number) => {
    const w = blendWeight(f, fb);
    return w === 0 ? 0 : w * deviationDb(f);
  };
  const magnitudeOnly: CorrectionCurve = {
    blendHz: fb,
    topHz,
    levelOffsetDb: offset,
    removedDelayS: 0,
    hasPhase: false,
    db,
    deviationDb,
    phase: () => 0,
  };
  if (!m.phaseDeg) return magnitudeOnly;

  const modelPh = interpolator(mLog, unwrap(mPhRaw));
  const tablePh = interpolator(tLog, unwrap(m.phaseDeg.map((d) => (d * Math.PI) / 180)));
  // The measurement's delay: the straight line b·f through its excess phase (its phase less the
  // minimum phase of its level) above the blend octave, by least squares on the model's log grid.
  const minimum = correctionResponse(magnitudeOnly);
  let s1 = 0,
    sf = 0,
    sff = 0,
    sp = 0,
    sfp = 0;
  for (let i = 0; i < nModel; i++) {
    const f = 2 ** mLog[i];
    if (f < fb * Math.SQRT2) continue;
    const c = minimum(f);
    const excess = tablePh(f) - modelPh(f) - Math.atan2(c.im, c.re);
    s1 += 1;
    sf += f;
    sff += f * f;
    sp += excess;
    sfp += f * excess;
  }
  const slope = s1 > 2 ? (s1 * sfp - sf * sp) / (s1 * sff - sf * sf) : 0;
  const diff = (f: number) => tablePh(hold(f)) - modelPh(hold(f)) - slope * hold(f);
  // The whole turn nearest the blend octave's mean (a phase table is known only modulo 2π).
  let mean = 0;
  for (let i = 0; i < matchPoints; i++) mean += diff(fb * 2 ** (i / (matchPoints - 1) - 0.5));
  const turn = 2 * Math.PI * Math.round(mean / matchPoints / (2 * Math.PI));
  const phase = (f: number) => {
    const w = blendWeight(f, fb);
    return w === 0 ? 0 : w * (diff(f) - turn);
  };
  return { ...magnitudeOnly, removedDelayS: -slope / (2 * Math.PI), hasPhase: true, phase };
}

/** FFT size for a correction at rate fs: bins fine enough for the blend octave (24 per half octave). */
function gridSize(c: CorrectionCurve, fs: number): number {
  const spacing = c.blendHz / Math.SQRT2 / 24;
  let n = 1 << 14;
  while (fs / n > spacing && n < 1 << 18) n <<= 1;
  return n;
}

/** The blended correction on bins 0..N/2 of an N-point grid at rate fs. */
export function correctionSpectrum(c: CorrectionCurve, fs: number, n = gridSize(c, fs)): { re: Float64Array; im: Float64Array } {
  const half = n / 2;
  const mag = new Float64Array(half + 1);
  for (let k = 0; k <= half; k++) mag[k] = k === 0 ? 1 : 10 ** (c.db((k * fs) / n) / 20);
  if (!c.hasPhase) return minimumPhaseSpectrum(mag);
  const re = new Float64Array(half + 1);
  const im = new Float64Array(half + 1);
  for (let k = 0; k <= half; k++) {
    // The Nyquist bin of a real response is real.
    const ph = k === 0 || k === half ? 0 : c.phase((k * fs) / n);
    re[k] = mag[k] * Math.cos(ph);
    im[k] = mag[k] * Math.sin(ph);
  }
  return { re, im };
}

/**
 * The correction as FIR taps at rate fs: the inverse FFT of its spectrum, cut where the rest of
 * the impulse holds less than TAIL_ENERGY of its energy (a power of two, at most MAX_TAPS).
 */
export function correctionTaps(c: CorrectionCurve, fs: number): Float64Array {
  const n = gridSize(c, fs);
  const half = n / 2;
  const { re, im } = correctionSpectrum(c, fs, n);
  const fft = new FFT(n);
  const spec = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    const j = k <= half ? k : n - k;
    spec[2 * k] = re[j];
    spec[2 * k + 1] = k <= half ? im[j] : -im[j];
  }
  const h = new Float64Array(2 * n);
  fft.inverseTransform(h, spec);
  let total = 0;
  for (let i = 0; i < n; i++) total += h[2 * i] ** 2;
  const limit = Math.min(MAX_TAPS, half);
  let length = 64;
  let rest = total;
  for (let i = 0; i < length; i++) rest -= h[2 * i] ** 2;
  while (length < limit && rest > TAIL_ENERGY * total) {
    for (let i = length; i < 2 * length; i++) rest -= h[2 * i] ** 2;
    length *= 2;
  }
  const taps = new Float64Array(length);
  for (let i = 0; i < length; i++) taps[i] = h[2 * i];
  return taps;
}

/**
 * The correction at any f for the analysis: its level from the curve, its phase from the table or
 * from the minimum-phase spectrum on a grid at ANALYSIS_RATE (interpolated between bins).
 */
export function correctionResponse(c: CorrectionCurve): (f: number) => Complex {
  if (c.hasPhase)
    return (f) => {
      const a = 10 ** (c.db(f) / 20);
      const ph = c.phase(f);
      return cx(a * Math.cos(ph), a * Math.sin(ph));
    };
  const n = gridSize(c, ANALYSIS_RATE);
  const { re, im } = correctionSpectrum(c, ANALYSIS_RATE, n);
  const phases = unwrap(Array.from(re, (r, k) => Math.atan2(im[k], r)));
  const binHz = ANALYSIS_RATE / n;
  return (f) => {
    const a = 10 ** (c.db(f) / 20);
    const x = Math.min(f / binHz, phases.length - 1);
    const k = Math.min(Math.floor(x), phases.length - 2);
    const ph = phases[k] + (x - k) * (phases[k + 1] - phases[k]);
    return cx(a * Math.cos(ph), a * Math.sin(ph));
  };
}
