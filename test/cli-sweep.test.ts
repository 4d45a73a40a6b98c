import { describe, expect, it, beforeAll } from 'vitest';
import { runCli, spawnCli } from './helpers/cli.ts';
import { mkdtempSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeWav } from '../src/cli/wav.ts';
import { parseRange } from '../src/cli/sweep.ts';

const dir = mkdtempSync(join(tmpdir(), 'preheard-sweep-'));
const wav = join(dir, 'burst.wav');

beforeAll(async () => {
  // 2 s: a quiet 45 Hz tone with a loud second in the middle.
  const sr = 48000;
  const ch = new Float32Array(2 * sr);
  for (let k = 0; k < ch.length; k++) ch[k] = (k > sr / 2 && k < 1.5 * sr ? 0.9 : 0.05) * Math.sin((2 * Math.PI * 45 * k) / sr);
  await writeWav(wav, [ch], sr, '16');
});

describe('preheard sweep', () => {
  it('parses FROM:TO:STEP inclusively', async () => {
    expect(parseRange('20:60:5', '--vb', 0.05, 20000)).toEqual([20, 25, 30, 35, 40, 45, 50, 55, 60]);
    expect(parseRange('30:31:0.5', '--fb', 5, 500)).toEqual([30, 30.5, 31]);
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
