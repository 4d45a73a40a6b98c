import { describe, expect, it } from 'vitest';
import { runCli, spawnCli } from './helpers/cli.ts';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { twoWayFrom } from './helpers/tweeter.ts';

const dir = mkdtempSync(join(tmpdir(), 'preheard-cli-'));

describe('preheard analyze', () => {
  it('prints the JSON contract for an example', async () => {
    const r = await runCli('analyze', 'public/examples/living-room-vented.json', '--json');
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const k of ['fs_hz', 'qes', 'qms', 'qts', 'vas_l', 're_ohm', 'bl_tm', 'mms_g', 'cms_mm_per_n', 'rms_kg_s', 'sd_cm2', 'eta0_pct']) {
      expect(typeof j.driver[k], k).toBe('number');
    }
    expect(j.fb_hz).toBe(40);
    expect(j.port_length_cm).toBeGreaterThan(5);
    expect(j.drive_v).toBe(2.83);
    expect(j.curves.freq_hz[0]).toBeLessThanOrEqual(10);
    expect(j.curves.freq_hz.at(-1)).toBeGreaterThanOrEqual(1000);
    for (const k of ['spl_db', 'excursion_mm', 'impedance_ohm', 'phase_deg', 'group_delay_ms', 'port_air_speed_m_s', 'max_spl_db']) {
      expect(j.curves[k]).toHaveLength(j.curves.freq_hz.length);
    }
  });

  it('adds every driver way under ways and the summed system under system; the top level is the first way', async () => {
    const j = JSON.parse((await runCli('analyze', 'public/examples/living-room-vented.json', '--json')).stdout);
    expect(j.ways).toHaveLength(1);
    const [w] = j.ways;
    expect(w.name).toBe('woofer');
    for (const k of ['f3_hz', 'fb_hz', 'sensitivity_db', 'peak_excursion_mm', 'group_delay_40_ms']) expect(w[k], k).toBe(j[k]);
    expect(w.curves.spl_db).toEqual(j.curves.spl_db);
    // The upper band of a first-version design sits at the woofer's passband: the sum has the same.
    expect(j.system.sensitivity_db).toBeCloseTo(j.sensitivity_db, 2);
    expect(j.system.planned_volts_rms).toBe(j.planned_volts_rms);
    expect(Math.abs(j.system.f3_hz / j.f3_hz - 1)).toBeLessThan(0.005);
    expect(j.system.curves.ways.map((x: { name: string }) => x.name)).toEqual(['woofer', 'upper band']);
    for (const k of ['spl_db', 'phase_deg', 'group_delay_ms']) expect(j.system.curves[k]).toHaveLength(j.system.curves.freq_hz.length);
    // The woofer is shown through its crossover low-pass (LR4 at 2.2 kHz: -6.02 dB there,
    // Linkwitz 1976) while the sum stays near the passband.
    const k = j.curves.freq_hz.findIndex((f: number) => f >= 1000);
    expect(j.system.curves.spl_db[k] - j.passband_spl_db).toBeGreaterThan(-1);
  });

  it('prints each way and the system for a two-way design', async () => {
    const twoWay = twoWayFrom('public/examples/living-room-sealed.json');
    const file = join(dir, 'two-way.json');
    writeFileSync(file, JSON.stringify(twoWay));
    const table = await runCli('analyze', file);
    expect(table.status).toBe(0);
    expect(table.stdout).toMatch(/way "woofer"/);
    expect(table.stdout).toMatch(/way "tweeter"/);
    expect(table.stdout).toMatch(/system \(all ways summed at the seat\)/);
    const j = JSON.parse((await runCli('analyze', file, '--json')).stdout);
    expect(j.ways.map((w: { name: string }) => w.name)).toEqual(['woofer', 'tweeter']);
    expect(j.ways[1].fc_hz).toBeGreaterThan(800);
    expect(j.curves.freq_hz.at(-1)).toBeCloseTo(20000, 0);
    expect(j.f3_hz).toBe(j.ways[0].f3_hz);
  });

  it('gives fc and Qtc for a sealed box and honours --volts', async () => {
    const a = JSON.parse((await runCli('analyze', 'public/examples/living-room-sealed.json', '--json')).stdout);
    const b = JSON.parse((await runCli('analyze', 'public/examples/living-room-sealed.json', '--json', '--volts', '28.3')).stdout);
    expect(a.qtc).toBeGreaterThan(0.5);
    expect(b.passband_spl_db - a.passband_spl_db).toBeCloseTo(20, 1); // 10x the volts; figures are printed to 4 digits
  });

  it('prints a readable table by default', async () => {
    const r = await runCli('analyze', 'public/examples/living-room-sealed.json');
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/fc \/ Qtc/);
    expect(r.stdout).toMatch(/sensitivity/);
  });

  it('exits 1 with a message for a missing file, bad JSON and an invalid design, printing nothing on stdout', async () => {
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, '{"format": "preheard-design", ');
    const invalid = join(dir, 'invalid.json');
    writeFileSync(invalid, JSON.stringify({ format: 'preheard-design', version: 1, name: 'x' }));
    for (const [file, pattern] of [
      [join(dir, 'nope.json'), /cannot read the design file .*: there is no such file/],
      [bad, /not valid JSON/],
      [invalid, /crossover: is required/],
    ] as const) {
      const r = await runCli('analyze', file, '--json');
      expect(r.status).toBe(1);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(pattern);
    }
  });

  it('exits 2 on usage errors', async () => {
    expect((await runCli('analyze')).status).toBe(2);
    expect((await runCli('analyze', 'a.json', '--volts', 'loud')).status).toBe(2);
    expect((await runCli('frobnicate')).status).toBe(2);
    expect((await runCli('analyze', '--help')).status).toBe(0);
  });

  it('the built bundle exits with the same codes as a process', () => {
    expect(spawnCli('analyze', 'public/examples/living-room-sealed.json', '--json').status).toBe(0);
    expect(spawnCli('analyze', join(dir, 'nope.json')).status).toBe(1);
    expect(spawnCli('frobnicate').status).toBe(2);
    const help = spawnCli('--help');
    expect(help.status).toBe(0);
    expect(help.stdout).toMatch(/usage: preheard <command>/);
  });
});
