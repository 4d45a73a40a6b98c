// @vitest-environment happy-dom
// The Curves screen's charts grouped by the question they answer, the user's pick of charts kept as
// a preference, and the new charts drawing the engine's numbers.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/recording-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store, stateOf } from '../src/ui/store.ts';
import { Autosave, memoryBackend, usableState, type SavedState } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { validate } from '../src/ui/engine.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import type { DriverWay } from '../src/engine/system.ts';
import { hiddenCharts } from '../src/ui/screens/Curves.tsx';
import { drawn } from './helpers/recording-uplot.ts';

afterEach(() => cleanup());

function mount(backend = memoryBackend()) {
  const store = new Store(demoPair);
  store.dispatch({ type: 'settings', patch: { cautionsDismissed: true, screen: 'curves' } });
  const autosave = new Autosave(backend);
  autosave.attach(store);
  render(<App store={store} autosave={autosave} />);
  return { store, autosave, backend };
}

/** The chart ids of each group on screen, in order. */
function groups(): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const g of document.querySelectorAll<HTMLElement>('section.chart-group'))
    out[g.dataset.group!] = [...g.querySelectorAll<HTMLElement>('[data-chart]')].map((c) => c.dataset.chart!);
  return out;
}

const lastDrawn = (id: string) => drawn.filter((d) => d.id === id).at(-1)!.data as (number | null)[][];

describe('Curves: charts by the question they answer', () => {
  it('shows four groups in order, each with its charts and its question', () => {
    mount();
    expect(groups()).toEqual({
      seat: ['spl', 'group-delay'],
      moves: ['excursion', 'port-speed', 'outputs'],
      amplifier: ['impedance', 'phase', 'power'],
      limits: ['max-spl', 'limit-use'],
    });
    const headings = [...document.querySelectorAll('section.chart-group > h3')].map((h) => h.textContent);
    expect(headings).toEqual(['Bass at the seat', 'What moves', 'What the amplifier sees', 'Limits']);
    expect(screen.getByTestId('chart-picker').textContent).toMatch(/10 of 10 shown/);
  });

  it('hides and shows charts and whole groups; the choice is saved and restored', async () => {
    const { store, autosave, backend } = mount();
    await act(async () => {
      await autosave.load();
    });
    await act(() => {
      fireEvent.click(screen.getByTestId('pick-phase'));
    });
    expect(groups().amplifier).toEqual(['impedance', 'power']);
    expect(store.get().settings.curvesHidden).toEqual(['phase']);
    // The group's own box hides all of its charts, and the group goes.
    await act(() => {
      fireEvent.click(screen.getByRole('checkbox', { name: 'Limits' }));
    });
    expect(groups().limits).toBeUndefined();
    expect(store.get().settings.curvesHidden).toEqual(['phase', 'max-spl', 'limit-use']);
    expect(screen.getByTestId('chart-picker').textContent).toMatch(/7 of 10 shown/);
    await act(() => {
      fireEvent.click(screen.getByTestId('pick-phase'));
    });
    expect(groups().amplifier).toEqual(['impedance', 'phase', 'power']);
    await autosave.flush();
    const saved = backend.value as SavedState;
    expect(saved.state.settings.curvesHidden).toEqual(['max-spl', 'limit-use']);
    cleanup();
    // A fresh page from the stored state keeps the choice.
    const restored = usableState(JSON.parse(JSON.stringify(saved)))!;
    const store2 = new Store(demoPair);
    store2.dispatch({ type: 'restore', state: stateOf(restored.state.project, restored.state.settings) });
    render(<App store={store2} autosave={new Autosave(memoryBackend())} />);
    expect(groups().limits).toBeUndefined();
    expect(groups().seat).toEqual(['spl', 'group-delay']);
  });

  it('ignores what it does not know in a stored choice', () => {
    expect([...hiddenCharts(['phase', 'no-such-chart', 7])]).toEqual(['phase']);
    expect(hiddenCharts('phase').size).toBe(0);
    expect(hiddenCharts(undefined).size).toBe(0);
  });

  it("draws the limits' shares, the amplifier's power and the cone and port from the engine's numbers", () => {
    drawn.length = 0;
    mount();
    const d = demoPair();
    const sysA = validate(d.a);
    if (!sysA.ok) throw new Error('demo invalid');
    const an = analyze(sysA.system, {});
    const way = sysA.system.ways[0] as DriverWay;
    // limit-use: x, A cone travel, (A port), A coil heat, B ..., the 100 % line.
    const use = lastDrawn('limit-use');
    const cone = use[1] as number[];
    const f = use[0] as unknown as Float64Array;
    let top = 0;
    for (let i = 0; i < f.length; i++) if (f[i] >= 20) top = Math.max(top, cone[i]);
    expect(top).toBeCloseTo((100 * an.figures.plannedPeakExcursionMm) / (way.unit.xmax * 1000), 6);
    expect(use.at(-1)!.every((v) => v === 100)).toBe(true);
    // power: positive everywhere, and at the impedance peak close to V²/|Z| (phase near zero there).
    const power = lastDrawn('power')[1] as number[];
    let k = 0;
    for (let i = 0; i < f.length; i++) if (f[i] < 500 && an.curves.impedanceOhm[i] > an.curves.impedanceOhm[k]) k = i;
    const v = an.figures.plannedVoltsRms;
    expect(power[k] / ((v * v) / an.curves.impedanceOhm[k])).toBeGreaterThan(0.99);
    expect(power[k] / ((v * v) / an.curves.impedanceOhm[k])).toBeLessThanOrEqual(1 + 1e-9);
    expect(power.every((p) => p > 0)).toBe(true);
    // outputs: A's cone alone is the analysis' cone curve.
    const outputs = lastDrawn('outputs');
    expect(outputs[1][100]).toBeCloseTo(an.curves.coneSplDb[100], 9);
  });
});
