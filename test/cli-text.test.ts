// The CLI's tables for a person: three significant figures, levels to 0.1 dB, times as m:ss, counts
// in words; the JSON outputs keep their full numbers. Each table is checked against the same
// command's --json output (an independent path: JSON.stringify of the numbers, rounded here).
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import wavefile from 'wavefile';
import { count, db, duration, moment, sig } from '../src/cli/user-text.ts';
import { runCli } from './helpers/cli.ts';

const VENTED = 'public/examples/living-room-vented.json';
const SEALED = 'public/examples/living-room-sealed.json';
const three = (x: number) => String(Number(x.toPrecision(3)));

describe('figures for a person', () => {
  it('three significant figures, trailing zeros dropped, no exponent for ordinary sizes', () => {
    expect(sig(4.989)).toBe('4.99');
    expect(sig(0.3761)).toBe('0.376');
    expect(sig(0.4113)).toBe('0.411');
    expect(sig(180.6089)).toBe('181');
    expect(sig(2.53707)).toBe('2.54');
    expect(sig(649.8)).toBe('650');
    // Whole numbers stay whole (the engine's one rule: 12345 Hz reads as typed).
    expect(sig(12345)).toBe('12345');
    expect(sig(2.8)).toBe('2.8');
    expect(sig(-0.0004567)).toBe('-0.000457');
    expect(sig(0)).toBe('0');
    expect(sig(-0)).toBe('0');
    expect(sig(null)).toBe('-');
    expect(sig(Number.NaN)).toBe('-');
    expect(sig(1.5e-9)).toBe('1.50e-9');
    expect(sig(0.12345, 2)).toBe('0.12');
  });

  it('levels to 0.1 dB, never "-0.0"', () => {
    expect(db(103.14)).toBe('103.1');
    expect(db(-11.53)).toBe('-11.5');
    expect(db(-0.03)).toBe('0.0');
    expect(db(85)).toBe('85.0');
    expect(db(-Infinity)).toBe('silent');
  });

  it('lengths rounded to the second from a minute on; moments never later than they are', () => {
    expect(duration(9.996)).toBe('10 s');
    expect(duration(180.6089)).toBe('3:01');
    expect(duration(290)).toBe('4:50');
    expect(duration(0)).toBe('0 s');
    expect(moment(0.0006)).toBe('0.0006 s');
    expect(moment(9.96)).toBe('9.96 s');
    expect(moment(125.96)).toBe('2:05.9');
    expect(moment(60)).toBe('1:00.0');
  });

  it('counts in words', () => {
    expect(count(0, 'error')).toBe('0 errors');
    expect(count(1, 'warning')).toBe('1 warning');
    expect(count(3, 'argument')).toBe('3 arguments');
  });
});

describe('CLI tables', () => {
  it('analyze: three significant figures of the JSON numbers, levels to 0.1 dB', async () => {
    const t = (await runCli('analyze', VENTED)).stdout;
    const j = JSON.parse((await runCli('analyze', VENTED, '--json')).stdout);
    expect(t).toMatch(new RegExp(`fs / Qts / Vas +${three(j.driver.fs_hz)} Hz / ${three(j.driver.qts)} / ${three(j.driver.vas_l)} l\\n`));
    expect(t).toContain(`eta0                  ${three(j.driver.eta0_pct)} %\n`);
    expect(t).toContain(`planned level         ${three(j.planned_volts_rms)} V rms\n`);
    expect(t).toContain(`sensitivity           ${j.sensitivity_db.toFixed(1)} dB SPL`);
    // No figure in the table carries more than three significant figures (the JSON keeps four).
    for (const n of t.match(/\d+\.\d+/g) ?? []) expect(n.replace('.', '').replace(/^0+/, '').length, n).toBeLessThanOrEqual(3);
    expect(String(j.driver.qts).length).toBeGreaterThan(5);
  });

  it('render, headroom and compare: the summary in three significant figures, counts in words', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'preheard-text-'));
    const sr = 44100;
    const n = 2 * sr;
    const x = Array.from({ length: n }, (_, k) => Math.round(16000 * Math.sin((2 * Math.PI * 45 * k) / sr) * Math.min(1, k / sr)));
    const w = new wavefile.WaveFile();
    w.fromScratch(1, sr, '16', x);
    const input = join(dir, 'in.wav');
    writeFileSync(input, w.toBuffer());

    const out = join(dir, 'out.wav');
    const r = await runCli('render', VENTED, input, '-o', out);
    expect(r.status).toBe(0);
    const j = JSON.parse((await runCli('render', VENTED, input, '-o', out, '--json')).stdout);
    expect(r.stdout).toContain(`duration           ${three(j.duration_s)} s at ${sr} Hz\n`);
    expect(r.stdout).toContain(`calibration        ${three(j.pa_per_fs)} Pa per full scale\n`);
    expect(r.stdout).toContain(`level              ${three(j.volts_fs)} V per full scale, ${j.spl_db.toFixed(1)} dB(C) Leq at the seat\n`);

    const h = await runCli('headroom', VENTED, input);
    const hj = JSON.parse((await runCli('headroom', VENTED, input, '--json')).stdout);
    expect(h.stdout).toContain(`clean up to        ${three(hj.clean_volts)} V per full scale (${hj.clean_spl_db.toFixed(1)} dB(C)`);

    const c = await runCli('compare', VENTED, SEALED, input, '-o', join(dir, 'cmp'));
    expect(c.status).toBe(0);
    const lines = c.stdout.split('\n');
    // B's column starts at the same place on every row, after A's longest cell.
    const bAt = lines[0].indexOf('B: ');
    expect(lines[1].slice(bAt)).toMatch(/^\d+(\.\d+)? Hz$/);
    expect(lines[0].slice(0, bAt).trimEnd()).toMatch(/A: Living-room monitor, vented 20 l$/);
    expect(c.stdout).toMatch(/levels matched: B played [+-]\d+\.\d dB against A/);

    const u = await runCli('render', VENTED);
    expect(u.status).toBe(2);
    expect(u.stderr).toContain('got 1 argument\n');
  });
});
