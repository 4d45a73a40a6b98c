// @vitest-environment happy-dom
// The Driver sheet's "Fit from impedance": pick a sweep, fit, fill the driver fields, undo.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen, waitFor } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/fake-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { D, sweep, sweepText, truth } from './helpers/impedance-sweep.ts';

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

describe('Driver sheet: fit from impedance', () => {
  it('fits a sweep with a closed box, fills the driver of A in one undoable step', async () => {
    const store = mount();
    const before = structuredClone(store.get().designs.a);
    fireEvent.click(screen.getAllByRole('button', { name: 'Fit from impedance…' })[0]);
    const dialog = await screen.findByRole('dialog');
    const files = () => dialog.querySelectorAll<HTMLInputElement>('input[type=file]');
    choose(files()[0], 'free.txt', sweepText(sweep({ seed: 3 })));
    fireEvent.click(screen.getByLabelText(/in a closed box/));
    const vb = 0.012;
    const cab = vb / (1.204 * 343.2 ** 2 * D.sd ** 2);
    choose(files()[1], 'box.txt', sweepText(sweep({ seed: 4, cms: (D.cms * cab) / (D.cms + cab) })));
    fireEvent.input(screen.getByLabelText('Box volume (L)'), { target: { value: '12' } });
    fireEvent.input(screen.getByLabelText('Cone area Sd (cm²)'), { target: { value: '133' } });
    const fit = screen.getByRole('button', { name: 'Fit' });
    await waitFor(() => expect(fit.hasAttribute('disabled')).toBe(false));
    // The second file is read asynchronously too: wait until the fit uses it.
    await waitFor(() => {
      fireEvent.click(fit);
      expect(screen.getByLabelText('Fitted parameters').textContent).toMatch(/Vas[\d.]+ ± [\d.]+ L/);
    });
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Fill the driver fields' }));
    });
    const way = store.get().designs.a.ways[0];
    if (way.kind !== 'driver') throw new Error('the demo woofer way is a driver way');
    expect(Math.abs(way.driver.fs_hz! / truth.fs - 1)).toBeLessThan(0.01);
    expect(Math.abs(way.driver.qes! / truth.qes - 1)).toBeLessThan(0.01);
    // Air at 20 °C is used by the fit; the box above used a rounded rho·c^2, so 3% here.
    expect(Math.abs(way.driver.vas_l! / (truth.vas * 1000) - 1)).toBeLessThan(0.03);
    expect(way.driver.l2_mh).toBeGreaterThan(0);
    expect(way.driver.mms_g).toBeUndefined();
    // The name, limits and thermal fields of the driver are untouched.
    const old = before.ways[0];
    if (old.kind !== 'driver') throw new Error('driver way');
    expect(way.driver.xmax_mm).toBe(old.driver.xmax_mm);
    expect(way.driver.name).toBe(old.driver.name);
    await act(() => store.dispatch({ type: 'undo' }));
    expect(store.get().designs.a).toEqual(before);
  });

  it('names the line of a bad table', async () => {
    mount();
    fireEvent.click(screen.getAllByRole('button', { name: 'Fit from impedance…' })[0]);
    const dialog = await screen.findByRole('dialog');
    choose(dialog.querySelector<HTMLInputElement>('input[type=file]')!, 'bad.txt', 'Hz Ohm\n20 6\n30 x\n');
    const fit = screen.getByRole('button', { name: 'Fit' });
    await waitFor(() => expect(fit.hasAttribute('disabled')).toBe(false));
    fireEvent.click(fit);
    expect(screen.getByRole('alert').textContent).toBe('bad.txt, line 3: "x" is not a number');
  });
});
