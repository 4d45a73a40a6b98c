// The listening bench's AudioWorklet processor, driven in Node through a fake AudioWorkletGlobalScope
// (AudioWorkletProcessor with a message port, registerProcessor, sampleRate), exactly as Chromium
// calls it: process() once per render quantum of 128 frames (W3C Web Audio API 1.0, "render quantum").
import { beforeAll, describe, expect, it } from 'vitest';
import { exampleSystem } from './helpers/audio-bench.ts';
import { renderBuffer } from '../src/engine/render/index.ts';
import { CROSSFADE_S } from '../src/audio/lanes.ts';
import { gainToDb } from '../src/audio/levels.ts';
import type { FromWorklet, ToWorklet } from '../src/audio/protocol.ts';

const SR = 48000;
type Proc = { port: FakePort; process(i: Float32Array[][], o: Float32Array[][]): boolean };

class FakePort {
  sent: FromWorklet[] = [];
  onmessage: ((e: { data: unknown }) => void) | null = null;
  postMessage(m: FromWorklet) {
    this.sent.push(m);
  }
  deliver(m: ToWorklet | unknown) {
    this.onmessage?.({ data: m });
  }
  take<T extends FromWorklet['type']>(type: T): Extract<FromWorklet, { type: T }>[] {
    return this.sent.filter((m) => m.type === type) as Extract<FromWorklet, { type: T }>[];
  }
}

let registered: { name: string; ctor: new () => Proc } | null = null;

beforeAll(async () => {
  const g = globalThis as Record<string, unknown>;
  g.AudioWorkletProcessor = class {
    port = new FakePort();
  };
  g.registerProcessor = (name: string, ctor: new () => Proc) => (registered = { name, ctor });
  g.sampleRate = SR;
  await import('../src/audio/processor.worklet.ts');
});

const A = exampleSystem('sealed');
const B = exampleSystem('vented');

/** A stereo test track: a quiet 400 Hz tone with a loud 35 Hz burst from 0.6 s to 0.9 s. */
function track(seconds: number, burst = true): Float32Array[] {
  const n = Math.round(seconds * SR);
  const l = new Float32Array(n);
  for (let k = 0; k < n; k++) {
    const t = k / SR;
    l[k] = 0.05 * Math.sin(2 * Math.PI * 400 * t);
    if (burst && t >= 0.6 && t < 0.9) l[k] += 0.85 * Math.sin(2 * Math.PI * 35 * (t - 0.6)) * Math.sin((Math.PI * (t - 0.6)) / 0.3);
  }
  return [l, l.slice()];
}

function make(
  channels: Float32Array[],
  opts: { lane?: 'a' | 'b' | 'ref'; match?: boolean; mode?: 'nonlinear' | 'linear' | 'residual'; volts?: [number, number] } = {},
) {
  const p = new registered!.ctor();
  const [va, vb] = opts.volts ?? [30, 30];
  p.port.deliver({ type: 'track', channels: channels.map((c) => c.slice()) });
  p.port.deliver({ type: 'design', slot: 'a', system: A, voltsFs: va });
  p.port.deliver({ type: 'design', slot: 'b', system: B, voltsFs: vb });
  p.port.deliver({ type: 'monitor', gainDb: 0 });
  if (opts.lane) p.port.deliver({ type: 'lane', lane: opts.lane });
  if (opts.match !== undefined) p.port.deliver({ type: 'match', on: opts.match });
  if (opts.mode) p.port.deliver({ type: 'mode', mode: opts.mode });
  return p;
}

/** Runs `quanta` render quanta; returns channel 0 of the output. */
function run(p: Proc, quanta: number, before?: (q: number) => void): Float32Array {
  const out = new Float32Array(quanta * 128);
  const o = [new Float32Array(128), new Float32Array(128)];
  for (let q = 0; q < quanta; q++) {
    before?.(q);
    p.process([[]], [o]);
    out.set(o[0], q * 128);
  }
  return out;
}

const rms = (x: Float32Array, from: number, to: number) => {
  let s = 0;
  for (let k = from; k < to; k++) s += x[k] * x[k];
  return Math.sqrt(s / (to - from));
};

describe('the bench processor in a fake AudioWorkletGlobalScope', () => {
  it('registers under its name, says it is ready and rejects unknown messages with a report', () => {
    expect(registered?.name).toBe('preheard-bench');
    const p = new registered!.ctor();
    expect(p.port.take('ready')).toEqual([{ type: 'ready', sampleRate: SR, latencyFrames: 0 }]);
    p.port.deliver({ type: 'warp', factor: 9 });
    expect(p.port.take('error').at(-1)?.message).toMatch(/unknown message type "warp"/);
    p.port.deliver({ type: 'play', playing: true });
    expect(p.port.take('error').at(-1)?.message).toBe('no track is loaded');
    // With nothing loaded the output is silence, and process() keeps the node alive.
    const o = [new Float32Array(128).fill(1), new Float32Array(128).fill(1)];
    expect(p.process([[]], [o])).toBe(true);
    expect(Math.max(...o[0].map(Math.abs))).toBe(0);
  });

  it('switches A to B at a block boundary through the 5 ms linear crossfade, sample for sample', () => {
    const ch = track(1.2);
    const both = make(ch, { match: false }),
      onlyA = make(ch, { match: false }),
      onlyB = make(ch, { lane: 'b', match: false });
    for (const p of [both, onlyA, onlyB]) p.port.deliver({ type: 'play', playing: true });
    // The request arrives mid-quantum 250 (as a message would between two process() calls).
    const out = run(both, 400, (q) => q === 250 && both.port.deliver({ type: 'lane', lane: 'b' }));
    const a = run(onlyA, 400),
      b = run(onlyB, 400);
    const sw = both.port.take('switched');
    expect(sw).toHaveLength(1);
    const s = sw[0].blockFrame;
    expect(s % 128).toBe(0);
    expect(s).toBe(250 * 128);
    const L = Math.round(CROSSFADE_S * SR);
    expect(sw[0].fadeFrames).toBe(L);
    for (let k = 0; k < s; k++) expect(out[k]).toBe(a[k]);
    let worst = 0;
    for (let k = s; k < s + L; k++) {
      const w = (k - s + 1) / L;
      worst = Math.max(worst, Math.abs(out[k] - ((1 - w) * a[k] + w * b[k])));
    }
    expect(worst).toBeLessThan(1e-6);
    for (let k = s + L; k < out.length; k++) expect(out[k]).toBe(b[k]);
    // The report agrees with the output: no step beyond what the crossfade of these lanes allows.
    expect(sw[0].worstRatio).toBeLessThanOrEqual(1);
    let maxStep = 0;
    for (let k = s; k < s + L + 1; k++) maxStep = Math.max(maxStep, Math.abs(out[k] - out[k - 1]));
    expect(sw[0].maxStep).toBeCloseTo(maxStep, 6);
  });

  it('match levels puts A, B and the reference at one passband level (within 0.3 dB at 400 Hz, linear)', () => {
    const ch = track(0.6, false);
    const level = (lane: 'a' | 'b' | 'ref', match: boolean) => {
      const p = make(ch, { lane, match, mode: 'linear', volts: [30, 12] });
      p.port.deliver({ type: 'play', playing: true });
      const out = run(p, 200);
      return { db: gainToDb(rms(out, 9600, 25600)), p };
    };
    const a = level('a', true),
      b = level('b', true),
      r = level('ref', true);
    expect(Math.abs(a.db - b.db)).toBeLessThan(0.3);
    expect(Math.abs(a.db - r.db)).toBeLessThan(0.3);
    const aOff = level('a', false),
      bOff = level('b', false);
    const lv = aOff.p.port.take('levels').at(-1)!;
    const planned = gainToDb(lv.passbandPa.a / lv.passbandPa.b);
    // Unmatched, the two differ by what the planned volts and sensitivities make of them.
    expect(aOff.db - bOff.db).toBeCloseTo(planned, 0);
    expect(Math.abs(planned)).toBeGreaterThan(5);
  });

  it('reports stress events in track time: the same kinds and starts (within 20 ms) as a whole-file render, after a seek too', () => {
    const ch = track(1.4);
    const p = make(ch, { volts: [40, 40] });
    p.port.deliver({ type: 'seek', frame: Math.round(0.3 * SR) });
    p.port.deliver({ type: 'play', playing: true });
    run(p, Math.ceil((1.2 * SR) / 128));
    const live: FromWorklet[] = p.port.sent;
    const liveA: { kind: string; start_s: number }[] = [];
    for (const m of live) if (m.type === 'events' && m.slot === 'a') liveA.splice(m.from, liveA.length - m.from, ...m.events);
    const off = renderBuffer(A, ch, SR, { voltsFs: 40 }).summary.events;
    expect(off.length).toBeGreaterThan(0);
    expect(liveA.length).toBeGreaterThan(0);
    for (const e of off) {
      const twin = liveA.find((l) => l.kind === e.kind && Math.abs(l.start_s - e.start_s) <= 0.02);
      expect(twin, `${e.kind} at ${e.start_s}`).toBeDefined();
    }
    for (const e of liveA) expect(e.start_s).toBeGreaterThanOrEqual(0.3);
  });

  it('changes the listen mode through a short dip, without a click', () => {
    const ch = track(1.2);
    const p = make(ch, { volts: [40, 40] });
    p.port.deliver({ type: 'play', playing: true });
    const at = 260;
    const out = run(p, 400, (q) => q === at && p.port.deliver({ type: 'mode', mode: 'residual' }));
    const s = at * 128,
      L = Math.round(CROSSFADE_S * SR);
    // Silent at the turn, then the distortion stream alone.
    expect(Math.abs(out[s + L])).toBeLessThan(1e-3);
    // No step at the turn larger than the streams' own largest steps on either side of it.
    let own = 0,
      around = 0;
    for (let k = s - 4000; k < s; k++) own = Math.max(own, Math.abs(out[k] - out[k - 1]));
    for (let k = s + 3 * L; k < s + 3 * L + 4000; k++) own = Math.max(own, Math.abs(out[k] - out[k - 1]));
    for (let k = s; k < s + 3 * L; k++) around = Math.max(around, Math.abs(out[k] - out[k - 1]));
    expect(around).toBeLessThanOrEqual(own * 1.05);
  });

  it('loops a region with a fade at the wrap, and reports the position inside it', () => {
    const ch = track(1.0, false);
    const p = make(ch);
    p.port.deliver({ type: 'loop', region: { startFrame: 4800, endFrame: 14400 } });
    p.port.deliver({ type: 'play', playing: true });
    const out = run(p, 600);
    const pos = p.port.take('position');
    expect(pos.length).toBeGreaterThan(20);
    for (const m of pos.slice(2)) {
      expect(m.frame).toBeGreaterThanOrEqual(4800 - 200);
      expect(m.frame).toBeLessThan(14400);
    }
    // No click at the wraps: no step larger than the tone's own largest step (0.05 at 400 Hz, calibrated).
    let tone = 0,
      worst = 0;
    for (let k = 20000; k < 22000; k++) tone = Math.max(tone, Math.abs(out[k] - out[k - 1]));
    for (let k = 1; k < out.length; k++) worst = Math.max(worst, Math.abs(out[k] - out[k - 1]));
    expect(worst).toBeLessThanOrEqual(tone * 1.05);
    p.port.deliver({ type: 'loop', region: { startFrame: 100, endFrame: 200 } });
    expect(p.port.take('error').at(-1)?.message).toBe('a loop must be at least 50 ms long, got 2.1 ms');
  });

  it('measures its own load and plays to the end, then says so', () => {
    const ch = track(0.5, false);
    const p = make(ch);
    p.port.deliver({ type: 'play', playing: true });
    run(p, Math.ceil((0.7 * SR) / 128));
    expect(p.port.take('ended')).toHaveLength(1);
    const last = p.port.take('position').at(-1)!;
    expect(last.playing).toBe(false);
    expect(last.load).toBeGreaterThan(0);
    expect(last.load).toBeLessThan(1);
    expect(last.meters.a?.excursionMm).toBeGreaterThanOrEqual(0);
  });
});
