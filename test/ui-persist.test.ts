import { describe, expect, it } from 'vitest';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { Store } from '../src/ui/store.ts';
import { demoPair } from '../src/ui/demo.ts';
import { connectTabs } from '../src/ui/tabsync.ts';
import type { DesignDoc, DriverWayDoc } from '../src/engine/design/document.ts';
import { validate } from '../src/ui/engine.ts';
import ventedV1 from '../public/examples/living-room-vented.json';

const woofer = (d: DesignDoc | undefined) => d?.ways[0] as DriverWayDoc;

describe('no lost work', () => {
  it('sets an unreadable stored state aside and restores the last good one', async () => {
    const backend = memoryBackend();
    const first = new Autosave(backend);
    const store = new Store(demoPair);
    await first.load();
    first.attach(store);
    store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: 17 });
    await first.flush();
    backend.value = { kind: 'preheard-app-state', version: 1, state: 'garbage' };
    const second = new Autosave(backend);
    const restored = await second.load();
    expect((woofer(restored?.designs.a).box as { vb_l: number }).vb_l).toBe(17);
    expect(second.status.kind).toBe('recovered');
    expect(await second.setAsideText()).toContain('garbage');
  });

  it('falls back to the demo pair, still keeping the unreadable data, when nothing good was ever saved', async () => {
    const backend = memoryBackend('{"not": "a state"');
    const a = new Autosave(backend);
    expect(await a.load()).toBeUndefined();
    expect(a.status.kind).toBe('recovered');
    expect(await a.setAsideText()).toContain('not');
  });

  it('keeps two tabs consistent over a BroadcastChannel, without echoing', async () => {
    const name = `preheard-test-${Math.random()}`;
    const backend = memoryBackend();
    const [s1, s2] = [new Store(demoPair), new Store(demoPair)];
    const [a1, a2] = [new Autosave(backend), new Autosave(backend)];
    await Promise.all([a1.load(), a2.load()]);
    a1.attach(s1);
    a2.attach(s2);
    const c1 = new BroadcastChannel(name);
    const c2 = new BroadcastChannel(name);
    let received = 0;
    const off1 = connectTabs(s1, a1, c1 as never, 'tab-1');
    const off2 = connectTabs(s2, a2, c2 as never, 'tab-2');
    const spy = new BroadcastChannel(name);
    spy.onmessage = () => received++;
    s1.dispatch({ type: 'edit', slot: 'b', path: 'ways.0.box.fb_hz', value: 37 });
    await a1.flush();
    await new Promise((r) => setTimeout(r, 50));
    expect((woofer(s2.get().designs.b).box as { fb_hz?: number }).fb_hz).toBe(37);
    expect(s2.canUndo()).toBe(true);
    await a2.flush();
    await new Promise((r) => setTimeout(r, 50));
    // One announcement from tab 1; tab 2 saved the adopted designs without announcing them back.
    expect(received).toBe(1);
    off1();
    off2();
    spy.close();
  });

  it('adopts version 1 designs announced by a tab still running the first version, as version 2', async () => {
    const name = `preheard-test-${Math.random()}`;
    const store = new Store(demoPair);
    const save = new Autosave(memoryBackend());
    save.attach(store);
    const off = connectTabs(store, save, new BroadcastChannel(name) as never, 'new-tab');
    const old = new BroadcastChannel(name);
    const edited = { ...structuredClone(ventedV1), name: 'from the old tab' };
    old.postMessage({ kind: 'preheard-designs', tab: 'old-tab', savedAt: 1, designs: { a: edited, b: structuredClone(ventedV1) } });
    await new Promise((r) => setTimeout(r, 50));
    const a = store.get().designs.a;
    expect(a.name).toBe('from the old tab');
    expect(a.version).toBe(2);
    const ref = validate(structuredClone(edited));
    expect(ref.ok && ref.design).toEqual(a);
    off();
    old.close();
  });
});
