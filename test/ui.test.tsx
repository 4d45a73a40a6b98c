// @vitest-environment happy-dom
// The app's components in a DOM: the demo pair, rejected entries, derived values, cautions, storage trouble.
// uPlot draws on a canvas that happy-dom lacks: it is replaced by a recorder of what would be drawn.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, within, act } from '@testing-library/preact';

import { drawn } from './helpers/recording-uplot.ts';

vi.mock('uplot', () => import('./helpers/recording-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend, type StorageBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { activeFilterOf, type DesignDoc, type DriverWayDoc } from '../src/engine/design/document.ts';

const woofer = (d: DesignDoc) => d.ways[0] as DriverWayDoc;

function mount(backend: StorageBackend = memoryBackend(), dismissed = true) {
  const store = new Store(demoPair);
  if (dismissed) store.dispatch({ type: 'settings', patch: { cautionsDismissed: true } });
  const autosave = new Autosave(backend);
  autosave.attach(store);
  render(<App store={store} autosave={autosave} />);
  return { store, autosave };
}

afterEach(() => {
  cleanup();
  drawn.length = 0;
});

describe('the app', () => {
  it('opens on the demo pair with figures as text', () => {
    mount();
    const names = [...document.querySelectorAll('.pair-name')].map((e) => e.textContent);
    expect(names[0]).toMatch(/sealed/i);
    expect(names[1]).toMatch(/vented/i);
    for (const s of ['a', 'b']) expect(screen.getAllByTestId(`fig-${s}-f3`)[0].textContent).toMatch(/^\d+(\.\d)? Hz$/);
    // The screens by their names, in the order of the design (section 6), Presentation mode last.
    expect(screen.getAllByRole('tab').map((t) => t.textContent)).toEqual([
      'Driver sheet',
      'Cabinet',
      'Drive & seat',
      'Curves',
      'Listening bench',
      'Stress strip',
      'Blind trial',
      'Headroom probe',
      'Client sheet',
      'Present',
    ]);
  });

  it('keeps a rejected entry with the engine message beside it', async () => {
    const { store } = mount();
    const fs = screen.getByLabelText('Resonance fs, design A') as HTMLInputElement;
    await act(() => {
      fireEvent.input(fs, { target: { value: '6000' } });
    });
    expect(fs.value).toBe('6000');
    expect(fs.getAttribute('aria-invalid')).toBe('true');
    const msg = document.getElementById(fs.getAttribute('aria-describedby')!)!;
    // The schema's range for fs (1 to 5000 Hz) is named in the message.
    expect(msg.textContent).toMatch(/1 to 5000/);
    expect(woofer(store.get().designs.a).driver.fs_hz).toBe(6000);
    expect(screen.getAllByText(/errors?$/).length).toBeGreaterThan(0);
    // The figures of A show its last valid version, marked as such.
    expect(screen.getAllByText(/last valid version/).length).toBeGreaterThan(0);
  });

  it('shows the value the model derives for an empty optional field', async () => {
    mount();
    const bl = screen.getByLabelText('Force factor Bl, design A') as HTMLInputElement;
    expect(bl.value).toBe('');
    // Bl^2 = 2·pi·fs·Mms·Re/Qes (Small 1972): with the demo driver about 7.2 T·m.
    expect(Number(bl.placeholder)).toBeGreaterThan(6.5);
    expect(Number(bl.placeholder)).toBeLessThan(8);
  });

  it('redraws the charts when a field changes', async () => {
    mount();
    await act(() => {
      fireEvent.click(screen.getByRole('tab', { name: 'Cabinet' }));
    });
    const before = drawn.length;
    const f3Before = screen.getByTestId('f3-a').textContent;
    await act(() => {
      fireEvent.input(screen.getByLabelText('Net volume Vb, design A'), { target: { value: '6' } });
    });
    expect(drawn.length).toBeGreaterThan(before);
    expect(screen.getByTestId('f3-a').textContent).not.toBe(f3Before);
  });

  it('works per way: adds a tweeter to B, edits its filter and box, copies it to A, renames and removes it', async () => {
    const { store } = mount();
    const b0 = store.get().designs.b;
    expect(b0.ways.map((w) => w.name)).toEqual(['woofer', 'upper band']);
    // A's woofer is its only driver way: it cannot be removed.
    expect((screen.getByRole('button', { name: 'Remove way woofer from design A' }) as HTMLButtonElement).disabled).toBe(true);
    await act(() => {
      fireEvent.change(screen.getByLabelText('Add a way to design B'), { target: { value: 'tweeter' } });
    });
    const b1 = store.get().designs.b;
    expect(b1.ways.map((w) => w.kind)).toEqual(['driver', 'flat', 'driver']);
    const tw = b1.ways[2] as DriverWayDoc;
    expect(tw.name).toBe('tweeter');
    // The tweeter is crossed where the woofer is (its low-pass), in a small closed box.
    expect(activeFilterOf(tw)?.highpass).toEqual({ shape: 'lr4', hz: activeFilterOf(woofer(b0))?.lowpass?.hz });
    expect(tw.box).toEqual({ type: 'sealed', vb_l: 0.12 });
    // The sheet now shows B's tweeter beside A's woofer.
    expect((screen.getByTestId('way-pick-b') as HTMLSelectElement).value).toBe('2');
    expect((screen.getByLabelText('Resonance fs, design B') as HTMLInputElement).value).toBe('950');
    expect((screen.getByLabelText('Resonance fs, design A') as HTMLInputElement).value).toBe(String(woofer(b0).driver.fs_hz));
    expect((screen.getByLabelText('High-pass corner, design B') as HTMLInputElement).value).toBe(String(activeFilterOf(tw)?.highpass?.hz));
    await act(() => {
      fireEvent.input(screen.getByLabelText('Way gain, design B'), { target: { value: '-3' } });
    });
    expect(activeFilterOf(store.get().designs.b.ways[2])?.gain_db).toBe(-3);
    await act(() => {
      fireEvent.click(screen.getByRole('tab', { name: 'Cabinet' }));
    });
    expect((screen.getByLabelText('Net volume Vb, design B') as HTMLInputElement).value).toBe('0.12');
    expect(screen.getByTestId('fig-b-way').textContent).toBe('tweeter');
    await act(() => {
      fireEvent.input(screen.getByLabelText('Net volume Vb, design B'), { target: { value: '0.2' } });
    });
    expect(((store.get().designs.b.ways[2] as DriverWayDoc).box as { vb_l: number }).vb_l).toBe(0.2);
    expect(woofer(store.get().designs.b).box).toEqual(woofer(b0).box);
    // Copy to A: added as A's third way, identical, and shown there.
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Copy to A: way tweeter from design B to design A' }));
    });
    expect(store.get().designs.a.ways[2]).toEqual(store.get().designs.b.ways[2]);
    expect(store.get().designs.a.ways[2]).not.toBe(store.get().designs.b.ways[2]);
    expect((screen.getByTestId('way-pick-a') as HTMLSelectElement).value).toBe('2');
    // Rename in B, then remove; undo brings it back.
    await act(() => {
      fireEvent.input(screen.getByLabelText('Way name, design B'), { target: { value: 'dome' } });
    });
    expect(store.get().designs.b.ways[2].name).toBe('dome');
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Remove way dome from design B' }));
    });
    // Removing asks first.
    expect(store.get().designs.b.ways.map((w) => w.name)).toEqual(['woofer', 'upper band', 'dome']);
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Remove the way' }));
    });
    expect(store.get().designs.b.ways.map((w) => w.name)).toEqual(['woofer', 'upper band']);
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Undo' }));
    });
    expect(store.get().designs.b.ways.map((w) => w.name)).toEqual(['woofer', 'upper band', 'dome']);
    // With the tweeter copied in, A's woofer is no longer its only driver way.
    await act(() => {
      fireEvent.change(screen.getByTestId('way-pick-a'), { target: { value: '0' } });
    });
    expect((screen.getByRole('button', { name: 'Remove way woofer from design A' }) as HTMLButtonElement).disabled).toBe(false);
  });

  it('applies an alignment suggestion with one click, and undo brings the box back', async () => {
    const { store } = mount();
    await act(() => {
      fireEvent.click(screen.getByRole('tab', { name: 'Cabinet' }));
    });
    const box0 = woofer(store.get().designs.b).box;
    const apply = screen.getAllByRole('button', { name: /^Apply .* to design B$/ });
    expect(apply.length).toBeGreaterThan(2);
    await act(() => {
      fireEvent.click(apply[0]);
    });
    expect(woofer(store.get().designs.b).box).not.toEqual(box0);
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Undo' }));
    });
    expect(woofer(store.get().designs.b).box).toEqual(box0);
  });

  it('shows the first-run cautions until dismissed, and reopens them', async () => {
    const { store } = mount(memoryBackend(), false);
    const dlg = screen.getByRole('dialog', { name: 'Before you start' });
    for (const w of [/hearing/i, /estimate/i, /mains/i, /local codes/i]) expect(dlg.textContent).toMatch(w);
    await act(() => {
      fireEvent.click(within(dlg).getByRole('button', { name: 'I understand' }));
    });
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(store.get().settings.cautionsDismissed).toBe(true);
    await act(() => {
      fireEvent.click(screen.getByRole('button', { name: 'Cautions' }));
    });
    expect(screen.getByRole('dialog', { name: 'Before you start' })).toBeTruthy();
  });

  it('says when storage is unavailable and offers export', async () => {
    const broken: StorageBackend = {
      ...memoryBackend(),
      load: async () => undefined,
      save: async () => {
        throw new Error('storage is switched off');
      },
    };
    const { store, autosave } = mount(broken);
    await act(async () => {
      await autosave.load();
      store.dispatch({ type: 'swap' });
      await autosave.flush();
    });
    const banner = screen.getByTestId('storage-banner');
    expect(banner.textContent).toMatch(/storage is switched off/);
    expect(within(banner).getByRole('button', { name: 'Export A' })).toBeTruthy();
    expect(screen.getByTestId('save-status').dataset.state).toBe('unavailable');
  });
});
