// Helpers of the measured-response tests: the closed forms they compare with (a biquad's response,
// the DTFT of FIR taps by its definition) and a design with a measured table attached.
import { readFileSync } from 'node:fs';
import { parseDesign } from '../../src/engine/design/validate.ts';
import type { DesignDoc } from '../../src/engine/design/document.ts';
import type { DriverWay, SpeakerSystem } from '../../src/engine/system.ts';
import { respond } from '../../src/engine/response/frequency.ts';
import { parseResponseTable } from '../../src/engine/fir/response-table.ts';
import { abs, div, type Complex } from '../../src/engine/complex.ts';

export type Biquad = [number, number, number, number, number]; // b0 b1 b2 a1 a2 (a0 = 1)

export function peaking(f0: number, q: number, gainDb: number, fs: number): Biquad {
  const a = 10 ** (gainDb / 40);
  const w0 = (2 * Math.PI * f0) / fs;
  const alpha = Math.sin(w0) / (2 * q);
  const a0 = 1 + alpha / a;
  return [(1 + alpha * a) / a0, (-2 * Math.cos(w0)) / a0, (1 - alpha * a) / a0, (-2 * Math.cos(w0)) / a0, (1 - alpha / a) / a0];
}

export function biquadAt([b0, b1, b2, a1, a2]: Biquad, f: number, fs: number): Complex {
  const w = (2 * Math.PI * f) / fs;
  const num = { re: b0 + b1 * Math.cos(w) + b2 * Math.cos(2 * w), im: -b1 * Math.sin(w) - b2 * Math.sin(2 * w) };
  const den = { re: 1 + a1 * Math.cos(w) + a2 * Math.cos(2 * w), im: -a1 * Math.sin(w) - a2 * Math.sin(2 * w) };
  return div(num, den);
}

/** The DTFT of FIR taps at f (the definition, summed directly). */
export function firAt(taps: Float64Array, f: number, fs: number): Complex {
  const w = (2 * Math.PI * f) / fs;
  let re = 0;
  let im = 0;
  for (let i = 0; i < taps.length; i++) {
    re += taps[i] * Math.cos(w * i);
    im -= taps[i] * Math.sin(w * i);
  }
  return { re, im };
}

export const db = (c: Complex) => 20 * Math.log10(abs(c));
export const wrapDeg = (rad: number) => {
  const d = (rad * 180) / Math.PI;
  return d - 360 * Math.round(d / 360);
};

export function sealedDoc(): DesignDoc {
  const parsed = parseDesign(readFileSync('public/examples/living-room-sealed.json', 'utf8'));
  if (!parsed.ok) throw new Error('example does not parse');
  return parsed.design;
}

/** The bare model of way 0 (no filter, no room gain), as the correction's definition names it. */
export function bareModel(doc: DesignDoc): (f: number) => Complex {
  const bare = structuredClone(doc);
  const way = bare.ways[0];
  if (way.kind !== 'driver') throw new Error('way 0 has no driver');
  way.filter = undefined;
  const parsed = parseDesign(bare);
  if (!parsed.ok) throw new Error('bare design does not parse');
  const sys = parsed.system;
  return (f) => respond(sys, sys.ways[0] as DriverWay, f, 1, false).pressure;
}

/** Log-spaced frequencies from lo to hi, `count` points. */
export const logSpaced = (lo: number, hi: number, count: number) =>
  Array.from({ length: count }, (_, i) => lo * (hi / lo) ** (i / (count - 1)));

export function withMeasured(doc: DesignDoc, text: string, blendHz: number): { system: SpeakerSystem; way: DriverWay } {
  const read = parseResponseTable(text);
  if (!read.ok) throw new Error(`table: line ${read.line}: ${read.message}`);
  const next = structuredClone(doc);
  const way = next.ways[0];
  if (way.kind !== 'driver') throw new Error('way 0 has no driver');
  way.measured_response = {
    blend_hz: blendHz,
    freq_hz: read.table.freqHz,
    spl_db: read.table.splDb,
    ...(read.table.phaseDeg ? { phase_deg: read.table.phaseDeg } : {}),
  };
  const parsed = parseDesign(next);
  if (!parsed.ok) throw new Error(parsed.errors.map((e) => `${e.path}: ${e.message}`).join('; '));
  return { system: parsed.system, way: parsed.system.ways[0] as DriverWay };
}
