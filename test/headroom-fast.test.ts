// The fast headroom search (probes stop at their first stress event; the first probes placed by the
// linear model's guess) against the search run in full (every probe renders the whole track and
// bisects blindly): the clean level agrees within the search's 0.25 dB step and names the same limit.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { findHeadroom, renderBuffer } from '../src/engine/render/index.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { synthesizeDemoTrack } from '../src/engine/demo/track.ts';
import { exampleSystem } from './helpers/audio-bench.ts';

const fs = 48000;
const track = synthesizeDemoTrack(fs);
const STEP_DB = 0.25;

function agree(sys: Parameters<typeof findHeadroom>[0], channels: Float32Array[]) {
  const exact = findHeadroom(sys, channels, fs, { exact: true });
  const fast = findHeadroom(sys, channels, fs);
  expect(Math.abs(20 * Math.log10(fast.clean_volts / exact.clean_volts))).toBeLessThanOrEqual(STEP_DB);
  if (fast.first_limit !== exact.first_limit) {
    // Two limits within one step of each other: which comes first depends on where in that step the
    // search lands. Then one step above the exact clean level both start together (within 0.1 s).
    const above = renderBuffer(sys, channels, fs, { voltsFs: exact.clean_volts * 10 ** (STEP_DB / 20), analysisOnly: true });
    const startOf = (kind: string | null) => above.summary.events.find((e) => e.kind === kind)?.start_s ?? Infinity;
    expect(Math.abs(startOf(fast.first_limit) - startOf(exact.first_limit))).toBeLessThan(0.1);
  } else {
    expect(fast.first_limit_way).toBe(exact.first_limit_way);
    if (exact.first_limit_s !== null) expect(Math.abs(fast.first_limit_s! - exact.first_limit_s)).toBeLessThan(0.5);
  }
  return fast;
}

describe('fast headroom search', () => {
  it('stops a render at its first stress event with the same first event', () => {
    const sys = exampleSystem('vented');
    const full = renderBuffer(sys, track.channels, fs, { voltsFs: 60, analysisOnly: true });
    const early = renderBuffer(sys, track.channels, fs, { voltsFs: 60, analysisOnly: true, stopAtFirstEvent: true });
    expect(full.summary.events.length).toBeGreaterThanOrEqual(early.summary.events.length);
    expect(early.summary.events.length).toBeGreaterThan(0);
    expect(early.summary.events[0]).toMatchObject({ kind: full.summary.events[0].kind, start_s: full.summary.events[0].start_s });
  });

  for (const kind of ['vented', 'sealed'] as const) {
    it(`the ${kind} example on the demo track`, () => {
      const fast = agree(exampleSystem(kind), track.channels);
      const clean = renderBuffer(exampleSystem(kind), track.channels, fs, { voltsFs: fast.clean_volts, analysisOnly: true });
      expect(clean.summary.events).toEqual([]);
    }, 60000);
  }

  it('random variations of the examples on an excerpt', () => {
    const root = new URL('../public/examples/', import.meta.url);
    let seed = 20261203;
    const rnd = () => {
      seed = (seed * 1103515245 + 12345) % 2147483648;
      return seed / 2147483648;
    };
    const from = 14 * fs;
    const excerpt = track.channels.map((c) => c.slice(from, from + 4 * fs));
    for (let k = 0; k < 4; k++) {
      const doc = JSON.parse(readFileSync(new URL(`living-room-${k % 2 ? 'sealed' : 'vented'}.json`, root), 'utf8'));
      doc.driver.xmax_mm = 3 + 6 * rnd();
      doc.driver.qes = 0.3 + 0.3 * rnd();
      doc.box.vb_l = 8 + 30 * rnd();
      if (doc.box.type === 'vented') doc.box.fb_hz = 32 + 20 * rnd();
      doc.amplifier.power_w = 20 + 200 * rnd();
      const parsed = parseDesign(doc);
      if (!parsed.ok) throw new Error(parsed.errors.map((e) => e.message).join('; '));
      agree(parsed.system, excerpt);
    }
  }, 120000);
});
