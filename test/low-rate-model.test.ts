// Driver models below the audio rate (src/engine/render/low-rate-model.ts, model-rate.ts) against
// the exact path (driverRate 'audio', every model at the audio rate), which
// test/render-v1-identity.test.ts pins to the first version bit for bit.
//
// Tolerances, stated here and measured on these designs:
//  - the rate chosen: above the kept band's edge the way plays at least 60 dB below its passband,
//    checked with the small-signal circuit (response/frequency.ts wayPressure), not with the
//    rate chooser's own transfer function;
//  - low drive: each tone within 0.1 dB (found: under 0.00001 dB) and the output within -80 dB RMS
//    of the exact path (found: -120 dB; the difference is rounding);
//  - a loud two-tone (60 and 250 Hz, the cone at 4.8 mm of its 5.5 mm Xmax) through a woofer at
//    1/8 of the rate: every spectral line that is not an intermodulation product of order 12 or
//    less (aliases, images, anything new) at least 60 dB below the fundamental (found: -98 dB, the
//    window's floor, as on the exact path), and the strongest products (-35 to -56 dB) within
//    1 dB of the exact path's (found: within 0.11 dB);
//  - loud programme: output within -35 dB RMS of the exact path (found: -71 dB for the subwoofer,
//    -42 dB for the woofer whose cone hits its end stop, a broadband nonlinearity), events of the
//    same kinds with the first of each starting within 2 ms (found: the same to 0.1 ms), peaks
//    within 1% (found: 0.07%), headroom within its 0.25 dB step (found: equal, and 0.009 dB).
import FFT from 'fft.js';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../src/engine/design/validate.ts';
import { synthesizeDemoTrack } from '../src/engine/demo/track.ts';
import { wayPressure } from '../src/engine/response/frequency.ts';
import { createRenderer, findHeadroom, renderBuffer, type RenderMode } from '../src/engine/render/index.ts';
import { KEPT_BAND } from '../src/engine/filters/multirate.ts';
import { ALIAS_MARGIN_DB, modelRate } from '../src/engine/render/model-rate.ts';
import type { DriverWay, SpeakerSystem } from '../src/engine/system.ts';

const FS = 48000;
const example = (name: string) => JSON.parse(readFileSync(join(import.meta.dirname, '..', 'public', 'examples', `${name}.json`), 'utf8'));

function systemOf(doc: unknown): SpeakerSystem {
  const r = parseDesign(doc);
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('\n'));
  return r.system;
}

/** The vented demo woofer crossed low (LR4 at 300 Hz): a woofer way that allows 1/8. */
function lowCrossedWoofer(): SpeakerSystem {
  const doc = example('living-room-vented');
  doc.crossover = { type: 'lr4', fx_hz: 300 };
  return systemOf(doc);
}

/** The garage subwoofer alone (no flat way), so its output is the model's. */
function subwooferAlone(): SpeakerSystem {
  const doc = example('garage-subwoofer-bandpass');
  doc.ways = doc.ways.filter((w: { kind: string }) => w.kind === 'driver');
  return systemOf(doc);
}

const firstDriver = (sys: SpeakerSystem) => sys.ways.find((w): w is DriverWay => w.kind === 'driver')!;

function render(sys: SpeakerSystem, input: Float32Array[], volts: number, rate: 'audio' | 'reduced', mode: RenderMode = 'nonlinear') {
  return renderBuffer(sys, input, FS, { voltsFs: volts, leqPerVoltDb: 0, driverRate: rate, mode, extraStreams: true });
}

function relDb(a: Float32Array, ref: Float32Array, from = 0): number {
  let e = 0,
    s = 0;
  for (let k = from; k < ref.length; k++) {
    e += (a[k] - ref[k]) ** 2;
    s += ref[k] ** 2;
  }
  return 10 * Math.log10(e / s);
}

/** Amplitude of a tone of f Hz in x[from..from+n) by a DFT at exactly f (whole periods in n). */
function toneAmp(x: Float32Array, f: number, from: number, n: number): number {
  let re = 0,
    im = 0;
  for (let k = 0; k < n; k++) {
    const ph = (2 * Math.PI * f * k) / FS;
    re += x[from + k] * Math.cos(ph);
    im -= x[from + k] * Math.sin(ph);
  }
  return (2 * Math.hypot(re, im)) / n;
}

const N_FFT = 32768;
const BIN = FS / N_FFT;

/** Magnitude spectrum (4-term Blackman-Harris window: sidelobes 92 dB down; Harris, Proc. IEEE 66(1), 1978). */
function spectrum(x: Float32Array, from: number): Float64Array {
  const fft = new FFT(N_FFT);
  const input = new Array<number>(N_FFT);
  for (let k = 0; k < N_FFT; k++) {
    const t = (2 * Math.PI * k) / N_FFT;
    const w = 0.35875 - 0.48829 * Math.cos(t) + 0.14128 * Math.cos(2 * t) - 0.01168 * Math.cos(3 * t);
    input[k] = x[from + k] * w;
  }
  const out = fft.createComplexArray() as number[];
  fft.realTransform(out, input);
  const mag = new Float64Array(N_FFT / 2);
  for (let b = 0; b < N_FFT / 2; b++) mag[b] = Math.hypot(out[2 * b], out[2 * b + 1]);
  return mag;
}

describe('the rate a way model runs at', () => {
  it('follows the way: 1/8 for a subwoofer and a woofer crossed at 300 Hz, the audio rate for the demo woofer at 2.2 kHz and passive ways', () => {
    expect(modelRate(subwooferAlone(), firstDriver(subwooferAlone()), FS).factor).toBe(8);
    expect(modelRate(lowCrossedWoofer(), firstDriver(lowCrossedWoofer()), FS).factor).toBe(8);
    const demo = systemOf(example('living-room-vented'));
    expect(modelRate(demo, firstDriver(demo), FS).factor).toBe(1);
    const passive = systemOf(example('bookshelf-two-way-passive'));
    for (const w of passive.ways) if (w.kind === 'driver') expect(modelRate(passive, w, FS).factor).toBe(1);
  });

  it("keeps everything the way plays within 60 dB of its passband (small-signal circuit, not the chooser's transfer)", () => {
    for (const sys of [subwooferAlone(), lowCrossedWoofer()]) {
      const way = firstDriver(sys);
      const { factor } = modelRate(sys, way, FS);
      const edge = (KEPT_BAND * FS) / factor;
      let peak = 0,
        above = 0;
      for (let f = 10; f < FS / 2; f *= 2 ** (1 / 24)) {
        const p = wayPressure(sys, way, f, 1, false);
        const m = Math.hypot(p.re, p.im);
        peak = Math.max(peak, m);
        if (f >= edge) above = Math.max(above, m);
      }
      expect(20 * Math.log10(above / peak)).toBeLessThan(-ALIAS_MARGIN_DB);
    }
  });
});

describe('the low-rate path against the audio-rate path', () => {
  it('plays the same at low drive: tones within 0.1 dB, the output within -80 dB', () => {
    const sys = subwooferAlone();
    const n = FS * 2;
    const tones = [25, 40, 63, 100, 160];
    const x = new Float32Array(n);
    for (let k = 0; k < n; k++) for (const f of tones) x[k] += 0.05 * Math.sin((2 * Math.PI * f * k) / FS);
    const a = render(sys, [x], 2, 'audio').audio[0];
    const b = render(sys, [x], 2, 'reduced').audio[0];
    expect(relDb(b, a)).toBeLessThan(-80);
    // One second from 0.5 s: whole periods of every tone.
    for (const f of tones) {
      const da = 20 * Math.log10(toneAmp(b, f, FS / 2, FS) / toneAmp(a, f, FS / 2, FS));
      expect(Math.abs(da)).toBeLessThan(0.1);
    }
  });

  it('hands out the same samples whatever the block length (128-frame quanta, odd blocks)', () => {
    const sys = lowCrossedWoofer();
    const track = synthesizeDemoTrack(FS);
    const from = 16 * FS,
      n = FS;
    const input = track.channels.map((c) => c.slice(from, from + n));
    const run = (block: number) => {
      const r = createRenderer(sys, { sampleRate: FS, channels: 2, voltsFs: 30, driverRate: 'reduced' });
      const out = [new Float32Array(n), new Float32Array(n)];
      for (let s = 0; s < n; s += block) {
        const m = Math.min(block, n - s);
        r.process(
          input.map((c) => c.subarray(s, s + m)),
          out.map((c) => c.subarray(s, s + m)),
          m,
        );
      }
      return out;
    };
    const ref = run(4096);
    for (const block of [128, 77]) {
      const got = run(block);
      let differ = 0;
      for (let c = 0; c < 2; c++) for (let k = 0; k < n; k++) if (got[c][k] !== ref[c][k]) differ++;
      expect(differ).toBe(0);
    }
  });

  it("keeps a loud two-tone's aliases and images 60 dB below the fundamental, its products within 1 dB", () => {
    // 60.06 Hz (near full excursion) and 250.5 Hz, on bins of the transform.
    const sys = lowCrossedWoofer();
    const b1 = 41,
      b2 = 171;
    const f1 = b1 * BIN,
      f2 = b2 * BIN;
    const n = FS + N_FFT;
    const x = new Float32Array(n);
    for (let k = 0; k < n; k++) x[k] = 0.5 * Math.sin((2 * Math.PI * f1 * k) / FS) + 0.25 * Math.sin((2 * Math.PI * f2 * k) / FS);
    const volts = 24;
    const full = render(sys, [x], volts, 'audio');
    const low = render(sys, [x], volts, 'reduced');
    // The cone travels near Xmax, without reaching its end stop (whose products are broadband).
    expect(full.summary.peak_excursion_mm).toBeGreaterThan(4);
    expect(full.summary.peak_excursion_mm).toBeLessThan(9);
    const sF = spectrum(full.audio[0], FS);
    const sL = spectrum(low.audio[0], FS);
    const products = new Set<number>();
    for (let m = -12; m <= 12; m++)
      for (let k = -12; k <= 12; k++) {
        if (Math.abs(m) + Math.abs(k) > 12) continue;
        const b = Math.abs(m * b1 + k * b2);
        for (let d = -4; d <= 4; d++) products.add(b + d);
      }
    const fundamental = sF[b1];
    let worstLow = 0,
      worstFull = 0;
    for (let b = 5; b < N_FFT / 2; b++) {
      if (products.has(b)) continue;
      worstLow = Math.max(worstLow, sL[b]);
      worstFull = Math.max(worstFull, sF[b]);
    }
    const db = (v: number) => 20 * Math.log10(v / fundamental);
    expect(db(worstLow)).toBeLessThan(-60);
    // The strongest products: second and third harmonics of f1, the difference and sum tones.
    for (const b of [2 * b1, 3 * b1, b2 - b1, b2 + b1, b2 - 2 * b1, b2 + 2 * b1]) {
      expect(db(sF[b])).toBeGreaterThan(-80);
      expect(Math.abs(db(sL[b]) - db(sF[b]))).toBeLessThan(1);
    }
    // For the record in the failure message: what the exact path shows off the products.
    expect(db(worstFull)).toBeLessThan(0);
  });

  it('gives the same events, peaks and output on loud programme (the demo track)', () => {
    const track = synthesizeDemoTrack(FS);
    const from = 14 * FS,
      n = 6 * FS;
    const input = track.channels.map((c) => c.slice(from, from + n));
    for (const [sys, volts] of [
      [subwooferAlone(), 120],
      [lowCrossedWoofer(), 60],
    ] as const) {
      const a = render(sys, input, volts, 'audio');
      const b = render(sys, input, volts, 'reduced');
      expect(a.summary.events.length).toBeGreaterThan(0);
      expect(relDb(b.audio[0], a.audio[0])).toBeLessThan(-35);
      const kinds = (s: typeof a.summary) => [...new Set(s.events.map((e) => `${e.way}:${e.kind}`))].sort();
      expect(kinds(b.summary)).toEqual(kinds(a.summary));
      for (const k of kinds(a.summary)) {
        const first = (s: typeof a.summary) => Math.min(...s.events.filter((e) => `${e.way}:${e.kind}` === k).map((e) => e.start_s));
        expect(Math.abs(first(b.summary) - first(a.summary))).toBeLessThan(0.002);
      }
      const near = (x: number | null, y: number | null) =>
        expect(Math.abs((x ?? 0) - (y ?? 0))).toBeLessThanOrEqual(0.01 * Math.abs(y ?? 0) + 1e-3);
      near(b.summary.peak_excursion_mm, a.summary.peak_excursion_mm);
      near(b.summary.peak_port_speed_m_s, a.summary.peak_port_speed_m_s);
      near(b.summary.peak_coil_temp_c, a.summary.peak_coil_temp_c);
    }
  });

  it('finds the same headroom within its 0.25 dB step', () => {
    const track = synthesizeDemoTrack(FS);
    const input = track.channels.map((c) => c.slice(0, 20 * FS));
    for (const sys of [subwooferAlone(), lowCrossedWoofer()]) {
      const a = findHeadroom(sys, input, FS, { driverRate: 'audio' });
      const b = findHeadroom(sys, input, FS, { driverRate: 'reduced' });
      expect(Math.abs(20 * Math.log10(b.clean_volts / a.clean_volts))).toBeLessThanOrEqual(0.25);
      expect(b.first_limit).toBe(a.first_limit);
      expect(b.first_limit_way).toBe(a.first_limit_way);
    }
  });

  it('takes an edit that changes the rate while playing, and stays off unless asked for', () => {
    expect(createRenderer(lowCrossedWoofer(), { sampleRate: FS, channels: 1, voltsFs: 20 }).latencyFrames).toBeLessThan(
      createRenderer(lowCrossedWoofer(), { sampleRate: FS, channels: 1, voltsFs: 20, driverRate: 'reduced' }).latencyFrames,
    );
    const sys = lowCrossedWoofer();
    const r = createRenderer(sys, { sampleRate: FS, channels: 1, voltsFs: 20, driverRate: 'reduced' });
    const n = 4800;
    const x = new Float32Array(n);
    for (let k = 0; k < n; k++) x[k] = 0.5 * Math.sin((2 * Math.PI * 50 * k) / FS);
    const out = new Float32Array(n);
    r.process([x], [out], n);
    const doc = example('living-room-vented');
    for (const fx of [2200, 600, 300]) {
      doc.crossover = { type: 'lr4', fx_hz: fx };
      r.update(systemOf(doc));
      r.process([x], [out], n);
      for (const v of out) expect(Number.isFinite(v)).toBe(true);
      expect(Math.max(...out.map(Math.abs))).toBeGreaterThan(0.01);
    }
  });
});
