// The listening bench never builds a measured response's FIR on its audio thread: the page builds
// the taps and sends them with the design (src/audio/measured-taps.ts), and the worklet's core only
// adopts them. The page and the worklet are separate realms with separate caches: here the page's
// engine and the core's are separate module instances (vi.resetModules). New taps while playing
// take over through a crossfade (render/measured-stage.ts) without a click.
import { describe, expect, it, vi } from 'vitest';
import { abs } from '../src/engine/complex.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';
import { bareModel, logSpaced, sealedDoc, withMeasured } from './helpers/measured.ts';

const builds = vi.hoisted(() => ({ taps: 0, curves: 0 }));
vi.mock('../src/engine/fir/correction.ts', async (original) => {
  const m = await original<typeof import('../src/engine/fir/correction.ts')>();
  return {
    ...m,
    correctionTaps: (...a: Parameters<typeof m.correctionTaps>) => {
      builds.taps++;
      return m.correctionTaps(...a);
    },
    correctionCurve: (...a: Parameters<typeof m.correctionCurve>) => {
      builds.curves++;
      return m.correctionCurve(...a);
    },
  };
});

const SR = 48000;

/** The sealed woofer alone with a "measurement": the model with a dip of `dipDb` at 1.8 kHz. */
function measuredSystem(dipDb: number): SpeakerSystem {
  const doc = sealedDoc();
  doc.ways = doc.ways.slice(0, 1);
  const way0 = doc.ways[0];
  if (way0.kind === 'driver') way0.filter = undefined;
  const model = bareModel(doc);
  const shape = (f: number) => -dipDb * Math.exp(-((Math.log2(f / 1800) / 0.4) ** 2));
  const table = ['Hz dB', ...logSpaced(20, 20000, 200).map((f) => `${f} ${20 * Math.log10(abs(model(f))) + shape(f)}`)].join('\n');
  return withMeasured(doc, table, 400).system;
}

const tone = (f: number, seconds: number) => {
  const x = Float32Array.from({ length: Math.round(seconds * SR) }, (_, k) => 0.1 * Math.sin((2 * Math.PI * f * k) / SR));
  return [x, x.slice()];
};

/** A fresh core (its own engine caches) given the design as the worklet receives it; channel 0 of `quanta` blocks. */
async function playFreshCore(system: SpeakerSystem, measuredTaps: unknown): Promise<Float32Array> {
  vi.resetModules();
  const { BenchCore } = await import('../src/audio/bench-core.ts');
  const { parseToWorklet } = await import('../src/audio/protocol.ts');
  const core = new BenchCore(SR);
  const deliver = (m: unknown) => {
    const r = parseToWorklet(structuredClone(m));
    if (!r.ok) throw new Error(r.error);
    core.handle(r.msg);
  };
  deliver({ type: 'track', channels: tone(1800, 0.5) });
  const design = { type: 'design', slot: 'a', system, voltsFs: 2, ...(measuredTaps ? { measuredTaps } : {}) };
  deliver(design);
  deliver({ ...design, slot: 'b' });
  deliver({ type: 'monitor', gainDb: 0 });
  deliver({ type: 'play', playing: true });
  const quanta = 150;
  const out = new Float32Array(quanta * 128);
  const o = [new Float32Array(128), new Float32Array(128)];
  for (let q = 0; q < quanta; q++) {
    core.process(o, 128);
    out.set(o[0], q * 128);
  }
  for (const m of core.take()) if (m.type === 'error') throw new Error(m.message);
  return out;
}

describe('measured-response FIRs on the listening bench', () => {
  it('the core adopts the taps the page sends and builds none itself; without them it would', async () => {
    const system = measuredSystem(4);
    // The page's side: its own engine builds the taps.
    vi.resetModules();
    const page = await import('../src/audio/measured-taps.ts');
    const taps = page.measuredTapsFor(system, SR);
    expect(taps.map((t) => [t.way, t.sampleRate, t.taps.length > 16])).toEqual([[0, SR, true]]);

    builds.taps = builds.curves = 0;
    const given = await playFreshCore(system, taps);
    expect(builds).toEqual({ taps: 0, curves: 0 });

    // The control: a core left to itself builds the curve and the taps on its own thread.
    const alone = await playFreshCore(system, undefined);
    expect(builds.taps).toBeGreaterThan(0);
    expect(builds.curves).toBeGreaterThan(0);
    // Same taps, same sound, sample for sample; and not silence.
    let peak = 0;
    for (let k = 0; k < given.length; k++) {
      expect(given[k]).toBe(alone[k]);
      peak = Math.max(peak, Math.abs(given[k]));
    }
    expect(peak).toBeGreaterThan(1e-3);
  });

  it('taps at another sample rate than the worklet’s are not used (the worklet builds its own)', async () => {
    const system = measuredSystem(3);
    vi.resetModules();
    const page = await import('../src/audio/measured-taps.ts');
    const at44 = page.measuredTapsFor(system, 44100);
    builds.taps = 0;
    await playFreshCore(system, at44);
    expect(builds.taps).toBeGreaterThan(0);
  });

  it('rejects taps that are not a list of finite numbers, naming the field', async () => {
    const { parseToWorklet } = await import('../src/audio/protocol.ts');
    const system = measuredSystem(3);
    const bad = parseToWorklet({
      type: 'design',
      slot: 'a',
      system,
      voltsFs: 2,
      measuredTaps: [{ way: 0, sampleRate: SR, taps: Float64Array.of(1, Number.NaN) }],
    });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.error).toMatch(/measuredTaps\[0\]\.taps\[1\] must be a finite number/);
  });

  it('new taps while playing cross over without a click: the curvature stays within 5% of the steady tone’s', async () => {
    const { MeasuredStage, SWAP_FADE_S } = await import('../src/engine/render/measured-stage.ts');
    const { measuredTapsFor } = await import('../src/audio/measured-taps.ts');
    const tapsA = measuredTapsFor(measuredSystem(6), SR)[0].taps;
    const tapsB = measuredTapsFor(measuredSystem(1), SR)[0].taps;
    // A steady tone at the dip, where the two corrections differ by about 5 dB.
    const n = 128 * 120;
    const x = Float64Array.from({ length: n }, (_, k) => Math.sin((2 * Math.PI * 1800 * k) / SR));
    const swapAt = 128 * 40;
    const run = (swap: (a: InstanceType<typeof MeasuredStage>) => InstanceType<typeof MeasuredStage>) => {
      let stage = new MeasuredStage(tapsA, SR);
      const y = new Float64Array(n);
      const pN = new Float64Array(128),
        pL = new Float64Array(128);
      for (let at = 0; at < n; at += 128) {
        if (at === swapAt) stage = swap(stage);
        pN.set(x.subarray(at, at + 128));
        pL.set(pN);
        stage.process(pN, pL, 128);
        y.set(pN, at);
      }
      return y;
    };
    const curvature = (y: Float64Array, from: number, to: number) => {
      let worst = 0;
      for (let k = Math.max(2, from); k < to; k++) worst = Math.max(worst, Math.abs(y[k] - 2 * y[k - 1] + y[k - 2]));
      return worst;
    };
    const faded = run((old) => new MeasuredStage(tapsB, SR, old));
    const steadyA = curvature(faded, swapAt - 2000, swapAt);
    const steadyB = curvature(faded, n - 2000, n);
    const during = curvature(faded, swapAt, swapAt + tapsB.length + Math.round(SWAP_FADE_S * SR) + 256);
    expect(Math.abs(20 * Math.log10(steadyA / steadyB))).toBeGreaterThan(3);
    expect(during).toBeLessThan(1.05 * Math.max(steadyA, steadyB));
    // The check can fail: the same change cut at a block boundary (new taps, no crossfade) is a click.
    const cut = run(() => new MeasuredStage(tapsB, SR));
    const steady = Math.max(steadyA, steadyB);
    console.log(
      `swap: curvature ${(during / steady).toFixed(3)} of the steady tone's faded, ${(curvature(cut, swapAt, swapAt + 256) / steady).toFixed(2)} cut`,
    );
    expect(curvature(cut, swapAt, swapAt + 256)).toBeGreaterThan(2 * Math.max(steadyA, steadyB));
  });
});
