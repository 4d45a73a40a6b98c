// `npm run bench`: every benchmark module in this folder exports bench(): Promise<BenchResult[]>.
// Add a module by listing it in BENCHES. Each prints ratios measured side by side in one run.
import type { BenchResult } from './ui-redraw.ts';

const BENCHES: { name: string; load: () => Promise<{ bench(): Promise<BenchResult[]> }> }[] = [
  { name: 'render', load: () => import('./render.ts') },
  { name: 'cli', load: () => import('./cli.ts') },
  { name: 'ui-redraw', load: () => import('./ui-redraw.ts') },
  { name: 'worklet', load: () => import('./worklet.ts') },
  { name: 'room', load: () => import('./room.ts') },
  { name: 'measured', load: () => import('./measured.ts') },
];

const only = process.argv.slice(2);
const rows: (BenchResult & { group: string })[] = [];
for (const b of BENCHES) {
  if (only.length > 0 && !only.includes(b.name)) continue;
  try {
    const mod = await b.load();
    for (const r of await mod.bench()) rows.push({ ...r, group: b.name });
  } catch (e) {
    rows.push({ group: b.name, name: `failed: ${(e as Error).message.split('\n')[0]}`, value: NaN, unit: '', target: '' });
  }
}
const w = Math.max(...rows.map((r) => r.name.length), 10);
process.stdout.write(`${'benchmark'.padEnd(w)}  ${'value'.padStart(10)}  ${'unit'.padEnd(12)}  target\n`);
const shown = (v: number) => (Number.isFinite(v) && Math.abs(v) >= 1e-3 ? String(Number(v.toPrecision(4))) : String(v));
for (const r of rows) process.stdout.write(`${r.name.padEnd(w)}  ${shown(r.value).padStart(10)}  ${r.unit.padEnd(12)}  ${r.target}\n`);
