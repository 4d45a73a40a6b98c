// A way's measured response drawn beside its curve: the level-matched table as the way would play
// it (through its filter, room gain and drive), so above the blend it lies on the way's curve and
// below it shows how far the measurement and the model part.
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { abs } from '../complex.ts';
import { splDb } from '../units.ts';
import { measuredCorrection, respond } from './frequency.ts';

/** On `freqHz`: the table's level (interpolated) where the table has points, NaN elsewhere; null without a table. */
export function measuredSplOnGrid(system: SpeakerSystem, way: DriverWay, freqHz: ArrayLike<number>, volts: number): Float64Array | null {
  const m = way.measured;
  const c = measuredCorrection(system, way);
  if (!m || !c) return null;
  const first = m.freqHz[0];
  const last = m.freqHz[m.freqHz.length - 1];
  return Float64Array.from(freqHz, (f) =>
    f < first || f > last ? Number.NaN : splDb(abs(respond(system, way, f, volts).pressure)) - c.curve.db(f) + c.curve.deviationDb(f),
  );
}
