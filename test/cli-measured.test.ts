// preheard measured: a new design file with a response attached; analyze reads it; nothing is overwritten.
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from './helpers/cli.ts';
import { bareModel, db, logSpaced, sealedDoc } from './helpers/measured.ts';

const dir = mkdtempSync(join(tmpdir(), 'preheard-measured-'));
const design = 'public/examples/living-room-sealed.json';
const model = bareModel(sealedDoc());
const table = join(dir, 'woofer.txt');
// The model 10 dB up with a 4 dB dip at 1 kHz.
writeFileSync(
  table,
  `# invented measurement\nFreq\tSPL\n${logSpaced(20, 20000, 200)
    .map((f) => `${f.toFixed(2)}\t${(db(model(f)) + 10 - 4 * Math.exp(-((Math.log2(f / 1000) / 0.3) ** 2))).toFixed(3)}`)
    .join('\n')}\n`,
);

describe('preheard measured', () => {
  it('writes a new design whose analysis shows the measurement above the blend', async () => {
    const out = join(dir, 'with-response.json');
    const r = await runCli('measured', design, table, '--blend-hz', '300', '--out', out, '--json');
    expect(r.status, r.stderr).toBe(0);
    const summary = JSON.parse(r.stdout);
    expect(summary.points).toBe(200);
    expect(summary.level_offset_db).toBeCloseTo(-10, 1);
    const doc = JSON.parse(readFileSync(out, 'utf8'));
    expect(doc.ways[0].measured_response.blend_hz).toBe(300);
    const plain = JSON.parse((await runCli('analyze', design, '--json')).stdout);
    const withIt = JSON.parse((await runCli('analyze', out, '--json')).stdout);
    const at = (a: { ways: { curves: { freq_hz: number[]; spl_db: number[] } }[] }, f: number) => {
      const c = a.ways[0].curves;
      const k = c.freq_hz.reduce((best, x, i) => (Math.abs(Math.log(x / f)) < Math.abs(Math.log(c.freq_hz[best] / f)) ? i : best), 0);
      return c.spl_db[k];
    };
    expect(at(withIt, 1000) - at(plain, 1000)).toBeCloseTo(-4, 0);
    expect(Math.abs(at(withIt, 100) - at(plain, 100))).toBeLessThan(0.01);
  });

  it('never overwrites a file, and names the line of a bad table', async () => {
    const existing = join(dir, 'taken.json');
    writeFileSync(existing, 'mine');
    const r = await runCli('measured', design, table, '--blend-hz', '300', '--out', existing);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/already exists/);
    expect(readFileSync(existing, 'utf8')).toBe('mine');
    const bad = join(dir, 'bad.txt');
    writeFileSync(bad, 'Hz dB\n100 80\n200 loud\n');
    const b = await runCli('measured', design, bad, '--blend-hz', '300', '--out', join(dir, 'new.json'));
    expect(b.status).toBe(1);
    expect(b.stderr).toMatch(/bad\.txt, line 3: "loud" is not a number/);
    const low = await runCli('measured', design, table, '--blend-hz', '20', '--out', join(dir, 'new.json'));
    expect(low.status).toBe(1);
    expect(low.stderr).toMatch(/must start at 14\.14 Hz or lower/);
    expect(existsSync(join(dir, 'new.json'))).toBe(false);
  });
});
