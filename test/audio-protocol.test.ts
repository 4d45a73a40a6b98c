// The listening bench's message protocol: every message checked on arrival, wrong ones named.
// Behaviour of our own protocol (common practice, no source); message shapes follow the
// structured-clone rules of the HTML standard (plain data and typed arrays only).
import { describe, expect, it } from 'vitest';
import { encodeToWorklet, parseFromWorklet, parseToWorklet, type ToWorklet } from '../src/audio/protocol.ts';
import { exampleSystem as system } from './helpers/audio-bench.ts';

describe('messages to the worklet', () => {
  it('accepts each kind of message and returns it unchanged', () => {
    const msgs: ToWorklet[] = [
      { type: 'track', channels: [new Float32Array(10), new Float32Array(10)] },
      { type: 'design', slot: 'b', system: system('vented'), voltsFs: 12.5 },
      { type: 'level', slot: 'a', voltsFs: 3 },
      { type: 'lane', lane: 'ref' },
      { type: 'mode', mode: 'residual' },
      { type: 'monitor', gainDb: -24 },
      { type: 'match', on: false },
      { type: 'loop', region: { startFrame: 100, endFrame: 5000 } },
      { type: 'loop', region: null },
      { type: 'seek', frame: 48000 },
      { type: 'play', playing: true },
    ];
    for (const m of msgs) {
      const r = parseToWorklet(m);
      expect(r.ok, JSON.stringify(r)).toBe(true);
      if (r.ok) expect(r.msg).toEqual(m);
    }
  });

  it('rejects an unknown message type, naming it and the known ones', () => {
    const r = parseToWorklet({ type: 'explode' });
    expect(r).toEqual({ ok: false, error: expect.stringContaining('unknown message type "explode"') });
    if (!r.ok) expect(r.error).toContain('track, design, level, lane, mode, monitor, match, loop, seek, play');
    expect(parseToWorklet(null)).toEqual({ ok: false, error: 'message must be an object, got null' });
    expect(parseToWorklet([1])).toEqual({ ok: false, error: 'message must be an object, got an array of 1' });
  });

  it('names the field, the value and the allowed range when a value is wrong', () => {
    const err = (m: unknown) => {
      const r = parseToWorklet(m);
      expect(r.ok).toBe(false);
      return r.ok ? '' : r.error;
    };
    expect(err({ type: 'lane', lane: 'c' })).toBe('message("lane").lane must be one of a, b, ref, got "c"');
    expect(err({ type: 'monitor', gainDb: 40 })).toBe('message("monitor").gainDb must be within -120..12, got 40');
    expect(err({ type: 'monitor', gainDb: Number.NaN })).toBe('message("monitor").gainDb must be a finite number, got NaN');
    expect(err({ type: 'seek', frame: 1.5 })).toBe('message("seek").frame must be a whole number, got 1.5');
    expect(err({ type: 'seek', frame: -1 })).toContain('must be within 0..');
    expect(err({ type: 'mode', mode: 'distorted' })).toBe(
      'message("mode").mode must be one of nonlinear, linear, residual, got "distorted"',
    );
    expect(err({ type: 'play', playing: 'yes' })).toBe('message("play").playing must be true or false, got "yes"');
    expect(err({ type: 'loop', region: { startFrame: 500, endFrame: 400 } })).toBe(
      'message("loop").region.endFrame (400) must be after startFrame (500)',
    );
    expect(err({ type: 'design', slot: 'a', system: { name: 'x' }, voltsFs: 1 })).toBe(
      'message("design").system.air must be an object, got undefined',
    );
    expect(err({ type: 'design', slot: 'a', system: system('sealed'), voltsFs: 0 })).toContain(
      'voltsFs must be within 0.000001..10000, got 0',
    );
    expect(err({ type: 'track', channels: [new Float32Array(4), new Float32Array(5)] })).toBe(
      'message("track").channels[1] has 5 frames, channel 0 has 4: channels must be the same length',
    );
    expect(err({ type: 'track', channels: [[0, 1]] })).toBe('message("track").channels[0] must be a Float32Array, got an array of 2');
    expect(err({ type: 'track', channels: [new Float32Array(0)] })).toBe(
      'message("track").channels is empty: a track needs at least one frame',
    );
    const bad = system('sealed') as unknown as { ways: { driver: { fs: number } }[] };
    bad.ways[0].driver.fs = -3;
    expect(err({ type: 'design', slot: 'a', system: bad, voltsFs: 1 })).toContain('system.ways[0].driver.fs must be within');
    const flipped = system('sealed') as unknown as { ways: { polarity: number }[] };
    flipped.ways[1].polarity = 0;
    expect(err({ type: 'design', slot: 'a', system: flipped, voltsFs: 1 })).toBe(
      'message("design").system.ways[1].polarity must be 1 or -1, got 0',
    );
    const five = system('sealed') as unknown as { ways: unknown[] };
    five.ways = [...five.ways, ...five.ways, five.ways[0]];
    expect(err({ type: 'design', slot: 'a', system: five, voltsFs: 1 })).toBe(
      'message("design").system.ways must be a list of 1 to 4 ways, got an array of 5',
    );
    const noDriver = system('sealed') as unknown as { ways: unknown[] };
    noDriver.ways = noDriver.ways.slice(1);
    expect(err({ type: 'design', slot: 'a', system: noDriver, voltsFs: 1 })).toBe('message("design").system.ways has no way with a driver');
  });

  it('moves the track samples instead of copying them, and refuses to encode a bad message', () => {
    const ch = [new Float32Array(8), new Float32Array(8)];
    const { transfer } = encodeToWorklet({ type: 'track', channels: ch });
    expect(transfer).toEqual([ch[0].buffer, ch[1].buffer]);
    expect(encodeToWorklet({ type: 'lane', lane: 'b' }).transfer).toEqual([]);
    expect(() => encodeToWorklet({ type: 'lane', lane: 'x' } as unknown as ToWorklet)).toThrow(/must be one of a, b, ref/);
  });
});

describe('reports from the worklet', () => {
  it('accepts well-formed reports and rejects unknown or malformed ones', () => {
    const pos = {
      type: 'position',
      frame: 4800,
      playing: true,
      lane: 'a',
      load: 0.05,
      lateBlocks: 0,
      meters: { a: { excursionMm: 1, coilTempC: 25, portSpeed: 0, compressionDb: 0, residualDb: -60 }, b: null },
    };
    expect(parseFromWorklet(pos)).toEqual({ ok: true, msg: pos });
    const ev = {
      type: 'events',
      slot: 'b',
      from: 2,
      events: [
        { kind: 'port-speed', way: 'woofer', start_s: 1, end_s: 1.2, peak: 19, unit: 'm/s', limit: 17 },
        { kind: 'distortion', way: null, start_s: 2, end_s: 2.5, peak: -18, unit: 'dB', limit: -20 },
      ],
    };
    expect(parseFromWorklet(ev)).toEqual({ ok: true, msg: ev });
    // A first-version report names no way: the way is null (the strip puts it in the first way's lane).
    const old = { ...ev, events: [{ kind: 'excursion', start_s: 1, end_s: 1.1, peak: 6, unit: 'mm', limit: 5.5 }] };
    expect(parseFromWorklet(old)).toEqual({ ok: true, msg: { ...old, events: [{ ...old.events[0], way: null }] } });
    expect(parseFromWorklet({ ...ev, events: [{ ...ev.events[0], way: 3 }] })).toEqual({
      ok: false,
      error: 'report("events").events[0].way must be a string, got 3',
    });
    expect(
      parseFromWorklet({
        type: 'events',
        slot: 'b',
        from: 0,
        events: [{ kind: 'meltdown', start_s: 1, end_s: 1, peak: 1, unit: '', limit: 1 }],
      }),
    ).toEqual({
      ok: false,
      error: expect.stringContaining('events[0].kind must be one of excursion, xlim'),
    });
    expect(parseFromWorklet({ type: 'hello' })).toEqual({ ok: false, error: expect.stringContaining('unknown report type "hello"') });
    expect(parseFromWorklet({ ...pos, lane: 'x' })).toEqual({
      ok: false,
      error: 'report("position").lane must be one of a, b, ref, got "x"',
    });
  });
});
