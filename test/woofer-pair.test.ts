// The two-lane WebAssembly loop (src/engine/sim/woofer-pair.ts) against the TypeScript model it
// stands in for: every sample and every state value bit for bit (Object.is, so even the sign of a
// zero), for sealed and vented boxes, with and without a voice-coil inductance, polynomials of
// every length, the cone driven into its end stops, lanes at different coil temperatures and blocks
// of any length.
import { describe, expect, it } from 'vitest';
import { wooferParams } from '../src/engine/sim/params.ts';
import { WooferSim } from '../src/engine/sim/woofer.ts';
import { pairable, processPair, PAIR_MAX_STEPS } from '../src/engine/sim/woofer-pair.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';
import { exampleSystem } from './helpers/audio-bench.ts';
import { radiatorBox, sealedBox, system, ventedBox, wooferOf } from './sim-fixtures.ts';

const FS = 48000;

/** A drive of two tones and noise (our own), loud enough at `volts` to reach the end stops. */
function drive(frames: number, volts: number, seed: number): Float64Array {
  const u = new Float64Array(frames);
  let s = seed;
  for (let k = 0; k < frames; k++) {
    s = (s * 1103515245 + 12345) >>> 0;
    const t = k / FS;
    u[k] = volts * (Math.sin(2 * Math.PI * (23 + seed) * t) + 0.4 * Math.sin(2 * Math.PI * 310 * t) + 0.1 * (s / 2 ** 32 - 0.5));
  }
  return u;
}

function same(a: ArrayLike<number>, b: ArrayLike<number>, what: string): void {
  for (let k = 0; k < a.length; k++) {
    if (!Object.is(a[k], b[k])) throw new Error(`${what}[${k}]: ${a[k]} against ${b[k]}`);
  }
}

/** Both lanes through processPair and through processBlock, blocks of the given lengths in turn. */
function compare(sys: SpeakerSystem, volts: number, blocks: number[], frames = 9000) {
  const p = wooferParams(sys, wooferOf(sys), 1 / FS);
  const ref = [new WooferSim(p), new WooferSim(p)];
  const pair = [new WooferSim(p), new WooferSim(p)];
  // Different coil temperatures: the lanes differ in R.
  for (const [k, rise] of [0, 35].entries()) {
    ref[k].setCoilRise(rise, rise / 3);
    pair[k].setCoilRise(rise, rise / 3);
  }
  expect(pairable(pair[0], pair[1])).toBe(true);
  const u = [drive(frames, volts, 1), drive(frames, volts * 0.8, 2)];
  const outs = (m: WooferSim[]) =>
    m.map(() => ({ p: new Float64Array(frames), x: new Float64Array(frames), outlet: new Float64Array(frames) }));
  const r = outs(ref),
    q = outs(pair);
  const rSums = [0, 0],
    qSums = [0, 0];
  const sums = new Float64Array(2);
  let peak = 0;
  for (let s = 0, b = 0; s < frames; b++) {
    const n = Math.min(blocks[b % blocks.length], frames - s);
    for (let k = 0; k < 2; k++) {
      rSums[k] += ref[k].processBlock(u[k].subarray(s, s + n), n, r[k].p.subarray(s), r[k].x.subarray(s), r[k].outlet.subarray(s));
    }
    const view = (o: (typeof q)[0], k: number) => ({
      uClip: u[k].subarray(s, s + n),
      pN: o.p.subarray(s),
      x: o.x.subarray(s),
      outlet: o.outlet.subarray(s),
    });
    processPair(pair[0], pair[1], view(q[0], 0), view(q[1], 1), n, sums);
    qSums[0] += sums[0];
    qSums[1] += sums[1];
    s += n;
  }
  for (let k = 0; k < 2; k++) {
    same(q[k].p, r[k].p, `lane ${k} pressure`);
    same(q[k].x, r[k].x, `lane ${k} excursion`);
    same(q[k].outlet, r[k].outlet, `lane ${k} outlet`);
    for (const v of r[k].x) peak = Math.max(peak, Math.abs(v));
    expect(Object.is(qSums[k], rSums[k])).toBe(true);
    for (const key of ['i', 'x', 'v', 'out'] as const) expect(Object.is(pair[k][key], ref[k][key])).toBe(true);
    expect(Object.is(pair[k].chamber.net(), ref[k].chamber.net())).toBe(true);
  }
  return { peakMm: peak * 1000, xlimMm: p.xlim * 1000 };
}

describe('two woofer lanes in one WebAssembly loop', () => {
  it('the vented example, driven into its end stops, blocks of 256 and of odd lengths', () => {
    const r = compare(exampleSystem('vented'), 90, [256, 1, 7, 255, 100]);
    expect(r.peakMm).toBeCloseTo(r.xlimMm, 9);
  });

  it('the sealed example, moderate and into the stops', () => {
    compare(exampleSystem('sealed'), 8, [256]);
    const r = compare(exampleSystem('sealed'), 90, [64, 3]);
    expect(r.peakMm).toBeCloseTo(r.xlimMm, 9);
  });

  it('typed polynomials of every length, with and without a coil inductance, sealed and vented', () => {
    const shape = (count: number, seed: number) => Array.from({ length: count }, (_, k) => (0.1 * Math.sin(seed + 1.7 * k)) / 8 ** (k + 1));
    let stopped = 0;
    for (let count = 0; count <= 8; count++) {
      for (const leMh of [0, 0.6]) {
        const sys = system(count % 2 === 0 ? ventedBox(28, 38, 7) : sealedBox(14, 8), { d: { leMh, xmaxMm: 5, xlimMm: 9 } });
        const d = wooferOf(sys).driver;
        d.blRelPerMm = shape(count, 1);
        d.kmsRelPerMm = shape(8 - count, 2);
        d.leRelPerMm = shape(count, 3);
        d.nonlinearFitted = count !== 4;
        stopped += compare(sys, 40, [256, 17], 4000).peakMm > 8.999 ? 1 : 0;
      }
    }
    // Most of them reach the stops.
    expect(stopped).toBeGreaterThan(9);
  });

  it('is not offered where the loop does not apply', () => {
    const sys = system(radiatorBox());
    const p = wooferParams(sys, wooferOf(sys), 1 / FS);
    expect(pairable(new WooferSim(p), new WooferSim(p))).toBe(false);
    const vented = exampleSystem('vented');
    const a = new WooferSim(wooferParams(vented, wooferOf(vented), 1 / FS));
    const b = new WooferSim(wooferParams(vented, wooferOf(vented), 1 / FS));
    // Equal numbers but two parameter objects: the lanes of one way share theirs.
    expect(pairable(a, b)).toBe(false);
    expect(PAIR_MAX_STEPS).toBe(256);
  });
});
