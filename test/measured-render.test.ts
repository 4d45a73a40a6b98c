// A way with a measured response rendered at low drive (its driver model, then the correction's
// FIR by partitioned convolution) against the small-signal analysis of the same way, which reads
// the blended response: within 0.2 dB over the blend octave and the measured band. The same
// design without the field renders as before (test/render-v1-identity.test.ts pins that).
import { describe, expect, it } from 'vitest';
import { renderBuffer } from '../src/engine/render/index.ts';
import { LinearChain } from '../src/engine/render/linear-chain.ts';
import { distortionCurves } from '../src/engine/distortion/stepped-sine.ts';
import { systemPressure } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { renderedPeak } from './helpers/tone-render.ts';
import { bareModel, logSpaced, sealedDoc, withMeasured } from './helpers/measured.ts';

describe('measured response in the render', () => {
  // The woofer alone, without its low-pass, so the measured band is heard; the "measurement" is
  // the model with a 5 dB dip at 1.8 kHz and a rising top (as a cone breaking up might give).
  const doc = sealedDoc();
  doc.ways = doc.ways.slice(0, 1);
  const way0 = doc.ways[0];
  if (way0.kind === 'driver') way0.filter = undefined;
  const model = bareModel(doc);
  const shape = (f: number) => -5 * Math.exp(-((Math.log2(f / 1800) / 0.4) ** 2)) + 3 * Math.max(0, Math.log2(f / 4000));
  const table = ['Hz dB', ...logSpaced(20, 20000, 300).map((f) => `${f} ${20 * Math.log10(abs(model(f))) + shape(f) + 4}`)].join('\n');
  const { system } = withMeasured(doc, table, 400);

  it('the analysis shows the measurement above the blend and the model below', () => {
    const plain = withMeasured(doc, table, 400).system;
    plain.ways[0] = { ...plain.ways[0], measured: undefined } as never;
    const diff = (f: number) => 20 * Math.log10(abs(systemPressure(system, f, 1)) / abs(systemPressure(plain, f, 1)));
    expect(Math.abs(diff(100))).toBeLessThan(0.01);
    expect(diff(1800)).toBeCloseTo(-5, 1);
    expect(diff(16000)).toBeCloseTo(3 * Math.log2(4), 1);
  });

  // The driver model's own discretisation takes the woofer's top octaves low (without the field:
  // -0.10 dB at 6 kHz and -0.31 dB at 10 kHz at 96 kHz), so the whole way is checked to 6 kHz (96 kHz)
  // and 3 kHz (48 kHz), and the correction alone (with over without, in render and analysis) to 16 kHz.
  for (const mode of ['nonlinear', 'linear'] as const) {
    it(`at low drive the ${mode} render matches the analysis within 0.2 dB (96 kHz: 200 Hz to 6 kHz; 48 kHz: to 3 kHz)`, () => {
      let worst = 0;
      for (const [sr, freqs] of [
        [96000, [200, 283, 400, 566, 800, 1800, 3000, 6000]],
        [48000, [283, 400, 566, 1800, 3000]],
      ] as const) {
        for (const f of freqs) {
          const expected = abs(systemPressure(system, f, 0.25));
          const got = renderedPeak(system, f, sr, mode);
          const err = Math.abs(20 * Math.log10(got / expected));
          worst = Math.max(worst, err);
          expect(err, `${f} Hz at ${sr} Hz`).toBeLessThan(0.2);
        }
      }
      console.log(`${mode}: worst ${worst.toFixed(3)} dB`);
    });
  }

  it('the correction alone (render with over without the field) matches the analysis within 0.05 dB, 200 Hz to 16 kHz at 48 kHz', () => {
    const plain = withMeasured(doc, table, 400).system;
    plain.ways[0] = { ...plain.ways[0], measured: undefined } as never;
    let worst = 0;
    for (const f of [200, 283, 400, 566, 1000, 1800, 4000, 8000, 12000, 16000]) {
      const rendered = renderedPeak(system, f, 48000, 'linear') / renderedPeak(plain, f, 48000, 'linear');
      const analysed = abs(systemPressure(system, f, 1)) / abs(systemPressure(plain, f, 1));
      const err = Math.abs(20 * Math.log10(rendered / analysed));
      worst = Math.max(worst, err);
      expect(err, `${f} Hz`).toBeLessThan(0.05);
    }
    console.log(`correction alone: worst ${worst.toFixed(4)} dB`);
  });

  it('the calibration chain carries the correction: its level on noise equals the linear render within 0.05 dB', () => {
    const sr = 48000;
    let seed = 7;
    const noise = Float32Array.from({ length: sr }, () => {
      seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
      return seed / 2 ** 32 - 0.5;
    });
    const rms = (x: ArrayLike<number>, from: number) => {
      let s = 0;
      for (let i = from; i < x.length; i++) s += x[i] * x[i];
      return Math.sqrt(s / (x.length - from));
    };
    const rendered = renderBuffer(system, [noise], sr, { voltsFs: 1, paPerFs: 1, mode: 'linear' }).audio[0];
    const chain = new LinearChain(system, sr, 1, 1);
    const out = [[new Float64Array(sr)]];
    chain.process([noise], out, sr);
    const from = sr / 4;
    const err = 20 * Math.log10(rms(out[0][0], from) / rms(rendered, from));
    console.log(`calibration chain against the render: ${err.toFixed(4)} dB`);
    expect(Math.abs(err)).toBeLessThan(0.05);
  });

  it('the distortion curves correct every harmonic: at low drive the sum shows no compression where the measurement departs', () => {
    const curves = distortionCurves(system, [1800, 3000], 0.5)!;
    for (const point of curves.sum) {
      expect(Math.abs(point.compressionDb), `${point.freqHz} Hz`).toBeLessThan(0.05);
      const analysed = abs(systemPressure(system, point.freqHz, 0.5));
      expect(Math.abs(20 * Math.log10(point.fundamentalPa / analysed))).toBeLessThan(0.05);
    }
  });
});
