// @vitest-environment happy-dom
// The driver shelf: its file, merging without loss, and the Driver sheet's save / put / undo.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/fake-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import {
  freeName,
  importInto,
  inventedDrivers,
  memoryShelf,
  nameProblem,
  readShelfFile,
  removeEntry,
  renameEntry,
  restoreEntry,
  shelfFileText,
  type ShelfEntry,
} from '../src/ui/shelf.ts';

afterEach(() => cleanup());

const woofer = () => {
  const w = demoPair().a.ways[0];
  if (w.kind !== 'driver') throw new Error('the demo woofer way is a driver way');
  return w.driver;
};

describe('shelf file', () => {
  it('round-trips the user drivers and leaves the invented ones out', () => {
    const mine: ShelfEntry = { name: 'bench woofer', savedAt: Date.UTC(2026, 0, 2), driver: { ...woofer(), fs_hz: 37.5 } };
    const text = shelfFileText([mine, ...inventedDrivers()]);
    const r = readShelfFile(text);
    if (!r.ok) throw new Error(r.message);
    expect(r.entries).toEqual([mine]);
  });

  it('marks the demo drivers invented', () => {
    const demo = inventedDrivers();
    expect(demo.length).toBeGreaterThan(0);
    for (const d of demo) {
      expect(d.invented).toBe(true);
      expect(d.name).toMatch(/invented/);
    }
  });

  it('refuses a bad file naming the driver and field, and a file of another kind', () => {
    const bad = JSON.stringify({
      format: 'preheard-driver-shelf',
      version: 1,
      drivers: [
        { name: 'ok', driver: woofer() },
        { name: 'broken', driver: { ...woofer(), re_ohm: -3 } },
      ],
    });
    const r = readShelfFile(bad);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/^driver 2 \("broken"\): driver\.re_ohm .*0\.1/);
    const other = readShelfFile(JSON.stringify({ format: 'preheard-design', version: 2 }));
    expect(other.ok ? '' : other.message).toBe('the file is not a preheard driver shelf');
    expect(readShelfFile('{').ok).toBe(false);
  });

  it('imports without overwriting: same driver skipped, a different one under a taken name numbered', async () => {
    const shelf = memoryShelf([{ name: 'w', savedAt: 1, driver: woofer() }]);
    const added = await importInto(shelf, [
      { name: 'w', savedAt: 2, driver: woofer() },
      { name: 'w', savedAt: 3, driver: { ...woofer(), qms: 9 } },
    ]);
    expect(added).toBe(1);
    const list = await shelf.list();
    expect(list.map((e) => e.name).sort()).toEqual(['w', 'w (2)']);
    expect(list.find((e) => e.name === 'w')?.driver.qms).toBe(woofer().qms);
    expect(freeName('w', ['w', 'w (2)'])).toBe('w (3)');
  });
});

describe('rename and delete', () => {
  it('renames to a free name only, keeping the driver and its date', async () => {
    const shelf = memoryShelf([
      { name: 'w', savedAt: 5, driver: woofer() },
      { name: 'x', savedAt: 6, driver: { ...woofer(), qms: 7 } },
    ]);
    expect(await renameEntry(shelf, 'w', '  bench woofer  ')).toEqual({ ok: true, name: 'bench woofer' });
    expect((await shelf.list()).map((e) => e.name).sort()).toEqual(['bench woofer', 'x']);
    expect((await shelf.list()).find((e) => e.name === 'bench woofer')).toEqual({ name: 'bench woofer', savedAt: 5, driver: woofer() });
    // A taken name (the user's or an invented one), an empty one and a very long one are refused; nothing changes.
    const invented = inventedDrivers()[0].name;
    for (const [to, msg] of [
      ['x', /"x" is already on the shelf/],
      [invented, /already on the shelf/],
      ['   ', /needs a name/],
      ['n'.repeat(201), /at most 200 characters.*201/],
    ] as const) {
      const r = await renameEntry(shelf, 'bench woofer', to);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.message).toMatch(msg);
    }
    expect((await shelf.list()).find((e) => e.name === 'x')?.driver.qms).toBe(7);
    expect(await renameEntry(shelf, 'gone', 'y')).toEqual({ ok: false, message: '"gone" is no longer on the shelf' });
    expect(nameProblem('y', ['x'])).toBeNull();
  });

  it('deletes and puts back, under a numbered name when the name was taken meanwhile', async () => {
    const shelf = memoryShelf([{ name: 'w', savedAt: 5, driver: woofer() }]);
    const gone = await removeEntry(shelf, 'w');
    expect(gone?.name).toBe('w');
    expect(await shelf.list()).toEqual([]);
    expect(await removeEntry(shelf, 'w')).toBeNull();
    await shelf.put({ name: 'w', savedAt: 9, driver: { ...woofer(), qms: 3 } });
    expect(await restoreEntry(shelf, gone!)).toBe('w (2)');
    const back = (await shelf.list()).find((e) => e.name === 'w (2)');
    expect(back?.driver).toEqual(woofer());
    expect((await shelf.list()).find((e) => e.name === 'w')?.driver.qms).toBe(3);
  });
});

describe('Driver sheet: the shelf', () => {
  it("saves A's driver, puts it into B in one undoable step", async () => {
    const store = new Store(demoPair);
    store.dispatch({ type: 'settings', patch: { cautionsDismissed: true, screen: 'driver' } });
    const autosave = new Autosave(memoryBackend());
    autosave.attach(store);
    // A's driver made distinct first, so that putting it into B shows.
    const path = 'ways.0.driver';
    const a0 = store.get().designs.a.ways[0];
    if (a0.kind !== 'driver') throw new Error('driver way');
    store.dispatch({ type: 'edit', slot: 'a', path, value: { ...a0.driver, name: 'Bench woofer', qms: 6.1 } });
    render(<App store={store} autosave={autosave} />);
    fireEvent.click(screen.getByRole('button', { name: "Save A's driver" }));
    await waitFor(() => expect(screen.getByTestId('shelf-note').textContent).toBe('saved "Bench woofer" on the shelf'));
    const select = screen.getByLabelText('Shelf driver for B') as HTMLSelectElement;
    const options = [...select.options].map((o) => o.textContent);
    expect(options).toContain('Bench woofer');
    expect(options.some((o) => /invented demo driver$/.test(o ?? ''))).toBe(true);
    const bBefore = structuredClone(store.get().designs.b);
    fireEvent.change(select, { target: { value: 'Bench woofer' } });
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Put in B' }));
    });
    const b0 = store.get().designs.b.ways[0];
    if (b0.kind !== 'driver') throw new Error('driver way');
    expect(b0.driver.qms).toBe(6.1);
    expect(b0.driver.name).toBe('Bench woofer');
    await act(() => store.dispatch({ type: 'undo' }));
    expect(store.get().designs.b).toEqual(bBefore);
  });

  it('renames a driver of the user, and deletes it only after asking, with an undo', async () => {
    const store = new Store(demoPair);
    store.dispatch({ type: 'settings', patch: { cautionsDismissed: true, screen: 'driver' } });
    const a0 = store.get().designs.a.ways[0];
    if (a0.kind !== 'driver') throw new Error('driver way');
    store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.driver', value: { ...a0.driver, name: 'Shelf test woofer' } });
    const autosave = new Autosave(memoryBackend());
    autosave.attach(store);
    render(<App store={store} autosave={autosave} />);
    fireEvent.click(screen.getByRole('button', { name: "Save A's driver" }));
    await waitFor(() => expect(screen.getByTestId('shelf-note').textContent).toBe('saved "Shelf test woofer" on the shelf'));
    fireEvent.click(await screen.findByRole('button', { name: 'Rename Shelf test woofer' }));
    const field = screen.getByLabelText('New name for Shelf test woofer') as HTMLInputElement;
    fireEvent.input(field, { target: { value: 'Garage 10-inch' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save the name' }));
    await waitFor(() => expect(screen.getByTestId('shelf-note').textContent).toBe('renamed "Shelf test woofer" to "Garage 10-inch"'));
    const options = () => [...(screen.getByLabelText('Shelf driver for B') as HTMLSelectElement).options].map((o) => o.textContent);
    expect(options()).toContain('Garage 10-inch');
    expect(options()).not.toContain('Shelf test woofer');

    // Delete asks first; Cancel keeps it.
    fireEvent.click(screen.getByRole('button', { name: 'Delete Garage 10-inch' }));
    fireEvent.click(within(screen.getByRole('dialog')).getByRole('button', { name: 'Cancel' }));
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(options()).toContain('Garage 10-inch');
    fireEvent.click(screen.getByRole('button', { name: 'Delete Garage 10-inch' }));
    fireEvent.click(screen.getByTestId('confirm-yes'));
    await waitFor(() => expect(screen.getByTestId('shelf-note').textContent).toBe('deleted "Garage 10-inch" from the shelf'));
    expect(options()).not.toContain('Garage 10-inch');
    // The design that used it keeps its own copy.
    const still = store.get().designs.a.ways[0];
    expect(still.kind === 'driver' && still.driver.name).toBe('Shelf test woofer');
    fireEvent.click(screen.getByTestId('shelf-undo'));
    await waitFor(() => expect(screen.getByTestId('shelf-note').textContent).toBe('"Garage 10-inch" is back on the shelf'));
    expect(options()).toContain('Garage 10-inch');
  });
});
