// `preheard analyze` on a passive two-way: the amplifier's load minimum and each part at the planned level.
import { describe, expect, it } from 'vitest';
import { runCli } from './helpers/cli.ts';

describe('analyze a passive design', () => {
  it('prints the load minimum of both networks and every part; the JSON carries them', async () => {
    const file = 'public/examples/bookshelf-two-way-passive.json';
    const t = await runCli('analyze', file);
    expect(t.status).toBe(0);
    const load = /amplifier load minimum\s+([\d.]+) ohm at ([\d.]+) Hz/.exec(t.stdout);
    expect(Number(load?.[1])).toBeGreaterThan(3);
    expect(Number(load?.[1])).toBeLessThan(8);
    expect(t.stdout).toMatch(/part 2 shunt C\s+[\d.]+ A rms at [\d.]+ Hz, no heat/);
    expect(t.stdout).toMatch(/part 3 series R\s+[\d.]+ A rms at [\d.]+ Hz, [\d.]+ W at [\d.]+ Hz \(rated 10 W\)/);
    const j = JSON.parse((await runCli('analyze', file, '--json')).stdout);
    // The table shows three significant figures of the JSON's number.
    expect(Number(load?.[1])).toBe(Number(j.system.passive_load_min_ohm.toPrecision(3)));
    expect(j.ways[1].network.parts).toHaveLength(4);
    expect(j.ways[1].network.curves.transfer_db).toHaveLength(j.ways[1].curves.freq_hz.length);
  });
});
