// One step of a sweep: a design variant analysed and probed for headroom on the track.
// Pure apart from its inputs; runs in a worker thread or in the main thread alike.
import { parseDesign } from '../engine/design/validate.ts';
import { analyze } from '../engine/response/analyze.ts';
import { findHeadroom } from '../engine/render/index.ts';
import type { DesignDoc } from '../engine/design/document.ts';

export interface SweepPoint {
  vb_l: number;
  fb_hz: number | null;
}

export interface SweepRow extends SweepPoint {
  f3_hz: number | null;
  clean_spl_db: number | null;
  clean_volts: number | null;
  first_limit: string | null;
  first_limit_s: number | null;
  /** Why this step has no numbers (an impossible variant). */
  error: string | null;
}

export function variant(design: DesignDoc, point: SweepPoint): DesignDoc {
  const box = { ...design.box, vb_l: point.vb_l } as DesignDoc['box'];
  if (point.fb_hz !== null && box.type === 'vented') box.fb_hz = point.fb_hz;
  return { ...design, box };
}

export function sweepStep(design: DesignDoc, point: SweepPoint, channels: Float32Array[], sampleRate: number): SweepRow {
  const empty = { f3_hz: null, clean_spl_db: null, clean_volts: null, first_limit: null, first_limit_s: null };
  const parsed = parseDesign(variant(design, point));
  if (!parsed.ok) return { ...point, ...empty, error: parsed.errors.map((e) => `${e.path}: ${e.message}`).join('; ') };
  const f3 = analyze(parsed.system).figures.f3Hz;
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
