// Stepped-sine distortion from the large-signal model: the harmonic analysis against a cubic's
// analytic harmonics, and the whole measurement against odex integrating the published equations.
import { describe, expect, it } from 'vitest';
import { distortionCurves, figuresOf, harmonicPhasors, samplesPerPeriod, wayHarmonics } from '../src/engine/distortion/stepped-sine.ts';
import { abs } from '../src/engine/complex.ts';
import { wayFilterAt } from '../src/engine/filters/way-filter.ts';
import { wooferParams } from '../src/engine/sim/params.ts';
import { sealedBox, system, wooferOf } from './sim-fixtures.ts';
import { odexPressure } from './sim-odex-model.ts';

describe('harmonic analysis', () => {
  it('finds H3 of a memoryless cubic y = x + a·x^3 as the trigonometric identity gives it', () => {
    // cos^3 = (3·cos + cos 3)/4 (a trigonometric identity): H1 = A + 3aA^3/4, H3 = aA^3/4, no H2.
    const a = 0.2;
    const amp = 0.9;
    const m = 200;
    const y = Float64Array.from({ length: 8 * m }, (_, i) => {
      const x = amp * Math.cos((2 * Math.PI * i) / m + 0.3);
      return x + a * x ** 3;
    });
    const h = harmonicPhasors(y, 0, m, 8).map(abs);
    const h1 = amp + (3 * a * amp ** 3) / 4;
    const h3 = (a * amp ** 3) / 4;
    const p = figuresOf(h, h1, 100, h[0]);
    expect(p.h3Db).toBeCloseTo(20 * Math.log10(h3 / h1), 6);
    expect(p.h2Db).toBeLessThan(-200);
    expect(p.thdPct).toBeCloseTo((100 * h3) / h1, 6);
    expect(p.compressionDb).toBeCloseTo(0, 9);
  });
});

describe('stepped sines against odex (the published equations at tight tolerance)', () => {
  // The renderer tests' sealed woofer, Xlim at 3x Xmax so the end stop stays out of reach.
  const sys = system(sealedBox(14, 8), { d: { leMh: 0.6, xmaxMm: 5, xlimMm: 15 } });
  const way = wooferOf(sys);
  const volts = 8;
  for (const f of [30, 60, 150]) {
    it(`${f} Hz, ${volts} V rms: H2, H3 within 0.5 dB, THD within 5%`, () => {
      const ours = wayHarmonics(sys, way, f, volts).model;
      // The same drive, integrated by odex: cos with a 10-period raised-cosine fade-in.
      const m = samplesPerPeriod(f);
      const fsamp = m * f;
      const hf = wayFilterAt(way.filter, 2 * Math.PI * f);
      const amp = Math.SQRT2 * volts * abs(hf);
      const phase = Math.atan2(hf.im, hf.re);
      const fade = 10 / f;
      const u = (t: number) => (t < fade ? 0.5 - 0.5 * Math.cos((Math.PI * t) / fade) : 1) * amp * Math.cos(2 * Math.PI * f * t + phase);
      const settle = Math.max(40, Math.ceil(0.4 * f));
      const n = (settle + 8) * m;
      const pr = odexPressure(sys, way, u, n, fsamp, wooferParams(sys, way, 1 / fsamp).kOut);
      const h = harmonicPhasors(pr, settle * m, m, 8).map(abs);
      const ref = figuresOf(h, h[0], f, h[0]);
      expect(ours.thdPct).toBeGreaterThan(0.3);
      expect(Math.abs(ours.h2Db - ref.h2Db)).toBeLessThan(0.5);
      expect(Math.abs(ours.h3Db - ref.h3Db)).toBeLessThan(0.5);
      expect(Math.abs(ours.thdPct / ref.thdPct - 1)).toBeLessThan(0.05);
    });
  }
});

describe('distortion curves', () => {
  it('rise with level, compress the fundamental at high drive and report the sum', () => {
    const sys = system(sealedBox(14, 8), { d: { leMh: 0.6, xmaxMm: 5, xlimMm: 15 } });
    const low = distortionCurves(sys, [30, 100], 1);
    const high = distortionCurves(sys, [30, 100], 14);
    if (!low || !high) throw new Error('not stopped');
    expect(high.ways[0].points[0].thdPct).toBeGreaterThan(5 * low.ways[0].points[0].thdPct);
    expect(high.ways[0].points[0].compressionDb).toBeLessThan(-0.2);
    expect(Math.abs(low.ways[0].points[0].compressionDb)).toBeLessThan(0.05);
    // One driver way and the flat upper band, which adds next to nothing at 30 Hz: the sum is the woofer.
    expect(sys.ways.length).toBe(2);
    expect(Math.abs(high.sum[0].thdPct / high.ways[0].points[0].thdPct - 1)).toBeLessThan(1e-3);
    let calls = 0;
    expect(distortionCurves(sys, [30, 60, 100], 1, { onProgress: () => ++calls < 2 })).toBeNull();
    expect(calls).toBe(2);
  });
});

describe('preheard analyze --distortion --json', () => {
  it('adds per-way and sum curves at the planned level', async () => {
    const { runCli } = await import('./helpers/cli.ts');
    const r = await runCli('analyze', 'public/examples/living-room-sealed.json', '--json', '--distortion');
    expect(r.status).toBe(0);
    const d = JSON.parse(r.stdout).distortion;
    expect(d.volts_rms).toBeCloseTo(JSON.parse(r.stdout).planned_volts_rms, 2);
    expect(d.ways).toHaveLength(1);
    const w = d.ways[0];
    for (const key of ['freq_hz', 'thd_pct', 'h2_db', 'h3_db', 'compression_db']) expect(w[key]).toHaveLength(20);
    expect(d.sum.freq_hz).toEqual(w.freq_hz);
    // The cone moves most at the bottom: distortion falls from 20 Hz to 200 Hz.
    expect(w.thd_pct[0]).toBeGreaterThan(10 * w.thd_pct[10]);
    const u = await runCli('analyze', 'public/examples/living-room-sealed.json', '--distortion');
    expect(u.status).toBe(2);
  });
});
