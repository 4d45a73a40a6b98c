// The engine on random design documents x levels x sample rates (fast-check, seeded): every design
// either loads and renders finite, bounded audio of the input's length, or is refused with messages.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseDesign } from '../src/engine/design/validate.ts';
import { renderBuffer } from '../src/engine/render/index.ts';
import type { BoxDoc } from '../src/engine/design/document.ts';
import type { V1Doc } from './helpers/designs.ts';
import { FUZZ_SEED, runs } from './helpers/fuzz.ts';

const box: fc.Arbitrary<BoxDoc> = fc.oneof(
  fc.record({
    type: fc.constant('sealed' as const),
    vb_l: fc.double({ min: 0.3, max: 300, noNaN: true }),
    fill: fc.double({ min: 0, max: 1, noNaN: true }),
  }),
  fc.record({
    type: fc.constant('vented' as const),
    vb_l: fc.double({ min: 2, max: 300, noNaN: true }),
    fb_hz: fc.double({ min: 12, max: 120, noNaN: true }),
    ql: fc.oneof(fc.constant(null), fc.double({ min: 2, max: 30, noNaN: true })),
    ports: fc
      .tuple(fc.record({ diameter_cm: fc.double({ min: 2, max: 20, noNaN: true }), count: fc.integer({ min: 1, max: 4 }) }))
      .map((t) => [...t]),
  }),
  fc.record({
    type: fc.constant('passive-radiator' as const),
    vb_l: fc.double({ min: 2, max: 300, noNaN: true }),
    radiator: fc.record({
      sd_cm2: fc.double({ min: 50, max: 1500, noNaN: true }),
      mmp_g: fc.double({ min: 10, max: 800, noNaN: true }),
      cmp_mm_per_n: fc.double({ min: 0.05, max: 3, noNaN: true }),
      xmax_mm: fc.double({ min: 3, max: 30, noNaN: true }),
    }),
  }),
);

const design: fc.Arbitrary<V1Doc> = fc.record({
  format: fc.constant('preheard-design' as const),
  version: fc.constant(1 as const),
  name: fc.string({ maxLength: 20 }),
  driver: fc.record({
    fs_hz: fc.double({ min: 15, max: 150, noNaN: true }),
    qes: fc.double({ min: 0.2, max: 1.5, noNaN: true }),
    qms: fc.double({ min: 1, max: 20, noNaN: true }),
    vas_l: fc.double({ min: 1, max: 400, noNaN: true }),
    re_ohm: fc.double({ min: 2, max: 16, noNaN: true }),
    le_mh: fc.double({ min: 0, max: 3, noNaN: true }),
    sd_cm2: fc.double({ min: 30, max: 1200, noNaN: true }),
    xmax_mm: fc.double({ min: 1, max: 20, noNaN: true }),
    xlim_mm: fc.double({ min: 21, max: 40, noNaN: true }),
    pe_w: fc.double({ min: 10, max: 1000, noNaN: true }),
  }),
  box,
  amplifier: fc.record({
    power_w: fc.double({ min: 5, max: 2000, noNaN: true }),
    load_ohm: fc.constantFrom(4, 8),
    rs_ohm: fc.double({ min: 0, max: 1, noNaN: true }),
    clip: fc.constantFrom('hard' as const, 'soft' as const),
  }),
  crossover: fc.record({
    type: fc.constantFrom('lr2' as const, 'lr4' as const, 'lr8' as const, 'none' as const),
    fx_hz: fc.double({ min: 60, max: 3000, noNaN: true }),
  }),
  listening: fc.record({
    distance_m: fc.double({ min: 0.5, max: 20, noNaN: true }),
    space: fc.constantFrom('full' as const, 'half' as const, 'quarter' as const),
    channels: fc.constantFrom('pair' as const, 'mono-sum' as const),
  }),
});

describe('engine fuzz: random designs x levels x sample rates', () => {
  it('renders finite, bounded audio or refuses with messages', () => {
    let rendered = 0;
    fc.assert(
      fc.property(
        design,
        fc.constantFrom(8000, 22050, 44100, 48000, 96000),
        fc.double({ min: 0.05, max: 200, noNaN: true }),
        fc.double({ min: 20, max: 300, noNaN: true }),
        (d, sr, volts, hz) => {
          const r = parseDesign(d);
          if (!r.ok) {
            expect(r.errors.length).toBeGreaterThan(0);
            return;
          }
          const n = Math.round(sr * 0.12);
          const x = Float32Array.from({ length: n }, (_, k) => 0.8 * Math.sin((2 * Math.PI * hz * k) / sr));
          const out = renderBuffer(r.system, [x, x], sr, { voltsFs: volts });
          rendered++;
          for (const ch of out.audio) {
            expect(ch.length).toBe(n);
            for (let k = 0; k < n; k++) if (!(Math.abs(ch[k]) <= 1)) throw new Error(`sample ${k} = ${ch[k]}`);
          }
          expect(Number.isFinite(out.summary.peak_excursion_mm)).toBe(true);
        },
      ),
      { seed: FUZZ_SEED, numRuns: runs(60) },
    );
    // Most random documents are physically possible; a run where none rendered would test nothing.
    expect(rendered).toBeGreaterThan(runs(60) / 4);
  });
});
