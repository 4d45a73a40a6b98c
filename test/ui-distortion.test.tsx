// @vitest-environment happy-dom
// The Curves screen's distortion section: computed on request in a Worker (here a stand-in running
// the worker's own job function), with progress, cancel and the charts of both designs.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen, waitFor } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/recording-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { setDistortionWorkerFactory, type DistortionWorkerLike } from '../src/ui/components/DistortionPanel.tsx';
import { runDistortionJob, type DistortionJob, type DistortionReply } from '../src/audio/distortion.worker.ts';
import { drawn } from './helpers/recording-uplot.ts';
import { parseLevelList, parseTonePair } from '../src/ui/distortion-input.ts';

afterEach(() => cleanup());

/** Runs the job a tick later, like a Worker; `hold` keeps it from finishing (to test cancel). */
function fakeWorkers(hold = false) {
  const made: { terminated: boolean }[] = [];
  setDistortionWorkerFactory(() => {
    const rec = { terminated: false };
    made.push(rec);
    const w: DistortionWorkerLike = {
      onmessage: null,
      postMessage(job: DistortionJob) {
        setTimeout(() => {
          const send = (m: DistortionReply) => {
            if (!rec.terminated && !(hold && m.type === 'result')) w.onmessage?.({ data: m } as MessageEvent<DistortionReply>);
          };
          runDistortionJob(structuredClone(job), send);
        }, 0);
      },
      terminate() {
        rec.terminated = true;
      },
    };
    return w;
  });
  return made;
}

function mount() {
  const store = new Store(demoPair);
  store.dispatch({ type: 'settings', patch: { cautionsDismissed: true, screen: 'curves' } });
  const autosave = new Autosave(memoryBackend());
  autosave.attach(store);
  render(<App store={store} autosave={autosave} />);
}

describe('Curves: distortion', () => {
  it('computes both designs on request and draws THD, H3 and compression', async () => {
    const made = fakeWorkers();
    mount();
    expect(screen.queryByText('Total harmonic distortion')).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Compute distortion' }));
    expect(made).toHaveLength(2);
    await waitFor(() => expect(screen.getByRole('button', { name: 'Compute again' })).toBeTruthy(), { timeout: 20000 });
    for (const t of ['Total harmonic distortion', 'Third harmonic', 'Compression of the fundamental'])
      expect(screen.getByText(t)).toBeTruthy();
    expect(screen.getByText(/^A: at most [\d.]+ % THD at [\d.]+ V rms$/)).toBeTruthy();
    expect(made.every((m) => m.terminated)).toBe(true);
  }, 30000);

  it('computes at a list of levels and the two-tone figure: quieter levels distort less', async () => {
    const made = fakeWorkers();
    mount();
    fireEvent.input(screen.getByTestId('distortion-levels'), { target: { value: '0; -12' } });
    fireEvent.input(screen.getByTestId('im-low'), { target: { value: '50' } });
    fireEvent.input(screen.getByTestId('im-high'), { target: { value: '730' } });
    drawn.length = 0;
    fireEvent.click(screen.getByRole('button', { name: 'Compute distortion' }));
    expect(made).toHaveLength(2);
    await waitFor(() => expect(screen.getByRole('button', { name: 'Compute again' })).toBeTruthy(), { timeout: 40000 });
    // The THD chart: x, then A at the planned level, A at -12 dB, B at the planned level, B at -12 dB.
    const thd = drawn.filter((d) => d.id === 'thd').at(-1)!.data as (number | null)[][];
    expect(thd).toHaveLength(5);
    const [, a0, a12, b0, b12] = thd;
    // At the lowest step (20 Hz) the cone moves most: 12 dB less drive, several times less distortion.
    expect(a0[0]! / a12[0]!).toBeGreaterThan(2);
    expect(b0[0]! / b12[0]!).toBeGreaterThan(2);
    const table = screen.getByTestId('im-table');
    expect(table.textContent).toMatch(/50 Hz and 730 Hz/);
    const rows = table.querySelectorAll('tbody tr');
    expect(rows).toHaveLength(2);
    for (const r of rows) expect(r.textContent).toMatch(/^[AB] sum[\d.]+ % \(−?[\d.]+ dB\)/);
  }, 60000);

  it('refuses a bad list of levels or tone pair with a message, starting nothing', () => {
    const made = fakeWorkers();
    mount();
    fireEvent.input(screen.getByTestId('distortion-levels'), { target: { value: '0, loud' } });
    fireEvent.click(screen.getByRole('button', { name: 'Compute distortion' }));
    expect(made).toHaveLength(0);
    expect(screen.getByRole('alert').textContent).toMatch(/“loud” is not a number of decibels/);
    fireEvent.input(screen.getByTestId('distortion-levels'), { target: { value: '0' } });
    fireEvent.input(screen.getByTestId('im-high'), { target: { value: '400' } });
    fireEvent.click(screen.getByRole('button', { name: 'Compute distortion' }));
    expect(made).toHaveLength(0);
    expect(screen.getByRole('alert').textContent).toMatch(/whole multiple/);
  });

  it('reads levels and tone pairs as a user types them', () => {
    expect(parseLevelList('0, -6 −12')).toEqual({ ok: true, value: [0, -6, -12] });
    expect(parseLevelList('')).toMatchObject({ ok: false, message: /at least one level/ });
    expect(parseLevelList('0,1,2,3,4')).toMatchObject({ ok: false, message: /At most 4/ });
    expect(parseLevelList('0, 0')).toMatchObject({ ok: false, message: /listed twice/ });
    expect(parseLevelList('-60')).toMatchObject({ ok: false, message: /from -40 to \+10 dB/ });
    expect(parseLevelList('1e3')).toMatchObject({ ok: false });
    expect(parseTonePair('40', '420')).toEqual({ ok: true, value: [40, 420] });
    expect(parseTonePair('', '420')).toMatchObject({ ok: false, message: /both tones/ });
    expect(parseTonePair('40', '100')).toMatchObject({ ok: false, message: /three times/ });
  });

  it('cancels: the workers are stopped and nothing is drawn', async () => {
    const made = fakeWorkers(true);
    mount();
    fireEvent.click(screen.getByRole('button', { name: 'Compute distortion' }));
    await waitFor(() => expect(screen.getByLabelText('Distortion sweep progress')).toBeTruthy());
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Cancel' }));
    });
    expect(made.every((m) => m.terminated)).toBe(true);
    expect(screen.getByRole('button', { name: 'Compute distortion' })).toBeTruthy();
    expect(screen.queryByText('Total harmonic distortion')).toBeNull();
  });
});
