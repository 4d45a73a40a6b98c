// The summed system's passband and low end, and a band-limited box's f3.
// Linkwitz-Riley pairs sum all-pass (Linkwitz, JAES 24(1), 1976), LR2 with one band inverted.
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { analyze, HALF_POWER_DB, rolloffHz, withoutLowpass } from '../src/engine/response/analyze.ts';
import { passbandPressure, respond } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import type { DriverWay } from '../src/engine/system.ts';
import { doc, system, woofer } from './helpers/designs.ts';

const driver = { fs_hz: 40, qes: 0.4, qms: 4, vas_l: 30 };

describe("the sum's passband", () => {
  for (const type of ['lr2', 'lr4', 'lr8'] as const) {
    it(`is the woofer's own passband for a first-version ${type} design (the flat band at the woofer's level)`, () => {
      const s = system(doc(driver, { type: 'sealed', vb_l: 20 }, { crossover: { type, fx_hz: 1500 } }));
      const a = analyze(s);
      expect(a.sum.figures.sensitivityDb).toBeCloseTo(a.figures.sensitivityDb, 9);
      expect(a.sum.figures.plannedVoltsRms).toBeCloseTo(a.figures.plannedVoltsRms, 9);
      expect(a.sum.figures.passbandSplDb).toBeCloseTo(a.figures.passbandSplDb, 9);
    });
  }

  it("follows the level most of the band sits at: a flat band 6 dB hotter above 5 kHz leaves it at the woofer's", () => {
    const base = doc(driver, { type: 'sealed', vb_l: 20 }, { crossover: { type: 'lr4', fx_hz: 5000 } });
    const r = parseDesign(base);
    if (!r.ok) throw new Error('design');
    const hot = structuredClone(r.design);
    const flat = hot.ways[1];
    if (flat.kind !== 'flat') throw new Error('way kind');
    flat.filter = { ...flat.filter!, type: 'active', gain_db: 6 };
    const a = analyze(system(hot));
    // The hot band's LR4 tail reaches into the woofer's band by a few thousandths of a dB.
    expect(Math.abs(a.sum.figures.sensitivityDb - a.figures.sensitivityDb)).toBeLessThan(0.01);
  });
});

describe("the sum's low end", () => {
  it('is read from below, so a hole between the ways does not stand in for the bass extension', () => {
    const base = doc(driver, { type: 'sealed', vb_l: 20 }, { crossover: { type: 'lr4', fx_hz: 500 } });
    const r = parseDesign(base);
    if (!r.ok) throw new Error('design');
    const holed = structuredClone(r.design);
    const flat = holed.ways[1];
    if (flat.kind !== 'flat') throw new Error('way kind');
    flat.filter = { type: 'active', highpass: { shape: 'lr4', hz: 2000 } };
    const a = analyze(system(holed));
    // The hole: an LR4 low-pass at 500 Hz and high-pass at 2 kHz leave the sum about 10 dB down at 1 kHz.
    const k = a.sum.curves.freqHz.findIndex((f) => f >= 1000);
    expect(a.sum.curves.splDb[k] - a.sum.figures.passbandSplDb).toBeLessThan(-8);
    // Near the woofer's own f3, not at the hole's edge near 350 Hz. (The hole leaves the median
    // passband of the sum 0.14 dB under the woofer's: the low-pass's own transition is most of the
    // band's lower half then.)
    expect(Math.abs(a.sum.figures.f3Hz / a.figures.f3Hz - 1)).toBeLessThan(0.05);
  });
});

describe('a box that rolls its own top off (4th-order bandpass)', () => {
  it("has its f3 3.01 dB under its band's peak (at most the drivers' passband level), below the peak", () => {
    const r = parseDesign(readFileSync('public/examples/garage-subwoofer-bandpass.json', 'utf8'));
    if (!r.ok) throw new Error('example');
    const way = woofer(r.system) as DriverWay;
    const f3 = rolloffHz(r.system, way, HALF_POWER_DB);
    const level = (f: number) => 20 * Math.log10(abs(respond(r.system, withoutLowpass(way), f, 1, false).pressure));
    let peak = -Infinity;
    let peakHz = 0;
    for (let f = 10; f < 400; f *= 2 ** (1 / 960)) if (level(f) > peak) [peak, peakHz] = [level(f), f];
    expect(f3).toBeLessThan(peakHz);
    // Measured from the band's peak, or from the drivers' passband level where the peak rises above it.
    const passband = 20 * Math.log10(passbandPressure(r.system, way, 1));
    expect(level(f3) - Math.min(peak, passband)).toBeCloseTo(-HALF_POWER_DB, 3);
  });
});
