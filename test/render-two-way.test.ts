// A two-way active design (test/helpers/two-way.ts): each driver way runs its own model. Below the
// tweeter's resonance a loud tone still moves the tweeter past its Xmax through the crossover's
// high-pass, and the events say so by name. At low drive the rendered sum matches the small-signal
// sum of the two ways at the seat (systemPressure, with each way's filter, polarity and delay).
import { describe, expect, it } from 'vitest';
import { createRenderer, renderBuffer } from '../src/engine/render/index.ts';
import { respond, systemPressure, wayPressure } from '../src/engine/response/frequency.ts';
import { wayFilterAt } from '../src/engine/filters/way-filter.ts';
import { toneAmplitude } from '../src/engine/level/distortion.ts';
import { abs, add } from '../src/engine/complex.ts';
import type { DriverWay } from '../src/engine/system.ts';
import { doc, system } from './helpers/designs.ts';
import { twoWayDoc } from './helpers/two-way.ts';

function sine(fs: number, seconds: number, f: number, amp: number): Float32Array {
  const x = new Float32Array(Math.round(fs * seconds));
  // 20 ms fades at both ends: an abrupt stop would ring the tweeter at its resonance.
  const fade = 0.02 * fs;
  for (let k = 0; k < x.length; k++) x[k] = amp * Math.sin((2 * Math.PI * f * k) / fs) * Math.min(1, k / fade, (x.length - 1 - k) / fade);
  return x;
}

describe('two-way active render', () => {
  const fs = 48000;

  it('the passband levels of the invented drivers differ by about 3 dB (the pad is -3 dB)', () => {
    const sys = system(twoWayDoc());
    const [w, t] = sys.ways as DriverWay[];
    const pw = abs(respond(sys, w, 500, 1).pressure) / abs(wayFilterAt(w.filter, 2 * Math.PI * 500));
    const pt = abs(respond(sys, t, 8000, 1).pressure) / abs(wayFilterAt(t.filter, 2 * Math.PI * 8000));
    expect(20 * Math.log10(pt / pw)).toBeGreaterThan(2);
    expect(20 * Math.log10(pt / pw)).toBeLessThan(4);
  });

  it('a loud tone below the tweeter resonance gives tweeter excursion events, a quiet one none', () => {
    const sys = system(twoWayDoc());
    const tweeter = sys.ways[1] as DriverWay;
    const f = 700;
    // Peak volts per full scale for a small-signal peak excursion of 1.5 Xmax of the tweeter.
    const xPerVolt = abs(respond(sys, tweeter, f, 1).excursion);
    const loud = (1.5 * tweeter.unit.xmax) / xPerVolt;
    // The tweeter's own amplifier channel stays inside its rail: its filter takes most of the drive.
    expect(loud * abs(wayFilterAt(tweeter.filter, 2 * Math.PI * f))).toBeLessThan(sys.amplifier.vPeak);
    const x = sine(fs, 0.4, f, 1);
    const r = renderBuffer(sys, [x], fs, { voltsFs: loud });
    const tw = r.summary.events.filter((e) => e.way === 'tweeter');
    expect(tw.map((e) => e.kind)).toContain('excursion');
    const exc = tw.find((e) => e.kind === 'excursion')!;
    expect(exc.limit).toBeCloseTo(0.3, 6);
    expect(exc.peak).toBeGreaterThan(0.3);
    expect(exc.peak).toBeLessThan(1.5 * 0.3 * 1.05);
    const tSummary = r.summary.ways.find((w) => w.name === 'tweeter')!;
    expect(tSummary.peak_excursion_mm).toBeCloseTo(exc.peak, 3);
    // The woofer's own events carry its name; its amplifier channel clips at this drive.
    // The summed output's own events (distortion, its coherent compression) name no way.
    for (const e of r.summary.events) {
      if (e.way === undefined) expect(['distortion', 'compression']).toContain(e.kind);
      else expect(['woofer', 'tweeter']).toContain(e.way);
    }
    expect(r.summary.events.some((e) => e.way === 'woofer' && e.kind === 'amplifier-clip')).toBe(true);
    expect(r.summary.events.some((e) => e.way === 'tweeter' && e.kind === 'amplifier-clip')).toBe(false);

    const quiet = renderBuffer(sys, [x], fs, { voltsFs: loud / 3 });
    expect(quiet.summary.events.filter((e) => e.way === 'tweeter' && e.kind === 'excursion')).toEqual([]);
    const q = quiet.summary.ways.find((w) => w.name === 'tweeter')!;
    // Half of Xmax in the small-signal model; the large-signal model agrees within 3% down here.
    expect(q.peak_excursion_mm).toBeGreaterThan(0.5 * 0.3 * 0.97);
    expect(q.peak_excursion_mm).toBeLessThan(0.5 * 0.3 * 1.03);
  });

  // Steady-state level of the rendered sum against the complex sum of the ways (0.1 dB). The woofer's
  // acoustic centre 25 mm behind the tweeter's is a fractional delay of 3.5 samples in the render;
  // a delay in the tweeter's own filter runs in front of its amplifier.
  for (const [label, opts] of [
    ['acoustic offset', { wooferOffsetMm: 25 }],
    ['filter delay', { tweeterDelayMs: 0.05 }],
  ] as const) {
    it(`low-drive sum matches systemPressure within 0.1 dB (${label})`, () => {
      const sys = system(twoWayDoc(opts));
      for (const f of [300, 1000, 2200, 4000]) {
        const amp = 0.5;
        const x = sine(fs, 0.5, f, amp);
        const r = renderBuffer(sys, [x], fs, { voltsFs: 1 });
        const cycles = Math.floor(0.2 * f);
        const len = Math.round((cycles * fs) / f);
        const pa = toneAmplitude(r.audio[0], x.length - len - 0.03 * fs, len, f, fs) * r.summary.pa_per_fs;
        const ref = abs(systemPressure(sys, f, amp));
        expect(Math.abs(20 * Math.log10(pa / ref)), `${f} Hz`).toBeLessThan(0.1);
      }
    });
  }

  it('mono-sum shares the bass way only: the tweeters stay per channel', () => {
    const base = twoWayDoc();
    const mono = system({ ...base, listening: { ...base.listening, channels: 'mono-sum' } });
    const pair = system(base);
    const left = sine(fs, 0.5, 100, 0.5);
    const right = sine(fs, 0.5, 3000, 0.5);
    const m = renderBuffer(mono, [left, right], fs, { voltsFs: 1 });
    const p = renderBuffer(pair, [left, right], fs, { voltsFs: 1, paPerFs: m.summary.pa_per_fs });
    const at = (x: Float32Array, f: number) => toneAmplitude(x, 0.2 * fs, 0.2 * fs, f, fs);
    // The bass way plays the channels' mean on both sides: half the left channel's bass, on both.
    expect(20 * Math.log10(at(m.audio[0], 100) / at(m.audio[1], 100))).toBeCloseTo(0, 2);
    expect(20 * Math.log10(at(m.audio[0], 100) / (0.5 * at(p.audio[0], 100)))).toBeCloseTo(0, 1);
    // Each channel's tweeter plays its own channel only; the shared woofer leaks the mean's 3 kHz
    // (through its low-pass) into both. In Pa, against the ways' small-signal sums. The woofer model
    // at the audio rate is within 0.1 dB up to 2 kHz (sim-lowdrive); on its steep slope at 3 kHz,
    // within 0.3 dB (a routing error would be 6 dB or the whole tone).
    const [woofer, tweeter] = mono.ways;
    const pa = (x: Float32Array, f: number) => at(x, f) * m.summary.pa_per_fs;
    const dB = (a: number, b: number) => Math.abs(20 * Math.log10(a / b));
    expect(dB(pa(m.audio[0], 3000), abs(wayPressure(mono, woofer, 3000, 0.25)))).toBeLessThan(0.3);
    expect(dB(pa(m.audio[1], 3000), abs(add(wayPressure(mono, tweeter, 3000, 0.5), wayPressure(mono, woofer, 3000, 0.25))))).toBeLessThan(
      0.1,
    );
    expect(at(p.audio[0], 3000)).toBeLessThan(1e-6 * at(p.audio[1], 3000));
  });

  it('a live edit keeps the running ways; a new way joins with its own stress meter', () => {
    const one = system(doc({ fs_hz: 42, qes: 0.42, qms: 3.6, vas_l: 24 }, { type: 'sealed', vb_l: 14 }));
    const two = system(twoWayDoc());
    const r = createRenderer(one, { sampleRate: fs, channels: 1, voltsFs: 5 });
    const x = sine(fs, 0.1, 60, 0.5);
    const out = new Float32Array(x.length);
    r.process([x], [out], x.length);
    expect(r.getStats().ways.map((w) => w.name)).toEqual(['woofer']);
    r.update(two);
    r.process([x], [out], x.length);
    expect(r.getStats().ways.map((w) => w.name)).toEqual(['woofer', 'tweeter']);
    for (const v of out) expect(Number.isFinite(v)).toBe(true);
    // Same shape (the tweeter's pad changed): the tweeter's cone carries on where it was.
    const padded = system({ ...twoWayDoc(), name: 'padded' });
    (padded.ways[1] as DriverWay).filter.gain = 0.5;
    const before = r.lane(0, 1).sim.x;
    r.update(padded);
    expect(r.lane(0, 1).sim.x).toBe(before);
    expect(before).not.toBe(0);
  });
});
