// @vitest-environment happy-dom
// The printed charts' legend never covers a line: the excursion chart's Xlim line runs along the top,
// where the legend used to sit.
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render } from '@testing-library/preact';
import { demoPair } from '../src/ui/demo.ts';
import { validate } from '../src/ui/engine.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { buildCharts, type ChartSpec } from '../src/ui/charts/specs.ts';
import { PrintChart } from '../src/ui/sheet/PrintChart.tsx';

afterEach(() => cleanup());

/** The legend's box and every drawn point of every line, in the SVG's coordinates. */
function measure(spec: ChartSpec) {
  const { container } = render(<PrintChart spec={spec} width={340} height={200} />);
  const svg = container.querySelector('svg')!;
  const g = svg.querySelector('g[data-legend]')!;
  const [, tx, ty] = /translate\(([-\d.]+), ([-\d.]+)\)/.exec(g.getAttribute('transform')!)!.map(Number);
  const rect = g.querySelector('rect')!;
  const box = { x: tx, y: ty, w: Number(rect.getAttribute('width')), h: Number(rect.getAttribute('height')) };
  const lines = [...svg.querySelectorAll('g[clip-path] path')].map((p) =>
    p
      .getAttribute('d')!
      .split(/[ML]/)
      .filter(Boolean)
      .map((xy) => xy.split(',').map(Number) as [number, number]),
  );
  return { svg, where: g.getAttribute('data-legend'), box, lines };
}

describe('print chart legend', () => {
  const d = demoPair();
  const an = (x: unknown) => {
    const r = validate(x);
    if (!r.ok) throw new Error('demo invalid');
    return { analysis: analyze(r.system, {}), system: r.system };
  };
  const charts = buildCharts({ a: an(d.a), b: an(d.b) });

  for (const id of ['excursion', 'spl', 'port-speed', 'max-spl'] as const) {
    it(`${id}: no line passes under the legend`, () => {
      const spec = charts.find((c) => c.id === id)!;
      const { box, lines, where } = measure(spec);
      expect(lines.length).toBe(spec.series.filter((s) => s.values).length);
      for (const pts of lines)
        for (const [x, y] of pts) {
          const inside = x >= box.x && x <= box.x + box.w && y >= box.y && y <= box.y + box.h;
          expect(inside, `${id}: point ${x},${y} under the legend at ${where}`).toBe(false);
        }
    });
  }

  it('excursion: the Xlim line is drawn inside the plot near its top, and the legend left the top right', () => {
    const spec = charts.find((c) => c.id === 'excursion')!;
    const { where, lines } = measure(spec);
    const xlim = spec.series.findIndex((s) => s.label.startsWith('Xlim'));
    expect(xlim).toBeGreaterThan(-1);
    const y = lines[xlim][0][1];
    // The plot spans y 8..174 (200 high, 8 above, 26 below): Xlim sits in its top quarter.
    expect(y).toBeGreaterThan(8);
    expect(y).toBeLessThan(8 + 166 / 4);
    expect(where).not.toBe('top-right');
  });

  it('goes below the plot when every corner is taken, and the picture grows to hold it', () => {
    const n = 50;
    const freqHz = Float64Array.from({ length: n }, (_, i) => 20 * 1000 ** (i / (n - 1)));
    // A zigzag over the whole range crosses every corner.
    const zig = Float64Array.from({ length: n }, (_, i) => (i % 2 ? 10 : 0));
    const spec: ChartSpec = {
      id: 'spl',
      title: 'test',
      unit: 'dB',
      digits: 3,
      yMin: 0,
      yMax: 10,
      freqHz,
      series: [{ label: 'A', role: 'a', values: zig }],
      summary: [],
    };
    const { svg, where, box } = measure(spec);
    expect(where).toBe('below');
    expect(box.y).toBeGreaterThanOrEqual(200);
    expect(Number(svg.getAttribute('height'))).toBeGreaterThanOrEqual(box.y + box.h);
  });
});
