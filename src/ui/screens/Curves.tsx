// Curves: the charts grouped by the question they answer, A and B overlaid with the ideal
// reference and the limits, the key numbers as text; the user picks which charts appear.
import { DistortionPanel } from '../components/DistortionPanel.tsx';
import { useCallback, useMemo, useState } from 'preact/hooks';
import { useApp } from '../context.ts';
import type { Intent } from '../store.ts';
import { Chart } from '../charts/Chart.tsx';
import { buildCharts, CHART_GROUPS, CHART_IDS, TITLES, type ChartId, type ChartSpec } from '../charts/specs.ts';
import '../charts/curves.css';
import { FigureTable } from '../FigureTable.tsx';
import { IssueList } from '../IssueList.tsx';
import { num, nearestIndex } from '../format.ts';

const TABLE_HZ = [20, 25, 31.5, 40, 50, 63, 80, 100, 125, 160, 200, 315, 500, 1000];

/**
 * The charts of both designs (only those asked for, all when `only` is absent); each way beside
 * the sum when the Curves toggle asks for it.
 */
export function useCharts(only?: readonly ChartId[]): ChartSpec[] {
  const { derived, state } = useApp();
  const a = derived.a.analysis;
  const b = derived.b.analysis;
  const sa = derived.a.system;
  const sb = derived.b.system;
  const showWays = state.settings.showWays ?? false;
  const onlyKey = only?.join(',') ?? '';
  return useMemo(
    () =>
      buildCharts({ a: a && sa ? { analysis: a, system: sa } : null, b: b && sb ? { analysis: b, system: sb } : null }, { showWays, only }),
    [a, b, sa, sb, showWays, onlyKey],
  );
}

/** The charts the user has hidden, as a set of known ids (a stored preference may hold anything). */
export function hiddenCharts(stored: unknown): Set<ChartId> {
  return new Set(Array.isArray(stored) ? (stored.filter((id) => (CHART_IDS as unknown[]).includes(id)) as ChartId[]) : []);
}

type Dispatch = (intent: Intent) => void;

function ChartPicker({ hidden, dispatch }: { hidden: Set<ChartId>; dispatch: Dispatch }) {
  const set = (ids: ChartId[], show: boolean) => {
    const next = new Set(hidden);
    for (const id of ids) show ? next.delete(id) : next.add(id);
    dispatch({ type: 'settings', patch: { curvesHidden: CHART_IDS.filter((id) => next.has(id)) } });
  };
  const shown = CHART_IDS.length - hidden.size;
  return (
    <details class="chart-picker" data-testid="chart-picker">
      <summary>
        Choose charts ({shown} of {CHART_IDS.length} shown)
      </summary>
      <div class="chart-picker-groups">
        {CHART_GROUPS.map((g) => (
          <fieldset>
            <legend>
              <label class="check">
                <input
                  type="checkbox"
                  checked={g.charts.every((id) => !hidden.has(id))}
                  onChange={(e) => set(g.charts, (e.currentTarget as HTMLInputElement).checked)}
                />{' '}
                {g.title}
              </label>
            </legend>
            {g.charts.map((id) => (
              <label class="check">
                <input
                  type="checkbox"
                  data-testid={`pick-${id}`}
                  checked={!hidden.has(id)}
                  onChange={(e) => set([id], (e.currentTarget as HTMLInputElement).checked)}
                />{' '}
                {TITLES[id]}
              </label>
            ))}
          </fieldset>
        ))}
      </div>
    </details>
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

function WaysToggle({ many, showWays, dispatch }: { many: boolean; showWays: boolean; dispatch: Dispatch }) {
  return (
    <label class="check ways-toggle">
      <input
        type="checkbox"
        data-testid="show-ways"
        checked={showWays}
        disabled={!many}
        onChange={(e) => dispatch({ type: 'settings', patch: { showWays: (e.currentTarget as HTMLInputElement).checked } })}
      />{' '}
      Show each way beside the sum
    </label>
  );
}

function CurvesHead(p: { hidden: Set<ChartId>; many: boolean; showWays: boolean; dispatch: Dispatch }) {
  return (
    <div class="curves-head">
      <h2 id="curves-h">Curves</h2>
      <p class="sheet-intro">
        Small-signal model. SPL (the sum of all ways at the seat), impedance and group delay at 2.83 V; excursion, port air speed, power and
        the limits' shares for a sine at each design's planned level. Hover a chart for readouts; the charts follow one cursor.
      </p>
      <div class="curves-tools">
        <WaysToggle many={p.many} showWays={p.showWays} dispatch={p.dispatch} />
        <ChartPicker hidden={p.hidden} dispatch={p.dispatch} />
      </div>
    </div>
  );
}

export function Curves({ theme }: { theme: string }) {
  const { state, store } = useApp();
  const hiddenNow = hiddenCharts(state.settings.curvesHidden);
  const hiddenKey = [...hiddenNow].join(',');
  // biome-ignore lint/correctness/useExhaustiveDependencies: the key stands for the set, which is new on every render
  const hidden = useMemo(() => hiddenNow, [hiddenKey]);
  const shownIds = useMemo(() => CHART_IDS.filter((id) => !hidden.has(id)), [hidden]);
  const charts = useCharts(shownIds);
  const byId = new Map(charts.map((c) => [c.id, c]));
  const many = state.designs.a.ways.length > 1 || state.designs.b.ways.length > 1;
  const showWays = state.settings.showWays ?? false;
  const dispatch = useCallback((intent: Intent) => store.dispatch(intent), [store]);
  // The same element while its inputs are the same: an edit of a design re-renders only what shows it.
  const head = useMemo(
    () => <CurvesHead hidden={hidden} many={many} showWays={showWays} dispatch={dispatch} />,
    [hidden, many, showWays, dispatch],
  );
  return (
    <section class="curves" aria-labelledby="curves-h">
      {head}
      <div class="curves-layout">
        <div class="curves-groups">
          {CHART_GROUPS.filter((g) => g.charts.some((id) => byId.has(id))).map((g) => (
            <section class="chart-group" aria-labelledby={`group-${g.id}`} data-group={g.id}>
              <h3 id={`group-${g.id}`}>{g.title}</h3>
              <p class="group-question">{g.question}</p>
              <div class="chart-grid">
                {g.charts
                  .filter((id) => byId.has(id))
                  .map((id) => (
                    <ChartCard spec={byId.get(id)!} theme={theme} />
                  ))}
              </div>
            </section>
          ))}
          {charts.length === 0 ? <p class="sheet-intro">Every chart is hidden: choose some under “Choose charts”.</p> : null}
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
