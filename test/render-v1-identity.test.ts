// A first-version design renders exactly as the first version rendered it: the six designs in
// test/fixtures/v1-renders.json were rendered by the first version's code (6 s of the demo track
// from 10 s, 48 kHz stereo, side streams on) and their Float32 samples hashed with SHA-256. Here the
// stored version 1 documents go through the migration to version 2 and the way-by-way renderer.
// The distortion measure changed on purpose (issue "limits": only the part of the residual that is
// not coherent with the linear output counts), so the residual-level trace and the output's own
// events are no longer the first version's (the output also has compression events now): the audio, the other traces, the ways' events and the
// summary's first-version fields still are, and every distortion event now lies inside one of the
// first version's (the new measure never exceeds the old one).
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import fixture from './fixtures/v1-renders.json' with { type: 'json' };
import { parseDesign } from '../src/engine/design/validate.ts';
import { renderBuffer } from '../src/engine/render/index.ts';
import { synthesizeDemoTrack } from '../src/engine/demo/track.ts';

const sha256 = (arrays: Float32Array[]): string => {
  const h = createHash('sha256');
  for (const a of arrays) h.update(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
  return h.digest('hex');
};

const { start_s, seconds, sample_rate: fs } = fixture.excerpt;
const track = synthesizeDemoTrack(fs);
const from = Math.round(start_s * fs);
const excerpt = track.channels.map((c) => c.slice(from, from + Math.round(seconds * fs)));

describe('version 1 designs render bit-identically after migration', () => {
  for (const [name, stored] of Object.entries(fixture.designs)) {
    it(name, () => {
      const parsed = parseDesign(stored.design);
      if (!parsed.ok) throw new Error(parsed.errors.map((e) => `${e.path}: ${e.message}`).join('\n'));
      expect(parsed.design.version).toBe(2);
      // The exact path: every driver model at the audio rate, as the first version ran it.
      const r = renderBuffer(parsed.system, excerpt, fs, { extraStreams: true, driverRate: 'audio' });
      expect(sha256(r.audio)).toBe(stored.audio);
      expect(sha256(r.linear!)).toBe(stored.linear);
      expect(sha256(r.residual!)).toBe(stored.residual);
      const t = r.traces;
      const storedTraces = (stored as { traces_without_residual?: string }).traces_without_residual;
      expect(sha256([t.excursionMm, t.coilTempC, t.portSpeed, t.compressionDb])).toBe(storedTraces);
      // The first version's summary fields, unchanged; events now also name their way.
      const { realtime_factor: _rt, ways, events, output_compression_db: _c, output_distortion_db: _d, ...rest } = r.summary;
      const { events: storedEvents, ...storedRest } = stored.summary;
      expect(rest).toEqual(storedRest);
      const ofWays = events.filter((e) => e.way !== undefined);
      expect(ofWays.map(({ way: _w, ...e }) => e)).toEqual(storedEvents.filter((e) => e.kind !== 'distortion'));
      for (const e of ofWays) expect(e.way).toBe('woofer');
      const oldDistortion = storedEvents.filter((e) => e.kind === 'distortion');
      // The output's compression (the coherent part) is new; its distortion is a part of the old one.
      for (const e of events.filter((e) => e.way === undefined && e.kind !== 'compression')) {
        expect(e.kind).toBe('distortion');
        expect(oldDistortion.some((o) => o.start_s <= e.start_s && e.end_s <= o.end_s)).toBe(true);
      }
      // The woofer way's own peaks are the top-level ones.
      expect(ways.map((w) => w.name)).toEqual(['woofer']);
      const { name: _n, ...woofer } = ways[0];
      for (const [k, v] of Object.entries(woofer)) expect(rest[k as keyof typeof rest]).toEqual(v);
    });
  }
});
