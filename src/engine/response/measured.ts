// A driver way's measured-response correction (fir/correction.ts), built once per way and system
// and shared by the analysis (its response at any f) and the renderer (its taps per sample rate).
import type { Complex } from '../complex.ts';
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { correctionCurve, correctionResponse, correctionTaps, type CorrectionCurve } from '../fir/correction.ts';

export interface MeasuredCorrection {
  curve: CorrectionCurve;
  /** The correction at f (complex), for the small-signal analysis. */
  at(f: number): Complex;
  /** FIR taps at a sample rate, for the renderer. */
  taps(sampleRate: number): Float64Array;
}

interface Entry {
  system: SpeakerSystem;
  correction: MeasuredCorrection;
}

// Ways and systems are rebuilt, never edited, when a design changes, so they key the cache.
const built = new WeakMap<DriverWay, Entry>();

/** The way's correction against `model` (its drivers' pressure at f), from the cache when the system is the same. */
export function cachedCorrection(system: SpeakerSystem, way: DriverWay, model: (f: number) => Complex): MeasuredCorrection | null {
  const m = way.measured;
  if (!m) return null;
  const hit = built.get(way);
  if (hit && hit.system === system) return hit.correction;
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
      if (!t) taps.set(rate, (t = correctionTaps(curve, rate)));
      return t;
    },
  };
  built.set(way, { system, correction });
  return correction;
}
