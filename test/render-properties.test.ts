// Properties of the renderer over random valid designs (fast-check, from npm): the output is
// finite and under full scale at any level up to and past amplifier clipping; with no input the
// model comes back to rest; and stress only grows with level (peak excursion does not fall, and
// every kind of event seen at one level is still there 6 dB higher).
import { describe, it } from 'vitest';
import fc from 'fast-check';
import { createRenderer, renderBuffer } from '../src/engine/render/index.ts';
import { radiatorBox, sealedBox, system, ventedBox, wooferOf } from './sim-fixtures.ts';

const design = fc.record({
  box: fc.constantFrom('sealed', 'vented', 'passive-radiator'),
  fs: fc.double({ min: 20, max: 80, noNaN: true }),
  qes: fc.double({ min: 0.25, max: 0.9, noNaN: true }),
  vasL: fc.double({ min: 5, max: 120, noNaN: true }),
  vbL: fc.double({ min: 8, max: 80, noNaN: true }),
  leMh: fc.constantFrom(0, 0.0005, 0.3, 1.5),
  xmaxMm: fc.double({ min: 2, max: 15, noNaN: true }),
  powerW: fc.double({ min: 20, max: 800, noNaN: true }),
  clip: fc.constantFrom('hard' as const, 'soft' as const),
});

type Design = typeof design extends fc.Arbitrary<infer T> ? T : never;

function build(d: Design) {
  const box = d.box === 'sealed' ? sealedBox(d.vbL, 7) : d.box === 'vented' ? ventedBox(d.vbL, d.fs * 0.9, 7, 8) : radiatorBox(d.vbL);
  return system(box, {
    d: { fs: d.fs, qes: d.qes, vasL: d.vasL, leMh: d.leMh, xmaxMm: d.xmaxMm, xlimMm: d.xmaxMm * 1.8 },
    powerW: d.powerW,
    clip: d.clip,
  });
}

function burst(fs: number, seconds: number, f: number): Float32Array {
  const n = Math.round(fs * seconds);
  const x = new Float32Array(n);
  for (let k = 0; k < n; k++) {
    const t = k / fs;
    x[k] = t < 0.4 ? 0.9 * Math.sin(2 * Math.PI * f * t) + 0.3 * Math.sin(2 * Math.PI * 3.1 * f * t) : 0;
  }
  return x;
}

describe('renderer properties (fast-check)', () => {
  it('finite, bounded output at any level up to 4x the clipping drive', () => {
    fc.assert(
      fc.property(design, fc.double({ min: 0.01, max: 4, noNaN: true }), fc.double({ min: 25, max: 200, noNaN: true }), (d, frac, f) => {
        const sys = build(d);
        const x = burst(22050, 0.6, f);
        const r = renderBuffer(sys, [x], 22050, { voltsFs: (frac * sys.amplifier.vPeak) / 0.9 });
        for (const v of r.audio[0]) {
          if (!Number.isFinite(v) || Math.abs(v) > 1) return false;
        }
        // The end stop holds (the summary rounds to 1 µm).
        return r.summary.peak_excursion_mm <= d.xmaxMm * 1.8 + 1e-3;
      }),
      { numRuns: 25, seed: 4242 },
    );
  });
  it('returns to rest when the input stops', () => {
    fc.assert(
      fc.property(design, fc.double({ min: 0.1, max: 2, noNaN: true }), (d, frac) => {
        const sys = build(d);
        const fs = 22050;
        const r = createRenderer(sys, { sampleRate: fs, channels: 1, voltsFs: (frac * sys.amplifier.vPeak) / 0.9 });
        const x = burst(fs, 0.4, 40);
        const out = new Float32Array(x.length);
        r.process([x], [out], x.length);
        const zeros = new Float32Array(fs * 3);
        const tail = new Float32Array(zeros.length);
        r.process([zeros], [tail], zeros.length);
        const { sim } = r.lane(0);
        return (
          Math.abs(sim.x) < 1e-4 * wooferOf(sys).driver.xmax &&
          Math.abs(sim.v) < 1e-3 &&
          Math.abs(sim.i) < 1e-3 &&
          Math.abs(tail[tail.length - 1]) < 1e-6
        );
      }),
      { numRuns: 20, seed: 7 },
    );
  });
  it('stress grows with level', () => {
    fc.assert(
      fc.property(design, fc.double({ min: 0.05, max: 1.5, noNaN: true }), (d, frac) => {
        const sys = build(d);
        const x = burst(22050, 0.6, 45);
        const v = (frac * sys.amplifier.vPeak) / 0.9;
        const lo = renderBuffer(sys, [x], 22050, { voltsFs: v, analysisOnly: true }).summary;
        const hi = renderBuffer(sys, [x], 22050, { voltsFs: v * 2, analysisOnly: true }).summary;
        const kindsHi = new Set(hi.events.map((e) => e.kind));
        return hi.peak_excursion_mm >= lo.peak_excursion_mm - 1e-9 && lo.events.every((e) => kindsHi.has(e.kind));
      }),
      { numRuns: 25, seed: 99 },
    );
  });
});
