// @vitest-environment happy-dom
// The passive-network editor on the Driver sheet: switching a way to a passive network, adding,
// moving, editing and removing parts, and switching back.
// uPlot draws on a canvas that happy-dom lacks: it is replaced by a recorder of what would be drawn.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, act } from '@testing-library/preact';

import { drawn } from './helpers/recording-uplot.ts';

vi.mock('uplot', () => import('./helpers/recording-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { validate } from '../src/ui/engine.ts';
import type { DriverWayDoc, PassiveFilterDoc } from '../src/engine/design/document.ts';

afterEach(() => {
  cleanup();
  drawn.length = 0;
});

describe('passive network editor', () => {
  it("switches B's woofer to a passive network, edits its parts and keeps the design valid", async () => {
    const store = new Store(demoPair);
    store.dispatch({ type: 'settings', patch: { cautionsDismissed: true } });
    const autosave = new Autosave(memoryBackend());
    autosave.attach(store);
    render(<App store={store} autosave={autosave} />);
    const ladder = () => ((store.get().designs.b.ways[0] as DriverWayDoc).filter as PassiveFilterDoc).ladder;
    await act(() => {
      fireEvent.change(screen.getByLabelText('Filter kind, design B'), { target: { value: 'passive' } });
    });
    // The woofer's active low-pass at 2.2 kHz becomes a second-order LC section for its Re.
    expect(ladder().map((p) => `${p.at} ${p.part}`)).toEqual(['series l', 'shunt c']);
    expect(screen.queryByLabelText('Way gain, design B')).toBeNull();
    expect(screen.getByLabelText('Way gain, design A')).toBeTruthy();
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Add a part, design B' }));
    });
    await act(() => {
      fireEvent.change(screen.getByLabelText('Part 3 kind, design B'), { target: { value: 'rc' } });
    });
    await act(() => {
      fireEvent.change(screen.getByLabelText('Part 3 place, design B'), { target: { value: 'shunt' } });
    });
    expect(ladder()[2]).toEqual({ at: 'shunt', part: 'rc', ohm: 6.8, uf: 10 });
    await act(() => {
      fireEvent.input(screen.getByLabelText('Part 3 C, design B'), { target: { value: '12' } });
    });
    expect((ladder()[2] as { uf: number }).uf).toBe(12);
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Move part 3 up, design B' }));
    });
    expect(ladder().map((p) => p.part)).toEqual(['l', 'rc', 'c']);
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Remove part 1, design B' }));
    });
    expect(ladder().map((p) => p.part)).toEqual(['rc', 'c']);
    expect(validate(store.get().designs.b).ok).toBe(true);
    await act(() => {
      fireEvent.change(screen.getByLabelText('Filter kind, design B'), { target: { value: 'active' } });
    });
    expect((store.get().designs.b.ways[0] as DriverWayDoc).filter).toEqual({ type: 'active' });
  });
});

describe('the passive two-way pair', () => {
  it('loads from the header with one click: both designs passive, undo brings the demo pair back', async () => {
    const store = new Store(demoPair);
    store.dispatch({ type: 'settings', patch: { cautionsDismissed: true } });
    const autosave = new Autosave(memoryBackend());
    autosave.attach(store);
    render(<App store={store} autosave={autosave} />);
    const before = store.get().designs;
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Passive two-way pair' }));
    });
    const { a, b } = store.get().designs;
    expect([a.name, b.name]).toEqual(['Bookshelf two-way, passive second-order', 'Bookshelf two-way, passive third-order tweeter']);
    expect(a.ways.every((w) => w.filter?.type === 'passive')).toBe(true);
    await act(() => {
      store.dispatch({ type: 'undo' });
    });
    expect(store.get().designs).toEqual(before);
  });
});
