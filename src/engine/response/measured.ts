// A driver way's measured-response correction (fir/correction.ts), built once per way and system
// and shared by the analysis (its response at any f) and the renderer (its taps per sample rate).
import type { Complex } from '../complex.ts';
import type { DriverWay } from '../system.ts';
import { correctionCurve, correctionResponse, correctionTaps, type CorrectionCurve, type MeasuredResponse } from '../fir/correction.ts';

export interface MeasuredCorrection {
  curve: CorrectionCurve;
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

/**
 * The way's correction against `model` (its drivers' pressure at f), built once per table and
 * per `dependsOn` (everything the model depends on, as plain data).
 */
export function cachedCorrection(way: DriverWay, dependsOn: unknown, model: (f: number) => Complex): MeasuredCorrection | null {
  const m = way.measured;
  if (!m) return null;
  const hit = built.get(m);
  if (hit) return hit;
  const key = JSON.stringify([m, dependsOn]);
  const again = recent.get(key);
  if (again) {
    built.set(m, again);
    return again;
  }
  const curve = correctionCurve(m, model);
  let response: ((f: number) => Complex) | null = null;
  const taps = new Map<number, Float64Array>();
  const correction: MeasuredCorrection = {
    curve,
    at(f) {
      response ??= correctionResponse(curve);
      return response(f);
    },
    taps(rate) {
      let t = taps.get(rate);
      if (!t) {
        t = correctionTaps(curve, rate);
        taps.set(rate, t);
      }
      return t;
    },
  };
  built.set(m, correction);
  recent.set(key, correction);
  if (recent.size > RECENT) recent.delete(recent.keys().next().value!);
  return correction;
}
