// @vitest-environment happy-dom
// Redrawing after an edit: arrays kept and refilled in place, curves that did not change left alone,
// and at most one draw per chart per animation frame with the newest data.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, render } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/recording-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { ChartData } from '../src/ui/charts/Chart.tsx';
import type { ChartSpec } from '../src/ui/charts/specs.ts';
import { validate } from '../src/ui/engine.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { drawn } from './helpers/recording-uplot.ts';

afterEach(() => cleanup());

const spec = (a: Float64Array, b: Float64Array, f: Float64Array): ChartSpec => ({
  id: 'spl',
  title: 't',
  unit: 'dB',
  digits: 3,
  freqHz: f,
  series: [
    { label: 'A', role: 'a', values: a },
    { label: 'B', role: 'b', values: b },
  ],
  summary: [],
});

describe('chart data across redraws', () => {
  it('refills its arrays in place, skips a series whose values are unchanged, and turns NaN into gaps', () => {
    const f = Float64Array.from([20, 40, 80]);
    const b = Float64Array.from([1, Number.NaN, 3]);
    const d = new ChartData();
    expect(d.update(spec(Float64Array.from([4, 5, 6]), b, f))).toBe(true);
    const [, a0, b0] = d.data as (number | null)[][];
    expect(a0).toEqual([4, 5, 6]);
    expect(b0).toEqual([1, null, 3]);
    // The same arrays again: nothing to redraw.
    const a = Float64Array.from([4, 5, 6]);
    expect(d.update(spec(a, b, f))).toBe(true); // A is a new array, as after an edit
    expect(d.update(spec(a, b, f))).toBe(false);
    // A changes: the same arrays, refilled; B untouched.
    b0[0] = 99; // a marker: B's array must not be refilled
    expect(d.update(spec(Float64Array.from([7, 8, Number.POSITIVE_INFINITY]), b, f))).toBe(true);
    const [, a1, b1] = d.data as (number | null)[][];
    expect(a1).toBe(a0);
    expect(b1).toBe(b0);
    expect(a1).toEqual([7, 8, null]);
    expect(b1[0]).toBe(99);
  });
});

describe('Curves: one draw per chart per frame', () => {
  it('three edits rendered within one frame draw once at once and once at the next frame, with the last edit', async () => {
    const store = new Store(demoPair);
    store.dispatch({ type: 'settings', patch: { cautionsDismissed: true, screen: 'curves' } });
    render(<App store={store} autosave={new Autosave(memoryBackend())} />);
    // Let the first frame pass, so the edits below start a fresh one.
    await act(() => new Promise<void>((r) => requestAnimationFrame(() => r())));
    const count = () => drawn.filter((d) => d.id === 'spl').length;
    const before = count();
    // Each edit rendered on its own (as typing does), all before the next frame.
    for (const vb of [12, 13, 15])
      act(() => {
        store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: vb });
      });
    const now = count() - before;
    await act(() => new Promise<void>((r) => requestAnimationFrame(() => setTimeout(r, 0))));
    const later = count() - before;
    expect(now).toBe(1);
    expect(later).toBe(2);
    // What the screen holds at the end is the analysis of the last edit (15 l).
    const doc = store.get().designs.a;
    const v = validate(doc);
    if (!v.ok) throw new Error('invalid');
    const want = analyze(v.system, {}).sum.curves.splDb;
    const last = drawn.filter((d) => d.id === 'spl').at(-1)!.data as (number | null)[][];
    expect(last[1][50]).toBeCloseTo(want[50], 9);
  });
});

describe('Curves: charts off screen are drawn in idle time, a few at a time', () => {
  it('draws one chart per idle period when the period is short, and every chart in the end', async () => {
    // Every chart off screen (an observer that never reports one in view), and idle periods that are
    // always nearly over: the idle drawing must then do one chart per period and come back for the rest.
    const idle: ((d: IdleDeadline) => void)[] = [];
    vi.stubGlobal(
      'IntersectionObserver',
      class {
        constructor(private readonly report: (entries: { isIntersecting: boolean }[]) => void) {}
        observe() {
          this.report([{ isIntersecting: false }]);
        }
        disconnect() {}
      },
    );
    vi.stubGlobal('requestIdleCallback', (run: (d: IdleDeadline) => void) => idle.push(run));
    try {
      const store = new Store(demoPair);
      store.dispatch({ type: 'settings', patch: { cautionsDismissed: true, screen: 'curves' } });
      render(<App store={store} autosave={new Autosave(memoryBackend())} />);
      await act(() => new Promise<void>((r) => requestAnimationFrame(() => r())));
      idle.length = 0;
      const before = drawn.length;
      act(() => {
        store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: 13 });
      });
      // Nothing on screen, so the edit itself draws nothing.
      expect(drawn.length - before).toBe(0);
      const charts = document.querySelectorAll('[data-chart]').length;
      expect(charts).toBeGreaterThan(3);
      const short = { didTimeout: false, timeRemaining: () => 0.5 } as IdleDeadline;
      const perPeriod: number[] = [];
      for (let k = 0; k < 2 * charts && idle.length > 0; k++) {
        const n = drawn.length;
        act(() => idle.shift()!(short));
        perPeriod.push(drawn.length - n);
      }
      expect(perPeriod.every((n) => n === 1)).toBe(true);
      expect(drawn.length - before).toBe(charts);
      expect(idle.length).toBe(0);
    } finally {
      vi.unstubAllGlobals();
    }
  });
});
