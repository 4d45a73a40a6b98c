// WAV export and the bench's offline jobs. The exported files are decoded by an independent
// implementation of the Web Audio API (node-web-audio-api, its decodeAudioData) and by wavefile;
// 16-bit PCM quantises to steps of 1/32768 of full scale (the WAV PCM convention, RIFF/WAVE spec).
import { describe, expect, it } from 'vitest';
import { OfflineAudioContext } from 'node-web-audio-api';
import { encodeWav } from '../src/audio/wav-export.ts';
import { exportStream, levelsFor, renderBoth, TrackWork } from '../src/audio/jobs.ts';
import { renderBuffer, resolveVolts } from '../src/engine/render/index.ts';
import { exampleSystem } from './helpers/audio-bench.ts';

const SR = 48000;
function tone(seconds: number, hz: number, amp: number): Float32Array {
  const x = new Float32Array(Math.round(seconds * SR));
  for (let k = 0; k < x.length; k++) x[k] = amp * Math.sin((2 * Math.PI * hz * k) / SR);
  return x;
}

async function decode(bytes: Uint8Array) {
  const ctx = new OfflineAudioContext(2, 1, SR);
  const buf = await ctx.decodeAudioData(bytes.slice().buffer as ArrayBuffer);
  return Array.from({ length: buf.numberOfChannels }, (_, c) => buf.getChannelData(c));
}

describe('WAV export', () => {
  it('16-bit PCM decodes back within one quantisation step, clipped at the rails', async () => {
    const l = tone(0.1, 440, 0.5),
      r = tone(0.1, 110, 0.25);
    r[10] = 1.5;
    const out = await decode(encodeWav([l, r], SR, '16'));
    expect(out).toHaveLength(2);
    expect(out[0].length).toBe(l.length);
    let err = 0;
    for (let k = 0; k < l.length; k++) err = Math.max(err, Math.abs(out[0][k] - l[k]));
    expect(err).toBeLessThanOrEqual(0.5 / 32768 + 1e-9);
    expect(out[1][10]).toBeCloseTo(32767 / 32768, 6);
  });

  it('32-bit float keeps the samples exactly', async () => {
    const l = tone(0.05, 1000, 0.7);
    const out = await decode(encodeWav([l], SR, 'f32'));
    expect(out[0].length).toBe(l.length);
    for (let k = 0; k < l.length; k += 97) expect(out[0][k]).toBe(l[k]);
  });

  it('names what is wrong with a request', () => {
    expect(() => encodeWav([], SR, '16')).toThrow('a WAV export needs 1..8 channels, got 0');
    expect(() => encodeWav([new Float32Array(4)], 44100.5, '16')).toThrow(
      'sample rate must be a whole number of Hz within 8000..384000, got 44100.5',
    );
    expect(() => encodeWav([new Float32Array(4)], SR, '24' as '16')).toThrow('format must be one of 16, f32, got 24');
  });
});

describe('offline jobs', () => {
  const track = { channels: [tone(1, 40, 0.8), tone(1, 40, 0.8)], sampleRate: SR };
  const systems = { a: exampleSystem('sealed'), b: exampleSystem('vented') };

  it('resolve each design’s planned level for the track as the render does', () => {
    const lv = levelsFor(new TrackWork(track), systems);
    for (const s of ['a', 'b'] as const) {
      const ref = resolveVolts(systems[s], track.channels, SR, {});
      expect(lv[s].voltsFs).toBe(ref.volts);
      // Both are planned at 85 dB(C) Leq at the seat.
      expect(lv[s].splDb).toBeCloseTo(85, 6);
    }
  });

  it('render both designs at their planned levels with progress, and export one stream the same length as the track', () => {
    const seen: number[] = [];
    const cal = new TrackWork(track);
    const r = renderBoth(cal, systems, (f) => seen.push(f));
    expect(seen.at(-1)).toBe(1);
    expect(r.a.summary.events).toEqual(renderBuffer(systems.a, track.channels, SR, {}).summary.events);
    expect(r.b.traces.excursionMm.length).toBeGreaterThan(90);
    const ex = exportStream(cal, systems.b, 'linear', '16');
    expect(ex.frames).toBe(SR);
    expect(ex.bytes.length).toBe(44 + SR * 2 * 2);
    // Encoded while it renders: the bytes of the whole rendered stream encoded at once, in both formats.
    for (const [mode, format] of [
      ['linear', '16'],
      ['nonlinear', 'f32'],
      ['residual', '16'],
    ] as const) {
      const streamed = exportStream(cal, systems.b, mode, format).bytes;
      const whole = renderBuffer(systems.b, track.channels, SR, { mode, leqPerVoltDb: cal.leqPerVoltDb(systems.b) }).audio;
      expect(Buffer.from(streamed).equals(Buffer.from(encodeWav(whole, SR, format))), `${mode} ${format}`).toBe(true);
    }
    // A mono track: two bytes a frame, so most blocks start off a word boundary.
    const mono = new TrackWork({ channels: [tone(1, 40, 0.8)], sampleRate: SR });
    const monoWhole = renderBuffer(systems.a, mono.track.channels, SR, { leqPerVoltDb: mono.leqPerVoltDb(systems.a) }).audio;
    expect(Buffer.from(exportStream(mono, systems.a, 'nonlinear', '16').bytes).equals(Buffer.from(encodeWav(monoWhole, SR, '16')))).toBe(
      true,
    );
  });

  it('calibrate each design once per track: levels, render and export reuse it, with the same results', () => {
    const cal = new TrackWork(track);
    const lv = levelsFor(cal, systems);
    expect(cal.passes).toBe(2);
    const r = renderBoth(cal, structuredClone(systems));
    exportStream(cal, structuredClone(systems.a), 'nonlinear', '16');
    // The Worker gets a fresh copy of the designs with every message: the same content, no new pass.
    expect(cal.passes).toBe(2);
    for (const s of ['a', 'b'] as const) {
      expect(r[s].summary.spl_db).toBeCloseTo(lv[s].splDb, 9);
      // Bit for bit what a render that calibrates by itself gives.
      const alone = renderBuffer(systems[s], track.channels, SR, { analysisOnly: true });
      expect({ ...r[s].summary, realtime_factor: 0 }).toEqual({ ...alone.summary, realtime_factor: 0 });
      expect(r[s].traces).toEqual(alone.traces);
    }
    // An edited design is calibrated again.
    const edited = structuredClone(systems.a);
    edited.listening.level = { mode: 'spl', splDb: 80 };
    levelsFor(cal, { a: edited, b: systems.b });
    expect(cal.passes).toBe(3);
  });

  it('after an edit of one design, render that design only; the other is kept, the same bit for bit', () => {
    const work = new TrackWork(track);
    const before: number[] = [];
    const first = renderBoth(work, structuredClone(systems), (f) => before.push(f));
    expect(work.renderRuns).toBe(2);
    const edited = structuredClone(systems.b);
    edited.listening.level = { mode: 'spl', splDb: 91 };
    const seen: number[] = [];
    const second = renderBoth(work, { a: structuredClone(systems.a), b: edited }, (f) => seen.push(f));
    expect(work.renderRuns).toBe(3);
    expect(second.a).toEqual(first.a);
    const alone = renderBuffer(edited, track.channels, SR, { analysisOnly: true });
    expect({ ...second.b.summary, realtime_factor: 0 }).toEqual({ ...alone.summary, realtime_factor: 0 });
    expect(second.b.summary.peak_excursion_mm).toBeGreaterThan(first.b.summary.peak_excursion_mm * 1.5);
    // The progress covers the renders that run: two halves, then the one render whole.
    expect(before).toContain(0.5);
    expect(before.at(-1)).toBe(1);
    expect(seen).not.toContain(0.5);
    expect(seen.at(-1)).toBe(1);
    // Two equal designs render once; back to the first pair, nothing renders.
    renderBoth(work, { a: edited, b: structuredClone(edited) });
    renderBoth(work, structuredClone(systems));
    expect(work.renderRuns).toBe(3);
  });
});
