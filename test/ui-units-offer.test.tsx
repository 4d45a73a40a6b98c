// @vitest-environment happy-dom
// The app with display units and the subsonic offer: a field shows and takes cubic feet while the
// design keeps litres; a loud vented design is offered its subsonic high-pass, applied in one
// undoable step.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/recording-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import type { DesignDoc, DriverWayDoc } from '../src/engine/design/document.ts';

const woofer = (d: DesignDoc) => d.ways[0] as DriverWayDoc;

function mount(pair = demoPair) {
  const store = new Store(pair);
  store.dispatch({ type: 'settings', patch: { cautionsDismissed: true } });
  const autosave = new Autosave(memoryBackend());
  autosave.attach(store);
  render(<App store={store} autosave={autosave} />);
  return store;
}

afterEach(() => cleanup());

describe('display units in the app', () => {
  it('shows the box volume in cubic feet and writes litres back, exactly', async () => {
    const store = mount();
    store.dispatch({ type: 'settings', patch: { units: 'imperial' } });
    await act(() => {
      fireEvent.click(screen.getByRole('tab', { name: 'Cabinet' }));
    });
    const field = screen.getByLabelText('Net volume Vb, design B') as HTMLInputElement;
    // 20 L is 20 / 28.316846592 ft³ (1 ft³ = 1728 in³ of 16.387064 cm³, exact definitions).
    expect(Number(field.value)).toBeCloseTo(20 / 28.316846592, 5);
    expect(field.parentElement?.textContent).toContain('ft³');
    await act(() => {
      fireEvent.input(field, { target: { value: '0.75' } });
    });
    expect((woofer(store.get().designs.b).box as { vb_l: number }).vb_l).toBeCloseTo(0.75 * 28.316846592, 10);
    expect(field.value).toBe('0.75');
    // Back to metric: the same design reads in litres.
    await act(() => {
      store.dispatch({ type: 'settings', patch: { units: 'metric' } });
    });
    expect(Number((screen.getByLabelText('Net volume Vb, design B') as HTMLInputElement).value)).toBeCloseTo(21.2376349, 6);
  });
});

describe('the subsonic offer', () => {
  it('offers the high-pass for a loud vented design, adds it in one step, and undo takes it away', async () => {
    const loud = () => {
      const p = demoPair();
      return { ...p, b: { ...p.b, listening: { ...p.b.listening, level: { mode: 'spl' as const, spl_db: 90 } } } };
    };
    const store = mount(loud);
    const offer = await screen.findByTestId('subsonic-b');
    expect(offer.textContent).toMatch(/26 Hz subsonic high-pass/);
    expect(screen.queryByTestId('subsonic-a')).toBeNull();
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Add the 26 Hz high-pass to B' }));
    });
    const filter = woofer(store.get().designs.b).filter;
    expect(filter && filter.type === 'active' ? filter.highpass : null).toEqual({ shape: 'bw2', hz: 26 });
    expect(screen.queryByTestId('subsonic-b')).toBeNull();
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Undo' }));
    });
    const back = woofer(store.get().designs.b).filter;
    expect(back && back.type === 'active' ? back.highpass : undefined).toBeUndefined();
  });
});
