import { describe, expect, it, beforeAll } from 'vitest';
import { runCli, spawnCli } from './helpers/cli.ts';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeWav } from '../src/cli/wav.ts';
import { parseRange } from '../src/cli/sweep.ts';
import { sweptWayIndex, variant } from '../src/cli/sweep-variant.ts';
import { twoWayFrom } from './helpers/tweeter.ts';

const dir = mkdtempSync(join(tmpdir(), 'preheard-sweep-'));
const wav = join(dir, 'burst.wav');

const twoWay = () => twoWayFrom('public/examples/living-room-vented.json');
const twoWayFile = join(dir, 'two-way.json');

beforeAll(async () => {
  // 2 s: a quiet 45 Hz tone with a loud second in the middle.
  const sr = 48000;
  const ch = new Float32Array(2 * sr);
  for (let k = 0; k < ch.length; k++) ch[k] = (k > sr / 2 && k < 1.5 * sr ? 0.9 : 0.05) * Math.sin((2 * Math.PI * 45 * k) / sr);
  await writeWav(wav, [ch], sr, '16');
  writeFileSync(twoWayFile, JSON.stringify(twoWay()));
});

describe('preheard sweep', () => {
  it('parses FROM:TO:STEP inclusively', async () => {
    expect(parseRange('20:60:5', '--vb', 0.05, 20000)).toEqual([20, 25, 30, 35, 40, 45, 50, 55, 60]);
    expect(parseRange('30:31:0.5', '--fb', 5, 500)).toEqual([30, 30.5, 31]);
  });

  it("varies only the chosen way's box: volume, and tuning for a vented box", () => {
    const d = twoWay();
    expect(sweptWayIndex(d, undefined)).toBe(0);
    expect(sweptWayIndex(d, 'tweeter')).toBe(1);
    expect(sweptWayIndex(d, 'midrange')).toBe(-1);
    const woofer = variant(d, { vb_l: 30, fb_hz: 35 }, 0);
    expect(woofer.ways[0].kind === 'driver' && woofer.ways[0].box).toMatchObject({ type: 'vented', vb_l: 30, fb_hz: 35 });
    expect(woofer.ways[1]).toEqual(d.ways[1]);
    const tweeter = variant(d, { vb_l: 0.05, fb_hz: null }, 1);
    expect(tweeter.ways[1].kind === 'driver' && tweeter.ways[1].box).toEqual({ type: 'sealed', vb_l: 0.05 });
    expect(tweeter.ways[0]).toEqual(d.ways[0]);
    expect(d.ways[1].kind === 'driver' && d.ways[1].box).toEqual({ type: 'sealed', vb_l: 0.03 }); // the original is untouched
  });

  it('sweeps the way named by --way, and refuses a name that is not a driver way (exit 1)', async () => {
    const r = await runCli('sweep', twoWayFile, wav, '--vb', '0.02:0.04:0.02', '--way', 'tweeter', '--json', '--threads', '1');
    expect(r.status).toBe(0);
    const rows = JSON.parse(r.stdout).steps;
    expect(rows.map((x: { vb_l: number }) => x.vb_l)).toEqual([0.02, 0.04]);
    // The tweeter's f3 is set by its LR4 high-pass at 2.2 kHz; its back chamber (fc near 1 kHz) moves
    // it by a few per cent only, and it does move.
    for (const row of rows) expect(row.f3_hz).toBeGreaterThan(2200);
    expect(rows[1].f3_hz).not.toBe(rows[0].f3_hz);
    expect(Math.abs(rows[1].f3_hz / rows[0].f3_hz - 1)).toBeLessThan(0.05);
    const bad = await runCli('sweep', twoWayFile, wav, '--vb', '10:20:10', '--way', 'midrange');
    expect(bad.status).toBe(1);
    expect(bad.stderr).toMatch(/no way with a driver named "midrange".*"woofer", "tweeter"/);
    const bandpass = await runCli('sweep', 'public/examples/garage-subwoofer-bandpass.json', wav, '--vb', '10:20:10');
    expect(bandpass.status).toBe(1);
    expect(bandpass.stderr).toMatch(/bandpass4 box with two chambers/);
  });

  it('gives the same rows on one thread as on several (worker threads of the bundle), one row per volume', async () => {
    const one = await runCli('sweep', 'public/examples/living-room-vented.json', wav, '--vb', '14:26:6', '--json', '--threads', '1');
    const two = spawnCli(
      'sweep',
      'public/examples/living-room-vented.json',
      wav,
      '--vb',
      '14:26:6',
      '--json',
      '--threads',
      String(Math.min(2, availableParallelism())),
    );
    expect(two.status).toBe(0);
    expect(one.status).toBe(0);
    expect(two.stdout).toBe(one.stdout);
    const rows = JSON.parse(one.stdout).steps;
    expect(rows.map((r: { vb_l: number }) => r.vb_l)).toEqual([14, 20, 26]);
    // At a fixed fb a larger vented box reaches lower (Thiele 1971: f3 falls as alpha falls near the B4 region)
    expect(rows[2].f3_hz).toBeLessThan(rows[0].f3_hz);
    for (const r of rows) expect(r.error).toBeNull();
  });

  it('refuses --fb on a sealed design (exit 1) and malformed ranges (exit 2)', async () => {
    expect((await runCli('sweep', 'public/examples/living-room-sealed.json', wav, '--fb', '30:40:5')).status).toBe(1);
    expect((await runCli('sweep', 'public/examples/living-room-sealed.json', wav, '--vb', '40:20:5')).status).toBe(2);
    expect((await runCli('sweep', 'public/examples/living-room-sealed.json', wav)).status).toBe(2);
  });
});
