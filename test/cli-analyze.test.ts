import { describe, expect, it } from 'vitest';
import { runCli, spawnCli } from './helpers/cli.ts';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

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
      [invalid, /driver: is required/],
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
