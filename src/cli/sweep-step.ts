// One step of a sweep: a design variant analysed and probed for headroom on the track.
// Pure apart from its inputs; runs in a worker thread or in the main thread alike.
import { parseDesign } from '../engine/design/validate.ts';
import { HALF_POWER_DB, rolloffHz } from '../engine/response/analyze.ts';
import { findHeadroom } from '../engine/render/index.ts';
import type { DesignDoc } from '../engine/design/document.ts';
import { variant, type SweepPoint } from './sweep-variant.ts';

export type { SweepPoint };

export interface SweepRow extends SweepPoint {
  f3_hz: number | null;
  clean_spl_db: number | null;
  clean_volts: number | null;
  first_limit: string | null;
  first_limit_s: number | null;
  /** Why this step has no numbers (an impossible variant). */
  error: string | null;
}

/** One step: the swept way's f3 and the whole design's headroom on the track. */
export function sweepStep(design: DesignDoc, wayIndex: number, point: SweepPoint, channels: Float32Array[], sampleRate: number): SweepRow {
  const empty = { f3_hz: null, clean_spl_db: null, clean_volts: null, first_limit: null, first_limit_s: null };
  const parsed = parseDesign(variant(design, point, wayIndex));
  if (!parsed.ok) return { ...point, ...empty, error: parsed.errors.map((e) => `${e.path}: ${e.message}`).join('; ') };
  const way = parsed.system.ways[wayIndex];
  if (way.kind !== 'driver') throw new Error('the swept way has a driver');
  const f3 = rolloffHz(parsed.system, way, HALF_POWER_DB);
  try {
    const h = findHeadroom(parsed.system, channels, sampleRate);
    return {
      ...point,
      f3_hz: Number(f3.toPrecision(4)),
      clean_spl_db: h.clean_spl_db,
      clean_volts: h.clean_volts,
      first_limit: h.first_limit,
      first_limit_s: h.first_limit_s,
      error: null,
    };
  } catch (e) {
    return { ...point, ...empty, f3_hz: Number(f3.toPrecision(4)), error: (e as Error).message };
  }
}
