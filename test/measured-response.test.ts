// A measured response through the whole path: text table -> design -> correction -> FIR, against a
// response whose minimum-phase form is known in closed form. The measured table is the model's
// own response times a peaking biquad (RBJ Audio EQ Cookbook; poles and zeros inside the unit
// circle, so it is minimum phase and its own phase is the answer), at a level 17 dB off; without
// a phase column the way must come out as the model times that biquad: the correction equals the
// biquad within 0.1 dB and 2° above the blend octave.
import { describe, expect, it } from 'vitest';
import { measuredCorrection, respond } from '../src/engine/response/frequency.ts';
import { arg, div } from '../src/engine/complex.ts';
import { bareModel, biquadAt, db, firAt, logSpaced, peaking, sealedDoc, withMeasured, wrapDeg } from './helpers/measured.ts';

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
    ...freqs.map(
      (f) => `${f.toFixed(3).replace('.', ',')};${(db(model(f)) + db(biquadAt(peak, f, fs)) + 17).toFixed(5).replace('.', ',')}`,
    ),
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

describe('measured response with a phase column', () => {
  const fs = 48000;
  const peak = peaking(2500, 1.2, 6, fs);
  const doc = sealedDoc();
  const model = bareModel(doc);
  const freqs = logSpaced(20, 20000, 600);
  // The measurement's time of flight: 0.25 ms on top of the model and the biquad, wrapped to ±180°.
  const tau = 0.25e-3;
  const table = [
    'Hz dB deg',
    ...freqs.map((f) => {
      const ph = arg(model(f)) + arg(biquadAt(peak, f, fs)) - 2 * Math.PI * f * tau;
      return `${f} ${db(model(f)) + db(biquadAt(peak, f, fs)) - 6} ${wrapDeg(ph)}`;
    }),
  ].join('\n');
  const { system, way } = withMeasured(doc, table, 150);
  const correction = measuredCorrection(system, way)!;

  it('removes the time of flight and keeps the biquad: analysis and FIR within 0.1 dB and 2°', () => {
    expect(correction.curve.removedDelayS * 1e3).toBeCloseTo(tau * 1e3, 2);
    const taps = correction.taps(fs);
    let worstDb = 0;
    let worstDeg = 0;
    for (const f of logSpaced(300, 18000, 80)) {
      const b = biquadAt(peak, f, fs);
      for (const c of [correction.at(f), firAt(taps, f, fs)]) {
        worstDb = Math.max(worstDb, Math.abs(db(c) - db(b)));
        worstDeg = Math.max(worstDeg, Math.abs(wrapDeg(arg(c) - arg(b))));
      }
    }
    expect(worstDb).toBeLessThan(0.1);
    expect(worstDeg).toBeLessThan(2);
    console.log(
      `with phase: ${taps.length} taps, delay ${(correction.curve.removedDelayS * 1e3).toFixed(4)} ms, worst ${worstDb.toFixed(4)} dB, ${worstDeg.toFixed(3)}°`,
    );
  });
});

describe('the correction is built again only when what it depends on changes', () => {
  const doc = sealedDoc();
  const model = bareModel(doc);
  const table = ['Hz dB', ...logSpaced(20, 20000, 200).map((f) => `${f} ${db(model(f)) + (f > 3000 ? 2 : 0)}`)].join('\n');
  it('an edit of the filter or another way keeps it; an edit of the box builds a new one', () => {
    const first = withMeasured(doc, table, 300);
    const c1 = measuredCorrection(first.system, first.way);
    const filtered = structuredClone(doc);
    if (filtered.ways[0].kind === 'driver') filtered.ways[0].filter = { type: 'active', gain_db: -3 };
    filtered.ways.push({ ...structuredClone(filtered.ways[0]), name: 'second woofer' });
    const second = withMeasured(filtered, table, 300);
    expect(second.way.measured).not.toBe(first.way.measured);
    expect(measuredCorrection(second.system, second.way)).toBe(c1);
    const bigger = structuredClone(doc);
    const w = bigger.ways[0];
    if (w.kind === 'driver' && w.box.type === 'sealed') w.box.vb_l = 20;
    const third = withMeasured(bigger, table, 300);
    expect(measuredCorrection(third.system, third.way)).not.toBe(c1);
  });
});
