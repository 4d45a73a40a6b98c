// @vitest-environment happy-dom
// The Driver sheet's "Fit from impedance": pick a sweep, fit, fill the driver fields, undo.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen, waitFor } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/fake-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { D, sweep, sweepText, truth } from './helpers/impedance-sweep.ts';
import { setFitWorkerFactory, type FitWorkerLike } from '../src/ui/components/ImpedanceFitDialog.tsx';
import { runFitJob, type FitJob, type FitReply } from '../src/ui/impedance-fit.worker.ts';
import { runFit } from '../src/ui/impedance-fit.ts';

afterEach(() => cleanup());

/** Workers started by the dialog, run in this thread a moment later (the job cloned as a Worker would). */
const started: { job: FitJob | null; terminated: boolean }[] = [];
let hold = false;
beforeEach(() => {
  started.length = 0;
  hold = false;
  setFitWorkerFactory(() => {
    const rec = { job: null as FitJob | null, terminated: false };
    started.push(rec);
    const w: FitWorkerLike = {
      onmessage: null,
      postMessage(job) {
        rec.job = job;
        if (hold) return;
        setTimeout(() => {
          const send = (m: FitReply) => !rec.terminated && w.onmessage?.({ data: structuredClone(m) } as MessageEvent<FitReply>);
          runFitJob(structuredClone(job), send);
        }, 0);
      },
      terminate() {
        rec.terminated = true;
      },
    };
    return w;
  });
});

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
    // The second file is read asynchronously too: fit again until the fit uses it.
    await waitFor(
      () => {
        const table = screen.queryByLabelText('Fitted parameters');
        if (/Vas[\d.]+ ± [\d.]+ L/.test(table?.textContent ?? '')) return;
        const again = screen.queryByRole('button', { name: 'Fit' });
        if (again) fireEvent.click(again);
        throw new Error('no Vas from the second sweep yet');
      },
      { timeout: 15_000 },
    );
    // It ran in the worker: every start had a job, and the page's thread fitted nothing itself.
    expect(started.length).toBeGreaterThan(0);
    expect(started.every((w) => w.job?.type === 'fit')).toBe(true);
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
    await waitFor(() => expect(screen.getByRole('alert').textContent).toBe('bad.txt, line 3: "x" is not a number'));
  });

  it('shows progress while the worker fits, and cancels by ending the worker', async () => {
    hold = true;
    mount();
    fireEvent.click(screen.getAllByRole('button', { name: 'Fit from impedance…' })[0]);
    const dialog = await screen.findByRole('dialog');
    choose(dialog.querySelector<HTMLInputElement>('input[type=file]')!, 'free.txt', sweepText(sweep({ seed: 3 })));
    const fit = screen.getByRole('button', { name: 'Fit' });
    await waitFor(() => expect(fit.hasAttribute('disabled')).toBe(false));
    fireEvent.click(fit);
    expect(screen.getByTestId('fit-progress').textContent).toMatch(/starting/);
    fireEvent.click(screen.getByRole('button', { name: 'Cancel the fit' }));
    expect(started).toHaveLength(1);
    expect(started[0].terminated).toBe(true);
    expect(screen.queryByTestId('fit-progress')).toBeNull();
    expect(screen.getByRole('alert').textContent).toBe('fit cancelled');
    expect(screen.getByRole('button', { name: 'Fit' }).hasAttribute('disabled')).toBe(false);
  });

  it('the worker job reports each sweep, then exactly what the fit gives', () => {
    const request = {
      freeText: sweepText(sweep({ seed: 3 })),
      freeName: 'free.txt',
      method: 'added-mass' as const,
      amount: 10,
      secondText: sweepText(sweep({ seed: 5, mms: D.mms + 0.01 })),
      secondName: 'mass.txt',
      sdCm2: 133,
    };
    const replies: FitReply[] = [];
    runFitJob({ type: 'fit', id: 7, request }, (m) => replies.push(m));
    expect(replies.slice(0, 2)).toEqual([
      { type: 'progress', id: 7, done: 0, of: 2, what: 'fitting the free-air sweep' },
      { type: 'progress', id: 7, done: 1, of: 2, what: 'fitting the second sweep' },
    ]);
    expect(replies[2]).toEqual({ type: 'result', id: 7, outcome: runFit(request) });
    const bad: FitReply[] = [];
    runFitJob({ type: 'fit', id: 8, request: { ...request, freeText: 'Hz Ohm\n20 6\n30 x\n' } }, (m) => bad.push(m));
    expect(bad.at(-1)).toEqual({ type: 'result', id: 8, outcome: { ok: false, message: 'free.txt, line 3: "x" is not a number' } });
  });
});
