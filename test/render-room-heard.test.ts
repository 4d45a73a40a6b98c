// A file render (renderBuffer: one mode, no side streams) runs the room on the heard stream alone;
// what it hands out must be sample for sample what a renderer running the room on every stream
// hands out (the live bench's renderer, whose mode may change).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../src/engine/design/validate.ts';
import { synthesizeDemoTrack } from '../src/engine/demo/track.ts';
import { createRenderer, renderBuffer, type RenderMode } from '../src/engine/render/index.ts';

const FS = 48000;

describe('the room on the heard stream only', () => {
  const doc = JSON.parse(readFileSync('public/examples/living-room-vented-in-room.json', 'utf8'));
  const parsed = parseDesign(doc);
  if (!parsed.ok) throw new Error('the example does not parse');
  const sys = parsed.system;
  const track = synthesizeDemoTrack(FS);
  const from = 15 * FS,
    n = 2 * FS;
  const input = track.channels.map((c) => c.slice(from, from + n));
  const volts = 20;

  for (const mode of ['nonlinear', 'linear', 'residual'] as RenderMode[]) {
    it(`leaves the ${mode} stream unchanged`, () => {
      const file = renderBuffer(sys, input, FS, { voltsFs: volts, leqPerVoltDb: 0, mode });
      const live = createRenderer(sys, { sampleRate: FS, channels: 2, voltsFs: volts, mode });
      const lat = live.latencyFrames;
      const out = [new Float32Array(n + lat), new Float32Array(n + lat)];
      const padded = input.map((c) => {
        const p = new Float32Array(n + lat);
        p.set(c);
        return p;
      });
      for (let s = 0; s < n + lat; s += 4096) {
        const m = Math.min(4096, n + lat - s);
        live.process(
          padded.map((c) => c.subarray(s, s + m)),
          out.map((c) => c.subarray(s, s + m)),
          m,
        );
      }
      let differ = 0,
        energy = 0;
      for (let c = 0; c < 2; c++)
        for (let k = 0; k < n; k++) {
          if (file.audio[c][k] !== out[c][k + lat]) differ++;
          energy += file.audio[c][k] ** 2;
        }
      expect(energy).toBeGreaterThan(0);
      expect(differ).toBe(0);
    });
  }

  it('refuses a change of mode on a renderer made for one', () => {
    const r = createRenderer(sys, { sampleRate: FS, channels: 2, voltsFs: volts, fixedMode: true });
    expect(() => r.setMode('linear')).toThrow();
  });
});
