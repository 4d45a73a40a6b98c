import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const cli = (...args: string[]) => spawnSync(process.execPath, ['src/cli/preheard.mjs', ...args], { encoding: 'utf8' });
const dir = mkdtempSync(join(tmpdir(), 'preheard-cli-'));

describe('preheard analyze', () => {
  it('prints the JSON contract for an example', () => {
    const r = cli('analyze', 'public/examples/living-room-vented.json', '--json');
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

  it('gives fc and Qtc for a sealed box and honours --volts', () => {
    const a = JSON.parse(cli('analyze', 'public/examples/living-room-sealed.json', '--json').stdout);
    const b = JSON.parse(cli('analyze', 'public/examples/living-room-sealed.json', '--json', '--volts', '28.3').stdout);
    expect(a.qtc).toBeGreaterThan(0.5);
    expect(b.passband_spl_db - a.passband_spl_db).toBeCloseTo(20, 1); // 10x the volts; figures are printed to 4 digits
  });

  it('prints a readable table by default', () => {
    const r = cli('analyze', 'public/examples/living-room-sealed.json');
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/fc \/ Qtc/);
    expect(r.stdout).toMatch(/sensitivity/);
  });

  it('exits 1 with a message for a missing file, bad JSON and an invalid design, printing nothing on stdout', () => {
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, '{"format": "preheard-design", ');
    const invalid = join(dir, 'invalid.json');
    writeFileSync(invalid, JSON.stringify({ format: 'preheard-design', version: 1, name: 'x' }));
    for (const [file, pattern] of [
      [join(dir, 'nope.json'), /cannot read the design file .*: there is no such file/],
      [bad, /not valid JSON/],
      [invalid, /driver: is required/],
    ] as const) {
      const r = cli('analyze', file, '--json');
      expect(r.status).toBe(1);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(pattern);
    }
  });

  it('exits 2 on usage errors', () => {
    expect(cli('analyze').status).toBe(2);
    expect(cli('analyze', 'a.json', '--volts', 'loud').status).toBe(2);
    expect(cli('frobnicate').status).toBe(2);
    expect(cli('analyze', '--help').status).toBe(0);
  });
});
