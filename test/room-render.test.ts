// The room in the design file, the render and the calibration, against the room's own curve.
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseDesign } from '../src/engine/design/validate.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';
import { roomModel, roomTransferAt } from '../src/engine/room/modes.ts';
import { RoomStage } from '../src/engine/room/stage.ts';
import { createRenderer } from '../src/engine/render/renderer.ts';
import { systemPressure } from '../src/engine/response/frequency.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { seatLeqCPerVolt } from '../src/engine/level/calibration.ts';

// The invented client's living room of the example design.
const room = JSON.parse(readFileSync('public/examples/living-room-vented-in-room.json', 'utf8')).listening.room;
const vented = JSON.parse(readFileSync('public/examples/living-room-vented.json', 'utf8'));

function withRoom(doc: Record<string, unknown>, r: unknown = room): Record<string, unknown> {
  const d = structuredClone(doc) as { listening: Record<string, unknown> };
  d.listening.room = r;
  return d;
}

function system(doc: unknown): SpeakerSystem {
  const r = parseDesign(doc);
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('; '));
  return r.system;
}

/** Amplitude and phase of a sine at f in x[from..to) by correlation. */
function sineAt(x: ArrayLike<number>, f: number, fs: number, from: number, to: number): { re: number; im: number } {
  let re = 0,
    im = 0;
  for (let j = from; j < to; j++) {
    re += x[j] * Math.cos((2 * Math.PI * f * j) / fs);
    im -= x[j] * Math.sin((2 * Math.PI * f * j) / fs);
  }
  return { re: (2 * re) / (to - from), im: (2 * im) / (to - from) };
}

describe('the listening room', () => {
  it('is read from the design, mirrored for the pair, and refuses a room gain corner or a seat outside', () => {
    const sys = system(withRoom(vented));
    const r = sys.listening.room!;
    expect(r.size).toEqual([5.2, 3.9, 2.45]);
    expect(r.speakers[1][1]).toBeCloseTo(3.9 - 0.95, 12);
    expect(r.absorption.back).toBe(0.3);
    const both = parseDesign(withRoom({ ...vented, listening: { ...vented.listening, room_gain_hz: 40 } }));
    expect(both.ok).toBe(false);
    if (!both.ok) expect(both.errors[0].path).toBe('listening.room_gain_hz');
    const out = parseDesign(withRoom(vented, { ...room, seat_m: [6, 1, 1] }));
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.errors.map((e) => e.path)).toContain('listening.room.seat_m[0]');
    const pair = system(
      withRoom(vented, {
        ...room,
        speaker_m: [
          [0.6, 0.9, 0.3],
          [0.7, 3.0, 0.3],
        ],
      }),
    );
    expect(pair.listening.room!.speakers[1]).toEqual([0.7, 3.0, 0.3]);
  });

  it('as a resonator bank, matches its curve within 0.5 dB from 20 to 200 Hz (impulse response, 48 kHz)', () => {
    const sys = system(withRoom(vented));
    const path = roomModel(sys.listening, sys.air)!.paths[0];
    const fs = 48000;
    const n = 3 * fs;
    const ir = new Float64Array(n);
    ir[0] = 1;
    const stage = new RoomStage(path, fs);
    for (let s = 0; s < n; s += 256) stage.process(ir.subarray(s, s + 256), 256);
    let worst = 0;
    for (let f = 20; f <= 200; f *= 2 ** (1 / 24)) {
      let re = 0,
        im = 0;
      for (let j = 0; j < n; j++) {
        re += ir[j] * Math.cos((2 * Math.PI * f * j) / fs);
        im -= ir[j] * Math.sin((2 * Math.PI * f * j) / fs);
      }
      const h = roomTransferAt(path, f);
      worst = Math.max(worst, Math.abs(10 * Math.log10((re * re + im * im) / (h.re * h.re + h.im * h.im))));
    }
    expect(worst).toBeLessThan(0.5);
  });

  it('the renderer at low drive plays the analysis curve with the room within 0.5 dB from 20 to 200 Hz', () => {
    const sys = system(withRoom(vented));
    const fs = 24000;
    const paPerFs = 1;
    const voltsFs = 0.05;
    const amp = 0.5;
    let worst = 0;
    for (const f of [20, 27, 34, 41, 50, 63, 80, 100, 125, 160, 200]) {
      const r = createRenderer(sys, { sampleRate: fs, channels: 1, voltsFs, paPerFs });
      const frames = 2 * fs;
      const x = new Float32Array(frames);
      for (let j = 0; j < frames; j++) x[j] = amp * Math.sin((2 * Math.PI * f * j) / fs);
      const y = new Float32Array(frames);
      for (let s = 0; s < frames; s += 1024) r.process([x.subarray(s, s + 1024)], [y.subarray(s, s + 1024)], 1024);
      // The last second (a whole number of cycles of every f here), long after the room has settled.
      const got = sineAt(y, f, fs, frames - fs, frames);
      // Peak volts amp·voltsFs; the curve: the sum per volt times the room's transfer.
      const p = systemPressure(sys, f, amp * voltsFs);
      const h = roomTransferAt(roomModel(sys.listening, sys.air)!.paths[0], f);
      const want = Math.hypot(p.re * h.re - p.im * h.im, p.re * h.im + p.im * h.re);
      worst = Math.max(worst, Math.abs(20 * Math.log10(Math.hypot(got.re, got.im) / want)));
    }
    expect(worst).toBeLessThan(0.5);
    console.log(`render against the curve: worst ${worst.toFixed(3)} dB`);
  });

  it('shows in the analysis: modes with their indices, the Schroeder frequency, the curve with and without', () => {
    const a = analyze(system(withRoom(vented)));
    const r = a.room!;
    expect(r.modes[0]).toMatchObject({ nx: 1, ny: 0, nz: 0 });
    expect(r.modes[0].hz).toBeCloseTo(a.system.air.c / (2 * 5.2), 10);
    expect(r.schroederHz).toBeCloseTo(2000 * Math.sqrt(r.t60S / (5.2 * 3.9 * 2.45)), 10);
    expect(r.curves.freeSplDb).toBe(a.sum.curves.splDb);
    expect(r.peakDb).toBeGreaterThan(3);
    expect(analyze(system(vented)).room).toBeUndefined();
  });

  it('counts in the calibration: the level at the seat includes the room', () => {
    const fs = 8000;
    const f = 63;
    const x = new Float32Array(10 * fs);
    for (let j = 0; j < x.length; j++) x[j] = 0.3 * Math.sin((2 * Math.PI * f * j) / fs);
    const free = system(vented);
    const inRoom = system(withRoom(vented));
    const gain = 20 * Math.log10(Math.hypot(...Object.values(roomTransferAt(roomModel(inRoom.listening, inRoom.air)!.paths[0], f))));
    // The same C weighting in both, so the levels differ by the room's gain at f (the room settles within the first half second of ten).
    const diff = seatLeqCPerVolt(inRoom, [x], fs) - seatLeqCPerVolt(free, [x], fs);
    expect(Math.abs(diff - gain)).toBeLessThan(0.2);
    console.log(`room gain at ${f} Hz ${gain.toFixed(2)} dB, calibration change ${diff.toFixed(2)} dB`);
  });
});

describe('the room in plain words', () => {
  it('says what the room does, with the numbers of the analysis', async () => {
    const { verdict } = await import('../src/engine/verdict/verdict.ts');
    const { roomSpanDb } = await import('../src/engine/room/sentence.ts');
    const sealed = JSON.parse(readFileSync('public/examples/living-room-sealed.json', 'utf8'));
    const a = analyze(system(withRoom(sealed)));
    const b = analyze(system(withRoom(vented)));
    const line = verdict(a, b).find((l) => l.id === 'room')!;
    expect(line.text).toContain(`${roomSpanDb(a.room!).toFixed(1)} dB`);
    expect(line.text).toContain(`${roomSpanDb(b.room!).toFixed(1)} dB`);
    expect(line.text).toContain(`first modes at ${a.room!.modes[0].hz.toFixed(0)}, `);
    expect(line.text.split('. ').length).toBe(1);
    console.log(line.text);
    expect(verdict(analyze(system(sealed)), analyze(system(vented))).some((l) => l.id === 'room')).toBe(false);
  });
});
