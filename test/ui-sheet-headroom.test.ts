// The Headroom probe's worker code, run in Node, against `preheard headroom --json` on the same file
// and design: the numbers the app shows must be the CLI's.
import { beforeAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeWav } from '../src/cli/wav.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { renderBuffer } from '../src/engine/render/index.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';
import { passEstimate, probeHeadroom, TYPICAL_PASSES, type HeadroomResult } from '../src/audio/headroom.worker.ts';

const SR = 48000;
const dir = mkdtempSync(join(tmpdir(), 'preheard-probe-'));
const wav = join(dir, 'bass-bursts.wav');
const DESIGNS = ['public/examples/living-room-sealed.json', 'public/examples/living-room-vented.json'];
let track: Float32Array[];

function cliJson(design: string): Promise<HeadroomResult> {
  return new Promise((resolve, reject) => {
    const p = spawn(process.execPath, ['src/cli/preheard.mjs', 'headroom', design, wav, '--json']);
    let out = '';
    let err = '';
    p.stdout.on('data', (d) => (out += d));
    p.stderr.on('data', (d) => (err += d));
    p.on('exit', (code) => (code === 0 ? resolve(JSON.parse(out)) : reject(new Error(`preheard headroom exit ${code}: ${err}`))));
  });
}

function system(path: string): SpeakerSystem {
  const r = parseDesign(readFileSync(path, 'utf8'));
  if (!r.ok) throw new Error(`${path} is invalid`);
  return r.system;
}

beforeAll(async () => {
  // 3 s, stereo: a quiet 55 Hz line, then from 1.5 s a loud 38 Hz burst (where a small box runs out
  // of travel first). 32-bit float, so the file holds exactly the samples given to the worker code.
  const n = 3 * SR;
  const l = new Float32Array(n);
  const r = new Float32Array(n);
  for (let k = 0; k < n; k++) {
    const t = k / SR;
    const loud = t >= 1.5;
    const env = Math.min(1, (t % 1.5) / 0.01);
    l[k] = env * (loud ? 0.8 * Math.sin(2 * Math.PI * 38 * t) : 0.1 * Math.sin(2 * Math.PI * 55 * t));
    r[k] = 0.9 * l[k];
  }
  track = [l, r];
  await writeWav(wav, track, SR, 'f32');
});

describe('Headroom probe worker code = preheard headroom', () => {
  it('gives the CLI numbers for both demo designs on the same file, with a progress call after each render', async () => {
    const cli = Promise.all(DESIGNS.map(cliJson));
    const mine = DESIGNS.map((d) => {
      const calls: [number, number][] = [];
      const res = probeHeadroom(system(d), track, SR, (done, estimate) => calls.push([done, estimate]));
      return { res, calls };
    });
    const ref = await cli;
    for (let i = 0; i < DESIGNS.length; i++) {
      const { res, calls } = mine[i];
      expect({
        clean_volts: res.clean_volts,
        clean_spl_db: res.clean_spl_db,
        first_limit: res.first_limit,
        first_limit_way: res.first_limit_way,
        first_limit_s: res.first_limit_s,
      }).toEqual(ref[i]);
      // One progress call after each probe: the runs through the track so far, rising to the result's.
      expect(calls.length).toBe(res.renders);
      for (let k = 1; k < calls.length; k++) expect(calls[k][0]).toBeGreaterThan(calls[k - 1][0]);
      expect(calls.at(-1)![0]).toBeCloseTo(res.passes!, 2);
      for (const [done, est] of calls) expect(est).toBeGreaterThan(done);
      // The loud 38 Hz burst starts at 1.5 s; the first limit is found there, not in the quiet part.
      expect(res.first_limit).not.toBeNull();
      expect(res.first_limit_s!).toBeGreaterThanOrEqual(1.5);
      expect(res.first_limit_s!).toBeLessThan(3);
    }
  });

  it('is the highest clean level to within 0.25 dB: clean at it, a stress event 0.3 dB above', () => {
    const sys = system(DESIGNS[1]);
    const h = probeHeadroom(sys, track, SR);
    const at = renderBuffer(sys, track, SR, { voltsFs: h.clean_volts, analysisOnly: true }).summary;
    const above = renderBuffer(sys, track, SR, { voltsFs: h.clean_volts * 10 ** (0.3 / 20), analysisOnly: true }).summary;
    expect(at.events).toEqual([]);
    expect(above.events.length).toBeGreaterThan(0);
    // The seat level it reports is the render's own: 20 log10 of the volts ratio moves it dB for dB.
    expect(at.spl_db).toBeCloseTo(h.clean_spl_db, 1);
  });

  it('estimates the runs through the track from the searches it actually runs, one more while a search runs long', () => {
    // The estimate is honest on this track too: both demo designs finish within one run of it.
    for (const d of DESIGNS) {
      const h = probeHeadroom(system(d), track, SR);
      expect(Math.abs(h.passes! - TYPICAL_PASSES)).toBeLessThanOrEqual(1);
      // Most probes stop at their first event: the runs are far fewer than the renders.
      expect(h.passes!).toBeLessThan(h.renders);
    }
    expect(passEstimate(0.3)).toBe(TYPICAL_PASSES);
    expect(passEstimate(TYPICAL_PASSES)).toBe(TYPICAL_PASSES + 1);
    expect(passEstimate(8.2)).toBe(10);
  });
});
