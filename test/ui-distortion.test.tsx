// @vitest-environment happy-dom
// The Curves screen's distortion section: computed on request in a Worker (here a stand-in running
// the worker's own job function), with progress, cancel and the charts of both designs.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen, waitFor } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/fake-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { setDistortionWorkerFactory, type DistortionWorkerLike } from '../src/ui/components/DistortionPanel.tsx';
import { runDistortionJob, type DistortionJob, type DistortionReply } from '../src/audio/distortion.worker.ts';

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
