// preheard fit on synthetic sweeps written to files.
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from './helpers/cli.ts';
import { D, rhoC2, sweep, sweepText, truth } from './helpers/impedance-sweep.ts';

const dir = mkdtempSync(join(tmpdir(), 'preheard-fit-'));
const file = (name: string, text: string) => {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
};
const free = file('free.txt', sweepText(sweep({ seed: 5 })));
const massed = file('mass.txt', sweepText(sweep({ seed: 6, mms: D.mms + 0.015 })));
const vb = 0.01;
const cab = vb / (rhoC2 * D.sd ** 2);
const boxed = file('box.txt', sweepText(sweep({ seed: 8, cms: (D.cms * cab) / (D.cms + cab) })));
const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('preheard fit', () => {
  it('fits a sweep with an added mass and prints the driver fields as JSON', async () => {
    const r = await runCli('fit', free, '--added-mass-g', '15', '--with-mass', massed, '--sd-cm2', String(D.sd * 1e4), '--json');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(rel(j.fs_hz, truth.fs)).toBeLessThan(0.01);
    expect(rel(j.qes, truth.qes)).toBeLessThan(0.01);
    expect(rel(j.vas_l, truth.vas * 1000)).toBeLessThan(0.03);
    expect(rel(j.bl_tm, D.bl)).toBeLessThan(0.03);
    expect(j.sigma.vas_l).toBeGreaterThan(0);
    expect(j.coil_model).toBe('semi');
    expect(j.driver.vas_l).toBeCloseTo(j.vas_l, 1);
    expect(j.driver.sd_cm2).toBeCloseTo(133, 6);
  });

  it('fits a sweep in a closed box, prints a table and writes the curves', async () => {
    const csv = join(dir, 'curve.csv');
    const r = await runCli('fit', free, '--test-box-l', String(vb * 1000), '--in-box', boxed, '--curve', csv);
    expect(r.status).toBe(0);
    const vas = Number(/Vas\s+([\d.]+)/.exec(r.stdout)?.[1]);
    expect(rel(vas, truth.vas * 1000)).toBeLessThan(0.03);
    expect(r.stdout).toMatch(/closed box of 10(\.0+)? l/);
    const lines = readFileSync(csv, 'utf8').trim().split('\n');
    expect(lines[0]).toBe('freq_hz,measured_ohm,measured_phase_deg,fitted_ohm,fitted_phase_deg,residual_pct');
    expect(lines.length).toBe(266);
    const residuals = lines.slice(1).map((l) => Math.abs(Number(l.split(',')[5])));
    expect(Math.max(...residuals)).toBeLessThan(3);
  });

  it('names the file and line of a bad table, and refuses half a method', async () => {
    const bad = file('bad.txt', `${sweepText(sweep()).split('\n').slice(0, 40).join('\n')}\n12;abc;3\n`);
    const r = await runCli('fit', bad);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/bad\.txt, line 41: "abc" is not a number/);
    const u = await runCli('fit', free, '--added-mass-g', '10');
    expect(u.status).toBe(2);
    expect(u.stderr).toMatch(/go together/);
    const missing = await runCli('fit', join(dir, 'none.txt'));
    expect(missing.status).toBe(1);
    expect(missing.stderr).toMatch(/cannot read the impedance table .*no such file/);
    expect(existsSync(join(dir, 'none.txt'))).toBe(false);
  });
});
