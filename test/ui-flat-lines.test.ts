// Limit lines are drawn as one segment (charts/Chart.tsx `flatLine`): that is the same line only
// while every value of the series is the same. The specs mark exactly the limit lines so, for the
// demo pair and for two designs with different Xmax (one line each), and nothing else.
import { describe, expect, it } from 'vitest';
import { demoPair } from '../src/ui/demo.ts';
import { validate } from '../src/ui/engine.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { buildCharts, type ChartSpec } from '../src/ui/charts/specs.ts';
import type { DesignDoc } from '../src/engine/design/document.ts';

const model = (doc: DesignDoc) => {
  const r = validate(doc);
  if (!r.ok) throw new Error('design invalid');
  return { analysis: analyze(r.system, {}), system: r.system };
};

function flatSeries(charts: ChartSpec[]) {
  return charts.flatMap((c) => c.series.filter((s) => s.flat).map((s) => ({ chart: c.id, s })));
}

describe('limit lines drawn as one segment', () => {
  it('marks only series holding one finite value at every frequency, and every limit line', () => {
    const d = demoPair();
    const b = structuredClone(d.b);
    // A different Xmax on B: the excursion chart then has one Xmax line per design.
    (b.ways[0] as { driver: { xmax_mm: number } }).driver.xmax_mm *= 1.5;
    for (const charts of [buildCharts({ a: model(d.a), b: model(d.b) }), buildCharts({ a: model(d.a), b: model(b) })]) {
      const flat = flatSeries(charts);
      for (const { s } of flat) {
        const v = s.values!;
        expect(v.length).toBeGreaterThan(100);
        expect(Number.isFinite(v[0])).toBe(true);
        for (let i = 1; i < v.length; i++) expect(v[i]).toBe(v[0]);
      }
      // Every limit role is flat; no design's own curve is.
      for (const c of charts) for (const s of c.series) expect(s.flat === true).toBe(s.role.startsWith('limit') && c.id !== 'max-spl');
    }
    const excursion = buildCharts({ a: model(d.a), b: model(b) }).find((c) => c.id === 'excursion')!;
    expect(excursion.series.filter((s) => s.flat && s.label.includes('Xmax')).map((s) => s.label)).toEqual(['A Xmax ±', 'B Xmax ±']);
  });
});
