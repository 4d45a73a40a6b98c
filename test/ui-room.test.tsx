// @vitest-environment happy-dom
// The room on Drive & seat: the demo pair switched into the client's room, the sketch dragged.
// uPlot draws on a canvas that happy-dom lacks: it is replaced by a recorder of what would be drawn.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, act } from '@testing-library/preact';

import { drawn } from './helpers/recording-uplot.ts';

vi.mock('uplot', () => import('./helpers/recording-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';

function mount() {
  const store = new Store(demoPair);
  store.dispatch({ type: 'settings', patch: { cautionsDismissed: true } });
  const autosave = new Autosave(memoryBackend());
  autosave.attach(store);
  render(<App store={store} autosave={autosave} />);
  return { store };
}

afterEach(() => {
  cleanup();
  drawn.length = 0;
});

describe('the room on Drive & seat', () => {
  it('puts the demo pair in the client room and back, shows its modes, and moves the seat by dragging', async () => {
    const { store } = mount();
    await act(() => {
      fireEvent.click(screen.getByRole('tab', { name: 'Drive & seat' }));
    });
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Both in the client’s room' }));
    });
    const { a, b } = store.get().designs;
    expect(a.listening.room?.length_m).toBe(5.2);
    expect(b.listening.room?.length_m).toBe(5.2);
    expect(screen.getAllByText(/Schroeder frequency \d+ Hz/).length).toBe(2);
    expect(screen.getAllByText(/\(1,0,0\)/).length).toBe(2);
    // Drag A's seat: the sketch draws the width across (scale 200 px / 5.2 m), the length down.
    const sketch = screen.getAllByRole('img', { name: /seen from above/ })[0];
    const seat = sketch.querySelector('circle')!;
    await act(() => {
      fireEvent.pointerDown(seat, { clientX: 75, clientY: 130, pointerId: 1 });
    });
    await act(() => {
      fireEvent.pointerMove(sketch, { clientX: 80, clientY: 120, pointerId: 1 });
    });
    await act(() => {
      fireEvent.pointerUp(sketch, { clientX: 80, clientY: 120, pointerId: 1 });
    });
    const scale = 200 / 5.2;
    expect(store.get().designs.a.listening.room!.seat_m[0]).toBeCloseTo(120 / scale, 2);
    expect(store.get().designs.a.listening.room!.seat_m[1]).toBeCloseTo(80 / scale, 2);
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Both without a room' }));
    });
    expect(store.get().designs.a.listening.room).toBeUndefined();
    expect(screen.queryAllByText(/Schroeder frequency/).length).toBe(0);
  });
});
