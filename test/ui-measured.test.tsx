// @vitest-environment happy-dom
// The Driver sheet's "Import measured response": pick a table and a blend frequency, the way
// carries it (one undoable step), Curves' SPL chart shows the measured level beside the curves.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen, waitFor } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/fake-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { buildCharts } from '../src/ui/charts/specs.ts';
import { logSpaced } from './helpers/measured.ts';

afterEach(() => cleanup());

function mount() {
  const store = new Store(demoPair);
  store.dispatch({ type: 'settings', patch: { cautionsDismissed: true, screen: 'driver' } });
  const autosave = new Autosave(memoryBackend());
  autosave.attach(store);
  render(<App store={store} autosave={autosave} />);
  return store;
}

function choose(input: HTMLInputElement, name: string, text: string) {
  const file = new File([text], name, { type: 'text/plain' });
  Object.defineProperty(input, 'files', { value: [file], configurable: true });
  fireEvent.change(input);
}

const table = `Hz;dB\n${logSpaced(20, 20000, 100)
  .map((f) => `${f.toFixed(2).replace('.', ',')};${(86 - 3 * Math.exp(-((Math.log2(f / 2000) / 0.5) ** 2))).toFixed(2).replace('.', ',')}`)
  .join('\n')}`;

describe('Driver sheet: measured response', () => {
  it('attaches a table to the way shown in A, undoably, and the SPL chart shows it', async () => {
    const store = mount();
    const before = structuredClone(store.get().designs.a);
    fireEvent.click(screen.getAllByRole('button', { name: 'Import measured response…' })[0]);
    const dialog = await screen.findByRole('dialog');
    choose(dialog.querySelector<HTMLInputElement>('input[type=file]')!, 'woofer.txt', table);
    fireEvent.input(screen.getByLabelText('Blend frequency (Hz)'), { target: { value: '400' } });
    const use = screen.getByRole('button', { name: 'Use it above the blend' });
    await waitFor(() => expect(use.hasAttribute('disabled')).toBe(false));
    await act(() => {
      fireEvent.click(use);
    });
    const design = store.get().designs.a;
    const way = design.ways[0];
    if (way.kind !== 'driver') throw new Error('the demo woofer way is a driver way');
    expect(way.measured_response?.blend_hz).toBe(400);
    expect(way.measured_response?.freq_hz.length).toBe(100);
    expect(way.measured_response?.source).toBe('woofer.txt');
    // The chart data: the measured level sits on the way's curve above the blend.
    const parsed = parseDesign(design);
    if (!parsed.ok) throw new Error('design with the table does not parse');
    const analysis = analyze(parsed.system);
    const spl = buildCharts({ a: { analysis, system: parsed.system }, b: null }).find((c) => c.id === 'spl')!;
    const measured = spl.series.find((s) => s.label.startsWith('A measured'));
    expect(measured).toBeDefined();
    const k = spl.freqHz.findIndex((f) => f > 1000);
    expect(k).toBeGreaterThan(0);
    const wayCurve = analysis.curves.splDb[k];
    expect(Math.abs((measured!.values as ArrayLike<number>)[k] - wayCurve)).toBeLessThan(0.05);
    // The cone and port curves stay the model's, and the chart says so (only with a table).
    const outputs = (sys: typeof parsed.system) =>
      buildCharts({ a: { analysis: analyze(sys), system: sys }, b: null })
        .find((c) => c.id === 'outputs')!
        .summary.join(' ');
    expect(outputs(parsed.system)).toMatch(/is the model's\. A measured response corrects the way's total sound/);
    const plain = parseDesign(before);
    if (!plain.ok) throw new Error('the demo design does not parse');
    expect(outputs(plain.system)).not.toMatch(/measured response/);
    await act(() => store.dispatch({ type: 'undo' }));
    expect(store.get().designs.a).toEqual(before);
  });

  it('names the line of a bad table and refuses a blend the table does not cover', async () => {
    const store = mount();
    const before = structuredClone(store.get().designs.a);
    fireEvent.click(screen.getAllByRole('button', { name: 'Import measured response…' })[0]);
    const dialog = await screen.findByRole('dialog');
    const input = dialog.querySelector<HTMLInputElement>('input[type=file]')!;
    choose(input, 'bad.txt', 'Hz dB\n20 80\n30 x\n');
    const use = screen.getByRole('button', { name: 'Use it above the blend' });
    await waitFor(() => expect(use.hasAttribute('disabled')).toBe(false));
    fireEvent.click(use);
    expect(screen.getByRole('alert').textContent).toBe('bad.txt, line 3: "x" is not a number');
    choose(input, 'woofer.txt', table);
    fireEvent.input(screen.getByLabelText('Blend frequency (Hz)'), { target: { value: '25' } });
    await waitFor(() => {
      fireEvent.click(use);
      expect(screen.getByRole('alert').textContent).toMatch(/woofer\.txt starts at 20 Hz: .* must start at 17\.68 Hz or lower/);
    });
    expect(store.get().designs.a).toEqual(before);
  });
});
