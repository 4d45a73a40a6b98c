// Two-tone intermodulation: the analysis against the closed forms of a memoryless polynomial, the
// large-signal model's figure against odex integrating the published equations at one pair.
import { describe, expect, it } from 'vitest';
import {
  checkTonePair,
  imOfSignal,
  intermodulation,
  toneGrid,
  twoToneDrive,
  wayIntermodulation,
} from '../src/engine/distortion/two-tone.ts';
import { wooferParams } from '../src/engine/sim/params.ts';
import { sealedBox, system, wooferOf } from './sim-fixtures.ts';
import { odexPressure } from './sim-odex-model.ts';

describe('two-tone analysis of a memoryless polynomial y = x + a2·x² + a3·x³', () => {
  // x = A1·cos(w1 t) + A2·cos(w2 t). Expanding the powers with the product-to-sum identities
  // (trigonometry, no source needed):
  //   x² holds 2·A1·A2·cos w1t·cos w2t = A1·A2·[cos(w2-w1)t + cos(w2+w1)t]   -> a2·A1·A2 at f2 ± f1
  //   x³ holds 3·A1²·A2·cos² w1t·cos w2t = (3/2)A1²A2·cos w2t + (3/4)A1²A2·[cos(w2-2w1)t + cos(w2+2w1)t]
  //   and A2³cos³ w2t = (3/4)A2³ cos w2t + ...                               -> a3·(3/4)·A1²·A2 at f2 ± 2f1
  //   at f2: A2 + a3·((3/4)·A2³ + (3/2)·A1²·A2)
  // (the other terms of x², x³ fall at 0, 2f1, 3f1, 2f2 ± f1, 2f2, 3f2, none on a product here).
  const cases = [
    { f1: 40, f2: 420, a2: 0.05, a3: 0 },
    { f1: 40, f2: 420, a2: 0, a3: 0.08 },
    { f1: 60, f2: 7000, a2: 0.03, a3: 0.12 },
  ];
  for (const { f1, f2, a2, a3 } of cases) {
    it(`${f1} and ${f2} Hz, a2 = ${a2}, a3 = ${a3}: IM2 and IM3 within 1e-7 (relative) of the closed forms`, () => {
      const g = toneGrid(f1, f2);
      const A1 = 0.8;
      const A2 = 0.2;
      const n = g.perBase * g.periods;
      const y = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        const x = A1 * Math.cos((2 * Math.PI * f1 * i) / g.fs + 0.4) + A2 * Math.cos((2 * Math.PI * f2 * i) / g.fs - 1.1);
        y[i] = x + a2 * x * x + a3 * x * x * x;
      }
      const atF2 = A2 + a3 * (0.75 * A2 ** 3 + 1.5 * A1 ** 2 * A2);
      const im2 = (2 * a2 * A1 * A2) / atF2;
      const im3 = (2 * 0.75 * a3 * A1 ** 2 * A2) / atF2;
      const r = imOfSignal(y, 0, g);
      const close = (got: number, want: number) => expect(Math.abs(got - want)).toBeLessThan(1e-7 * Math.max(want, 1e-3));
      close(r.im2Pct, 100 * im2);
      close(r.im3Pct, 100 * im3);
      close(r.totalPct, 100 * Math.hypot(im2, im3));
      if (a2 > 0) expect(Math.abs(r.im2Db - 20 * Math.log10(im2))).toBeLessThan(1e-6);
      if (a3 > 0) {
        expect(Math.abs(r.im3Db - 20 * Math.log10(im3))).toBeLessThan(1e-6);
        // Each third-order product alone is half the pair's sum.
        expect(Math.abs(r.productsDb[0].db - 20 * Math.log10(im3 / 2))).toBeLessThan(1e-6);
        expect(r.productsDb[3].freqHz).toBe(f2 + 2 * f1);
      }
    });
  }
});

describe('tone pairs', () => {
  it('refuses pairs that cannot be measured, with the reason', () => {
    expect(checkTonePair(40, 420)).toBeNull();
    expect(checkTonePair(40, 400)).toMatch(/whole multiple of the low tone/);
    expect(checkTonePair(40, 100)).toMatch(/at least three times/);
    expect(checkTonePair(Number.NaN, 400)).toMatch(/must be numbers/);
    expect(checkTonePair(5, 400)).toMatch(/between 10 and 2000 Hz/);
    expect(checkTonePair(40, 30000)).toMatch(/at most 20000 Hz/);
  });
});

describe('two tones through the large-signal model against odex (the published equations at tight tolerance)', () => {
  // The renderer tests' sealed woofer, driven hard enough that Bl(x) and Kms(x) modulate the high tone.
  const sys = system(sealedBox(14, 8), { d: { leMh: 0.6, xmaxMm: 5, xlimMm: 15 } });
  const way = wooferOf(sys);
  const volts = 10;
  const [f1, f2] = [40, 420];
  it(`${f1} and ${f2} Hz at ${volts} V: IM2 and IM3 within 0.5 dB, each product within 1 dB`, () => {
    const ours = wayIntermodulation(sys, way, f1, f2, volts).model;
    const g = toneGrid(f1, f2);
    const { low, high } = twoToneDrive(way, g, volts);
    const perLow = g.fs / g.f1;
    const settle = Math.ceil(Math.max(0.4 * g.fs, 40 * perLow) / g.perBase) * g.perBase;
    const fade = Math.round(10 * perLow) / g.fs;
    const u = (t: number) =>
      (t < fade ? 0.5 - 0.5 * Math.cos((Math.PI * t) / fade) : 1) *
      (low.amp * Math.cos(2 * Math.PI * g.f1 * t + low.phase) + high.amp * Math.cos(2 * Math.PI * g.f2 * t + high.phase));
    const n = settle + g.perBase * g.periods;
    const pr = odexPressure(sys, way, u, n, g.fs, wooferParams(sys, way, 1 / g.fs).kOut);
    const ref = imOfSignal(pr, settle, g);
    expect(ours.totalPct).toBeGreaterThan(1);
    expect(Math.abs(ours.im2Db - ref.im2Db)).toBeLessThan(0.5);
    expect(Math.abs(ours.im3Db - ref.im3Db)).toBeLessThan(0.5);
    for (let i = 0; i < 4; i++) expect(Math.abs(ours.productsDb[i].db - ref.productsDb[i].db)).toBeLessThan(1);
  }, 60000);

  it('grows with level and reports the sum at the seat', () => {
    const low = intermodulation(sys, 40, 420, 1);
    const high = intermodulation(sys, 40, 420, 10);
    expect(high.ways[0].figure.totalPct).toBeGreaterThan(4 * low.ways[0].figure.totalPct);
    // A quadratic mechanism gives IM2 in proportion to the low tone's amplitude: 20 dB more drive, about 20 dB more IM2.
    expect(high.ways[0].figure.im2Db - low.ways[0].figure.im2Db).toBeGreaterThan(15);
    // One driver way and the flat upper band (its high tone adds at 420 Hz, but little there): the sum is near the woofer.
    expect(Math.abs(high.sum.totalDb - high.ways[0].figure.totalDb)).toBeLessThan(1.5);
    expect(() => intermodulation(sys, 40, 400, 1)).toThrow(/whole multiple/);
  });
});

describe('preheard analyze --distortion --json: the intermodulation figure', () => {
  it('reports the pair, the method and the figure per way and for the sum; bad pairs are refused with the reason', async () => {
    const { runCli } = await import('./helpers/cli.ts');
    const r = await runCli('analyze', 'public/examples/living-room-sealed.json', '--json', '--distortion', '--im-hz', '50,730');
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    const im = out.distortion.intermodulation;
    expect(im.f1_hz).toBe(50);
    expect(im.f2_hz).toBe(730);
    expect(im.method).toMatch(/IEC 60268-5/);
    expect(im.volts_rms).toBeCloseTo(out.planned_volts_rms, 2);
    expect(im.ways).toHaveLength(1);
    const w = im.ways[0];
    expect(w.products.map((p: { freq_hz: number }) => p.freq_hz)).toEqual([630, 680, 780, 830]);
    // The figure in percent and in dB say the same thing.
    expect(w.total_db).toBeCloseTo(20 * Math.log10(w.total_pct / 100), 2);
    expect(Math.hypot(w.im2_pct, w.im3_pct)).toBeCloseTo(w.total_pct, 2);
    expect(w.total_pct).toBeGreaterThan(0.01);
    // The engine's own figure, at the same drive.
    const { intermodulation } = await import('../src/engine/distortion/two-tone.ts');
    const { loadDesignFile } = await import('../src/cli/design-file.ts');
    const { system: s } = await loadDesignFile('public/examples/living-room-sealed.json');
    const ref = intermodulation(s, 50, 730, im.volts_rms);
    expect(w.im3_pct / ref.ways[0].figure.im3Pct).toBeCloseTo(1, 2);
    const bad = await runCli('analyze', 'public/examples/living-room-sealed.json', '--json', '--distortion', '--im-hz', '40,400');
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/whole multiple of the low tone/);
    const lone = await runCli('analyze', 'public/examples/living-room-sealed.json', '--json', '--im-hz', '40,420');
    expect(lone.status).toBe(2);
  }, 60000);
});
