// The streaming contract: 128-frame quanta give the same samples as one whole buffer; the output
// is aligned with the input (a linear passband tone comes out in phase); the true-peak guard keeps
// the 8x-oversampled peak at or under 0 dBFS (ITU-R BS.1770-4 Annex 2 method, finer grid) and
// reports its action; a live parameter edit keeps the cone where it was; mono-sum feeds one woofer.
import { describe, expect, it } from 'vitest';
import { createRenderer, renderBuffer } from '../src/engine/render/index.ts';
import { sealedBox, system, ventedBox } from './sim-fixtures.ts';

function tone(fs: number, seconds: number, f: number, amp: number): Float32Array {
  const x = new Float32Array(Math.round(fs * seconds));
  for (let k = 0; k < x.length; k++) x[k] = amp * Math.sin((2 * Math.PI * f * k) / fs) * Math.min(1, k / (0.05 * fs));
  return x;
}

describe('streaming renderer', () => {
  it('128-frame quanta equal one whole block', () => {
    const sys = system(ventedBox());
    const x = tone(48000, 0.5, 55, 0.8);
    const a = createRenderer(sys, { sampleRate: 48000, channels: 1, voltsFs: 60 });
    const b = createRenderer(sys, { sampleRate: 48000, channels: 1, voltsFs: 60 });
    const oa = new Float32Array(x.length),
      ob = new Float32Array(x.length);
    a.process([x], [oa], x.length);
    for (let s = 0; s < x.length; s += 128) {
      const n = Math.min(128, x.length - s);
      const o = new Float32Array(n);
      b.process([x.subarray(s, s + n)], [o], n);
      ob.set(o, s);
    }
    for (let k = 0; k < x.length; k++) expect(ob[k]).toBe(oa[k]);
    expect(b.events.list()).toEqual(a.events.list());
  });
  it('is time-aligned with the input: a passband tone through the flat high band comes out in phase', () => {
    const sys = system(sealedBox(), { xo: 'lr4', fx: 300 });
    const fs = 48000,
      f = 6000;
    const x = tone(fs, 0.3, f, 0.5);
    const r = renderBuffer(sys, [x], fs, { voltsFs: 2 });
    expect(r.audio[0].length).toBe(x.length);
    // Cross-correlation peak at lag 0 (6 kHz: 8 samples per period, so any shift shows).
    let best = -Infinity,
      lag = 99;
    for (let l = -4; l <= 4; l++) {
      let c = 0;
      for (let k = 6000; k < x.length - 10; k++) c += x[k] * r.audio[0][k + l];
      if (c > best) [best, lag] = [c, l];
    }
    expect(lag).toBe(0);
  });
  it('the true-peak guard holds 0 dBFS and reports its action', () => {
    const sys = system(sealedBox(), { xo: 'lr4', fx: 300 });
    const fs = 44100;
    // A loud high band: inter-sample peaks near fs/4 exceed the sample peaks.
    const x = tone(fs, 0.5, fs / 4 - 10, 0.95);
    // Calibrated so a full-scale passband input would be 6 dB over full scale.
    const pa = createRenderer(sys, { sampleRate: fs, channels: 1, voltsFs: 2 }).passbandPaPerV * 2 * 0.5;
    const r = renderBuffer(sys, [x], fs, { voltsFs: 2, paPerFs: pa });
    expect(r.summary.limiter_db).toBeGreaterThan(3);
    const y = r.audio[0];
    let tp = 0;
    for (let k = 8; k < y.length - 8; k++) {
      for (let ph = 0; ph < 8; ph++) {
        let acc = 0;
        for (let j = -8; j <= 8; j++) {
          const t = j - ph / 8;
          const w = 0.5 + 0.5 * Math.cos((Math.PI * t) / 9);
          acc += y[k + j] * (t === 0 ? 1 : Math.sin(Math.PI * t) / (Math.PI * t)) * w;
        }
        tp = Math.max(tp, Math.abs(acc));
      }
    }
    expect(20 * Math.log10(tp)).toBeLessThan(0.05);
  });
  it('a live edit keeps the state (no jump in the cone position)', () => {
    const sys = system(ventedBox(28, 38));
    const r = createRenderer(sys, { sampleRate: 48000, channels: 1, voltsFs: 40 });
    const x = tone(48000, 0.3, 40, 0.8);
    const o = new Float32Array(x.length);
    r.process([x], [o], x.length);
    const before = r.lane(0).sim.x;
    r.update(system(ventedBox(34, 34)));
    expect(r.lane(0).sim.x).toBe(before);
    r.process([x.subarray(0, 1)], [o], 1);
    expect(Math.abs(r.lane(0).sim.x - before)).toBeLessThan(1e-4);
  });
  it('mono-sum drives one woofer with the mean of the channels', () => {
    const sys = system(sealedBox(), { channels: 'mono-sum', xo: 'lr4', fx: 150 });
    const l = tone(48000, 0.4, 50, 0.6),
      rr = new Float32Array(l.length);
    const res = renderBuffer(sys, [l, rr], 48000, { voltsFs: 20 });
    const single = renderBuffer(system(sealedBox(), { xo: 'lr4', fx: 150 }), [l.map((v) => v / 2)], 48000, { voltsFs: 20 });
    expect(res.summary.peak_excursion_mm).toBeCloseTo(single.summary.peak_excursion_mm, 6);
  });
});
