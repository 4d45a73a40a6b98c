// Curves: every chart with A and B overlaid and the ideal reference, the key numbers as text.
import { DistortionPanel } from '../components/DistortionPanel.tsx';
import { useMemo, useState } from 'preact/hooks';
import { useApp } from '../context.ts';
import { Chart } from '../charts/Chart.tsx';
import { buildCharts, type ChartSpec } from '../charts/specs.ts';
import { FigureTable } from '../FigureTable.tsx';
import { IssueList } from '../IssueList.tsx';
import { num, nearestIndex } from '../format.ts';

const TABLE_HZ = [20, 25, 31.5, 40, 50, 63, 80, 100, 125, 160, 200, 315, 500, 1000];

/** The charts of both designs; each way beside the sum when the Curves toggle asks for it. */
export function useCharts(): ChartSpec[] {
  const { derived, state } = useApp();
  const a = derived.a.analysis;
  const b = derived.b.analysis;
  const sa = derived.a.system;
  const sb = derived.b.system;
  const showWays = state.settings.showWays ?? false;
  return useMemo(
    () => buildCharts({ a: a && sa ? { analysis: a, system: sa } : null, b: b && sb ? { analysis: b, system: sb } : null }, { showWays }),
    [a, b, sa, sb, showWays],
  );
}

function ValuesTable({ spec }: { spec: ChartSpec }) {
  // Built only while open, so a closed table costs nothing per edit.
  const [open, setOpen] = useState(false);
  if (!open) {
    return (
      <details class="values" onToggle={(e) => setOpen((e.currentTarget as HTMLDetailsElement).open)}>
        <summary>Values as a table</summary>
      </details>
    );
  }
  const cols = spec.series.filter(
    (s) => s.values && (s.role === 'a' || s.role === 'b' || s.role === 'reference' || s.role.endsWith('-aux') || s.role.endsWith('-way')),
  );
  const f = spec.freqHz;
  const idx = TABLE_HZ.filter((hz) => f.length && hz >= f[0] && hz <= f[f.length - 1]).map((hz) => nearestIndex(f, hz));
  return (
    <details class="values" open onToggle={(e) => setOpen((e.currentTarget as HTMLDetailsElement).open)}>
      <summary>Values as a table</summary>
      <table>
        <thead>
          <tr>
            <th scope="col">Hz</th>
            {cols.map((c) => (
              <th scope="col" class="n">
                {c.label} ({spec.unit})
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {idx.map((i) => (
            <tr>
              <th scope="row" class="n">
                {num(f[i], 3)}
              </th>
              {cols.map((c) => (
                <td class="n">{num(c.values![i], spec.digits)}</td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </details>
  );
}

export function ChartCard({ spec, height = 250, theme }: { spec: ChartSpec; height?: number; theme: string }) {
  return (
    <figure class="chart-card" aria-labelledby={`chart-${spec.id}-t`}>
      <figcaption>
        <h3 id={`chart-${spec.id}-t`}>
          {spec.title} <span class="unit-tag">{spec.unit}</span>
        </h3>
      </figcaption>
      <Chart spec={spec} height={height} theme={theme} />
      {spec.summary.length ? (
        <ul class="chart-summary">
          {spec.summary.map((t) => (
            <li>{t}</li>
          ))}
        </ul>
      ) : null}
      {spec.series.length ? <ValuesTable spec={spec} /> : null}
    </figure>
  );
}

function WaysToggle() {
  const { state, dispatch } = useApp();
  const many = state.designs.a.ways.length > 1 || state.designs.b.ways.length > 1;
  return (
    <label class="check ways-toggle">
      <input
        type="checkbox"
        data-testid="show-ways"
        checked={state.settings.showWays ?? false}
        disabled={!many}
        onChange={(e) => dispatch({ type: 'settings', patch: { showWays: (e.currentTarget as HTMLInputElement).checked } })}
      />{' '}
      Show each way beside the sum
    </label>
  );
}

export function Curves({ theme }: { theme: string }) {
  const charts = useCharts();
  return (
    <section class="curves" aria-labelledby="curves-h">
      <div class="curves-head">
        <h2 id="curves-h">Curves</h2>
        <p class="sheet-intro">
          Small-signal model. SPL (the sum of all ways at the seat), impedance and group delay at 2.83 V; excursion and port air speed at
          each design's planned level. Hover a chart for readouts; the charts follow one cursor.
        </p>
        <WaysToggle />
      </div>
      <div class="curves-layout">
        <div class="chart-grid">
          {charts.map((c) => (
            <ChartCard spec={c} theme={theme} />
          ))}
          <DistortionPanel theme={theme} />
        </div>
        <div class="curves-side">
          <FigureTable />
          <section class="glance-checks" aria-label="Checks">
            <h3>Checks</h3>
            <IssueList />
          </section>
        </div>
      </div>
    </section>
  );
}
