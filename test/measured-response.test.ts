// A measured response through the whole path: text table -> design -> correction -> FIR, against a
// response whose minimum-phase form is known in closed form. The measured table is the model's
// own response times a peaking biquad (RBJ Audio EQ Cookbook; poles and zeros inside the unit
// circle, so it is minimum phase and its own phase is the answer), at a level 17 dB off; without
// a phase column the way must come out as the model times that biquad: the correction equals the
// biquad within 0.1 dB and 2° above the blend octave.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../src/engine/design/validate.ts';
import type { DesignDoc } from '../src/engine/design/document.ts';
import type { DriverWay, SpeakerSystem } from '../src/engine/system.ts';
import { measuredCorrection, respond } from '../src/engine/response/frequency.ts';
import { parseResponseTable } from '../src/engine/fir/response-table.ts';
import { abs, arg, div, type Complex } from '../src/engine/complex.ts';

type Biquad = [number, number, number, number, number]; // b0 b1 b2 a1 a2 (a0 = 1)

function peaking(f0: number, q: number, gainDb: number, fs: number): Biquad {
  const a = 10 ** (gainDb / 40);
  const w0 = (2 * Math.PI * f0) / fs;
  const alpha = Math.sin(w0) / (2 * q);
  const a0 = 1 + alpha / a;
  return [(1 + alpha * a) / a0, (-2 * Math.cos(w0)) / a0, (1 - alpha * a) / a0, (-2 * Math.cos(w0)) / a0, (1 - alpha / a) / a0];
}

function biquadAt([b0, b1, b2, a1, a2]: Biquad, f: number, fs: number): Complex {
  const w = (2 * Math.PI * f) / fs;
  const num = { re: b0 + b1 * Math.cos(w) + b2 * Math.cos(2 * w), im: -b1 * Math.sin(w) - b2 * Math.sin(2 * w) };
  const den = { re: 1 + a1 * Math.cos(w) + a2 * Math.cos(2 * w), im: -a1 * Math.sin(w) - a2 * Math.sin(2 * w) };
  return div(num, den);
}

/** The DTFT of FIR taps at f (the definition, summed directly). */
function firAt(taps: Float64Array, f: number, fs: number): Complex {
  const w = (2 * Math.PI * f) / fs;
  let re = 0;
  let im = 0;
  for (let i = 0; i < taps.length; i++) {
    re += taps[i] * Math.cos(w * i);
    im -= taps[i] * Math.sin(w * i);
  }
  return { re, im };
}

const db = (c: Complex) => 20 * Math.log10(abs(c));
const wrapDeg = (rad: number) => {
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

describe('measured response as FIR: the closed-form check', () => {
  const fs = 48000;
  const peak = peaking(2500, 1.2, 6, fs);
  const doc = sealedDoc();
  const model = bareModel(doc);
  const freqs = logSpaced(20, 20000, 400);
  // A table as a measurement program writes it: a header, a comment, decimal commas, 17 dB off.
  const table = [
    '* synthetic: the model times a peaking biquad',
    'Freq(Hz);SPL(dB)',
    ...freqs.map((f) => `${f.toFixed(3).replace('.', ',')};${(db(model(f)) + db(biquadAt(peak, f, fs)) + 17).toFixed(5).replace('.', ',')}`),
  ].join('\n');
  const { system, way } = withMeasured(doc, table, 150);
  const correction = measuredCorrection(system, way)!;

  it('matches the level: the table is 17 dB above the model', () => {
    expect(correction.curve.levelOffsetDb).toBeCloseTo(-17, 1);
  });

  it('the FIR at 48 kHz is the biquad within 0.1 dB and 2° from 300 Hz to 18 kHz, and 1 below the blend', () => {
    const taps = correction.taps(fs);
    let worstDb = 0;
    let worstDeg = 0;
    for (const f of logSpaced(300, 18000, 120)) {
      const h = firAt(taps, f, fs);
      const b = biquadAt(peak, f, fs);
      worstDb = Math.max(worstDb, Math.abs(db(h) - db(b)));
      worstDeg = Math.max(worstDeg, Math.abs(wrapDeg(arg(h) - arg(b))));
    }
    expect(worstDb).toBeLessThan(0.1);
    expect(worstDeg).toBeLessThan(2);
    for (const f of [20, 50, 100]) {
      const h = firAt(taps, f, fs);
      expect(Math.abs(db(h))).toBeLessThan(0.1);
      expect(Math.abs(wrapDeg(arg(h)))).toBeLessThan(2);
    }
    console.log(`closed-form check: ${taps.length} taps, worst ${worstDb.toFixed(4)} dB, ${worstDeg.toFixed(3)}°`);
  });

  it('the analysis reads the same correction: the way is the model times the biquad', () => {
    let worstDb = 0;
    let worstDeg = 0;
    for (const f of logSpaced(300, 18000, 60)) {
      const withIt = respond(system, way, f, 1, false).pressure;
      const plain = respond(system, { ...way, measured: undefined }, f, 1, false).pressure;
      const c = div(withIt, plain);
      const b = biquadAt(peak, f, fs);
      worstDb = Math.max(worstDb, Math.abs(db(c) - db(b)));
      worstDeg = Math.max(worstDeg, Math.abs(wrapDeg(arg(c) - arg(b))));
    }
    expect(worstDb).toBeLessThan(0.1);
    expect(worstDeg).toBeLessThan(2);
    console.log(`analysis: worst ${worstDb.toFixed(4)} dB, ${worstDeg.toFixed(3)}°`);
  });
});
