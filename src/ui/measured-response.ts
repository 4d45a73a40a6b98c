// The Driver sheet's measured response: reads the user's table through the engine's reader and
// attaches it to a way with its blend frequency, or takes it off (each one undoable step).
import type { DesignDoc, MeasuredResponseDoc } from '../engine/design/document.ts';
import { parseResponseTable, checkBlendCoverage } from '../engine/fir/response-table.ts';

/** Largest table file read in the app. */
export const MAX_RESPONSE_FILE_BYTES = 8 << 20;

export type AttachOutcome = { ok: true; field: MeasuredResponseDoc; points: number; phase: boolean } | { ok: false; message: string };

/** The design field for a table and a blend frequency, or what is wrong with them, in words. */
export function measuredField(text: string, name: string, blendHz: number): AttachOutcome {
  if (!(Number.isFinite(blendHz) && blendHz >= 10 && blendHz <= 20000))
    return { ok: false, message: 'the blend frequency must be a number from 10 to 20000 Hz' };
  const read = parseResponseTable(text);
  if (!read.ok) return { ok: false, message: `${name}, line ${read.line}: ${read.message}` };
  const uncovered = checkBlendCoverage(read.table.freqHz, blendHz);
  if (uncovered) return { ok: false, message: `${name} ${uncovered}` };
  const t = read.table;
  return {
    ok: true,
    points: t.freqHz.length,
    phase: t.phaseDeg !== null,
    field: {
      blend_hz: blendHz,
      freq_hz: t.freqHz,
      spl_db: t.splDb,
      ...(t.phaseDeg ? { phase_deg: t.phaseDeg } : {}),
      source: name.slice(0, 200),
    },
  };
}

/** The design with way `index` (a driver way) given the measured response, or without one (null). */
export function designWithMeasured(design: DesignDoc, index: number, field: MeasuredResponseDoc | null): DesignDoc {
  const ways = design.ways.map((w, i) => {
    if (i !== index || w.kind !== 'driver') return w;
    const { measured_response: _old, ...rest } = w;
    return field ? { ...rest, measured_response: field } : rest;
  });
  return { ...design, ways };
}
