// A driver way's measured-response correction (fir/correction.ts), built once per way and system
// and shared by the analysis (its response at any f) and the renderer (its taps per sample rate).
import type { Complex } from '../complex.ts';
import type { DriverWay } from '../system.ts';
import { correctionCurve, correctionResponse, correctionTaps, type CorrectionCurve, type MeasuredResponse } from '../fir/correction.ts';

export interface MeasuredCorrection {
  /** Built when first read (the renderer, given its taps, never needs it). */
  readonly curve: CorrectionCurve;
  /** The correction at f (complex), for the small-signal analysis. */
  at(f: number): Complex;
  /** FIR taps at a sample rate, for the renderer. */
  taps(sampleRate: number): Float64Array;
}

// A design's table is read into a new object whenever the design is read (design/convert.ts), and
// kept by the copies of its way that the analysis makes (a hot coil, a way at its limit), so the
// table keys the cache: the correction is built once, against the way as first asked for (the
// design's own way: the analysis and the renderer ask for it before any variant).
const built = new WeakMap<MeasuredResponse, MeasuredCorrection>();
// An edit elsewhere in the design (another way, a filter, the level) reads the table again but
// leaves the correction as it was: the last few are also kept by what they depend on.
const recent = new Map<string, MeasuredCorrection>();
const RECENT = 8;

// Taps built elsewhere (the listening bench builds them on the page and hands them to its audio
// thread, which must not spend tens of milliseconds on them), by table and sample rate.
const given = new WeakMap<MeasuredResponse, Map<number, Float64Array>>();

/** Taps for `table` at `sampleRate`, built elsewhere from the same design: `taps(sampleRate)` returns them. */
export function provideTaps(table: MeasuredResponse, sampleRate: number, taps: Float64Array): void {
  let byRate = given.get(table);
  if (!byRate) {
    byRate = new Map();
    given.set(table, byRate);
  }
  byRate.set(sampleRate, taps);
  // A correction already built for this table would not look here again.
  built.delete(table);
}

/**
 * The way's correction against `model` (its drivers' pressure at f), built once per table and
 * per `dependsOn` (everything the model depends on, as plain data).
 */
export function cachedCorrection(way: DriverWay, dependsOn: unknown, model: (f: number) => Complex): MeasuredCorrection | null {
  const m = way.measured;
  if (!m) return null;
  const hit = built.get(m);
  if (hit) return hit;
  const handed = given.get(m);
  if (handed) {
    const correction = lazyCorrection(model, m, handed);
    built.set(m, correction);
    return correction;
  }
  const key = JSON.stringify([m, dependsOn]);
  const again = recent.get(key);
  if (again) {
    built.set(m, again);
    return again;
  }
  const correction = lazyCorrection(model, m, new Map());
  built.set(m, correction);
  recent.set(key, correction);
  if (recent.size > RECENT) recent.delete(recent.keys().next().value!);
  return correction;
}

/** A correction whose curve, response and taps are built on first use (taps found in `taps` are used as they are). */
function lazyCorrection(model: (f: number) => Complex, m: MeasuredResponse, taps: Map<number, Float64Array>): MeasuredCorrection {
  let curve: CorrectionCurve | null = null;
  let response: ((f: number) => Complex) | null = null;
  return {
    get curve() {
      curve ??= correctionCurve(m, model);
      return curve;
    },
    at(f) {
      response ??= correctionResponse(this.curve);
      return response(f);
    },
    taps(rate) {
      let t = taps.get(rate);
      if (!t) {
        t = correctionTaps(this.curve, rate);
        taps.set(rate, t);
      }
      return t;
    },
  };
}
