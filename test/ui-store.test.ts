// The app's store, autosave and share links: behaviour the issue asks for, checked with real numbers.
import { describe, expect, it } from 'vitest';
import { Store, type AppState } from '../src/ui/store.ts';
import { Autosave, memoryBackend, type StorageBackend } from '../src/ui/persist.ts';
import { decodeShare, encodeShare, hasShare } from '../src/ui/share.ts';
import { getAt, normalizePath, pathMatches, setAt } from '../src/ui/paths.ts';
import { demoPair } from '../src/ui/demo.ts';
import { readDesignText } from '../src/ui/files.ts';
import { validate } from '../src/ui/engine.ts';
import { activeFilterOf, type DesignDoc, type DriverWayDoc } from '../src/engine/design/document.ts';
import sealedV1 from '../public/examples/living-room-sealed.json';
import ventedV1 from '../public/examples/living-room-vented.json';

/** The woofer way of a design (the first way of the demo designs, migrated from version 1). */
const woofer = (d: DesignDoc) => d.ways[0] as DriverWayDoc;

function clock(start = 0) {
  let t = start;
  return { now: () => t, advance: (ms: number) => (t += ms) };
}

describe('design paths', () => {
  it('reads and writes nested fields without touching the original', () => {
    const doc = demoPair().b;
    const next = setAt(doc, 'ways.0.box.ports.0.diameter_cm', 7.5);
    expect(getAt(next, 'ways.0.box.ports.0.diameter_cm')).toBe(7.5);
    expect(getAt(doc, 'ways.0.box.ports.0.diameter_cm')).toBe(6);
    expect(woofer(next).driver).toBe(woofer(doc).driver); // only the edited path is copied
    expect(next.ways[1]).toBe(doc.ways[1]);
    const removed = setAt(doc, 'ways.0.driver.le_mh', undefined);
    expect('le_mh' in woofer(removed).driver).toBe(false);
    expect(Array.isArray((woofer(setAt(doc, 'ways.0.box.ports.0.count', 2)).box as { ports: unknown[] }).ports)).toBe(true);
  });
  it('matches engine paths in either index notation', () => {
    expect(normalizePath('ways[0].box.ports[0].count')).toBe('ways.0.box.ports.0.count');
    expect(pathMatches('ways[0].box.ports[0].count', 'ways.0.box.ports.0.count')).toBe(true);
    expect(pathMatches('ways.0.box.ports.0.count', 'ways.0.box.ports')).toBe(true);
    expect(pathMatches('ways.0.box.vb_l', 'ways.0.box.v')).toBe(false);
  });
});

describe('store: one history of design edits', () => {
  it('undoes and redoes edits; typing into one field is one step', () => {
    const c = clock();
    const store = new Store(demoPair, undefined, c.now);
    const vb0 = (woofer(store.get().designs.a).box as { vb_l: number }).vb_l;
    for (const v of [2, 25, 250, 25.5]) {
      store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: v });
      c.advance(150);
    }
    c.advance(5000);
    store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: 30 });
    expect((woofer(store.get().designs.a).box as { vb_l: number }).vb_l).toBe(30);
    store.dispatch({ type: 'undo' });
    expect((woofer(store.get().designs.a).box as { vb_l: number }).vb_l).toBe(25.5);
    store.dispatch({ type: 'undo' });
    expect((woofer(store.get().designs.a).box as { vb_l: number }).vb_l).toBe(vb0);
    expect(store.canUndo()).toBe(false);
    store.dispatch({ type: 'redo' });
    store.dispatch({ type: 'redo' });
    expect((woofer(store.get().designs.a).box as { vb_l: number }).vb_l).toBe(30);
    expect(store.canRedo()).toBe(false);
  });
  it('copies, swaps and resets as undoable steps; settings are not edits', () => {
    const store = new Store(demoPair);
    const { a, b } = store.get().designs;
    store.dispatch({ type: 'swap' });
    expect(store.get().designs.a).toBe(b);
    expect(store.get().designs.b).toBe(a);
    store.dispatch({ type: 'copy-a-to-b' });
    // B takes every setting of A but keeps its own name, so the project's variants stay told apart.
    expect(store.get().designs.b).toEqual({ ...b, name: a.name });
    expect(store.get().designs.b).not.toBe(store.get().designs.a);
    store.dispatch({ type: 'settings', patch: { screen: 'curves' } });
    store.dispatch({ type: 'reset-demo' });
    expect(woofer(store.get().designs.a).box.type).toBe('sealed');
    expect(store.get().settings.screen).toBe('curves');
    store.dispatch({ type: 'undo' });
    store.dispatch({ type: 'undo' });
    store.dispatch({ type: 'undo' });
    expect(store.get().designs.a).toBe(a);
    expect(store.canUndo()).toBe(false);
  });
  it('a value equal to the current one is not an edit', () => {
    const store = new Store(demoPair);
    store.dispatch({ type: 'edit', slot: 'b', path: 'ways.0.box.fb_hz', value: getAt(store.get().designs.b, 'ways.0.box.fb_hz') });
    expect(store.canUndo()).toBe(false);
  });
});

describe('autosave', () => {
  it('writes every change and restores exactly', async () => {
    const backend = memoryBackend();
    const save = new Autosave(backend);
    const store = new Store(demoPair);
    await save.load();
    save.attach(store);
    store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: 17.25 });
    store.dispatch({ type: 'settings', patch: { screen: 'cabinet', theme: 'dark' } });
    await save.flush();
    expect(save.status.kind).toBe('saved');
    const restored = (await new Autosave(backend).load()) as AppState;
    expect(restored).toEqual(store.get());
    expect((woofer(restored.designs.a).box as { vb_l: number }).vb_l).toBe(17.25);
  });
  it('reports storage that is full or unavailable, and keeps going', async () => {
    const quota: StorageBackend = {
      ...memoryBackend(),
      load: async () => undefined,
      save: async () => {
        throw Object.assign(new Error('The quota has been exceeded.'), { name: 'QuotaExceededError' });
      },
    };
    const s1 = new Autosave(quota);
    const store = new Store(demoPair);
    await s1.load();
    s1.attach(store);
    store.dispatch({ type: 'swap' });
    await s1.flush();
    expect(s1.status.kind).toBe('full');
    expect(s1.status.kind === 'full' && s1.status.message).toMatch(/Export/);

    const none: StorageBackend = {
      ...memoryBackend(),
      load: async () => {
        throw new Error('IndexedDB is disabled');
      },
      save: async () => {
        throw new Error('IndexedDB is disabled');
      },
    };
    const s2 = new Autosave(none);
    expect(await s2.load()).toBeUndefined();
    // A read that fails is not taken for an empty store: nothing is written over what may be there.
    expect(s2.status.kind).toBe('unread');
    expect(s2.status.kind === 'unread' && s2.status.message).toMatch(/IndexedDB is disabled.*nothing is saved/);
  });
  it('ignores a saved value of another shape', async () => {
    const backend = memoryBackend({ kind: 'something-else' } as never);
    expect(await new Autosave(backend).load()).toBeUndefined();
  });
});

describe('share links', () => {
  it('round-trips the pair in the fragment', async () => {
    const pair = demoPair();
    pair.a = setAt(pair.a, 'ways.0.box.vb_l', 12.34);
    const frag = await encodeShare(pair);
    expect(hasShare('#' + frag)).toBe(true);
    // Deflate keeps two similar designs well under the ~2 kB that every browser keeps in a URL (common practice, no source).
    expect(frag.length).toBeLessThan(2000);
    expect(frag).toMatch(/^pair=1\.[A-Za-z0-9_-]+$/);
    const back = await decodeShare('#' + frag);
    expect(back.a).toEqual(pair.a);
    expect(back.b).toEqual(pair.b);
    const va = validate(back.a);
    expect(va.ok).toBe(true);
  });
  it('says why a damaged link cannot be read', async () => {
    const frag = await encodeShare(demoPair());
    await expect(decodeShare('#' + frag.slice(0, 40))).rejects.toThrow(/damaged/);
    await expect(decodeShare('#other=1')).rejects.toThrow(/no preheard designs/);
  });
});

describe('design files', () => {
  it('imports a valid file and lists every problem of a broken one', () => {
    const ok = readDesignText(JSON.stringify(demoPair().b), 'b.json');
    expect(ok.ok).toBe(true);
    const a = demoPair().a;
    const broken = { ...a, ways: [{ ...woofer(a), box: { type: 'sealed', vb_l: -1 } }], amplifier: { power_w: 'x', load_ohm: 8 } };
    const r = readDesignText(JSON.stringify(broken), 'broken.json');
    expect(r.ok).toBe(false);
    if (!r.ok) {
      const paths = r.errors.map((e) => e.path);
      expect(paths).toContain('ways[0].box.vb_l');
      expect(paths).toContain('amplifier.power_w');
    }
    const notJson = readDesignText('{"format":', 'x.json');
    expect(notJson.ok === false && notJson.errors[0].message).toMatch(/not valid JSON/);
  });
});

describe('version 1 designs kept by an earlier version of the app', () => {
  // The first version's files on disk: migrated by the engine's parseDesign, independent of the app.
  const v1 = { a: structuredClone(sealedV1), b: structuredClone(ventedV1) };
  const expected = (raw: unknown) => {
    const r = validate(structuredClone(raw));
    if (!r.ok) throw new Error('example is invalid');
    return r.design;
  };

  it('opens a stored version 1 state as version 2', async () => {
    const edited = { ...structuredClone(sealedV1), box: { type: 'sealed', vb_l: 12.5 } };
    const saved = {
      kind: 'preheard-app-state',
      version: 1,
      savedAt: 5,
      state: { designs: { a: edited, b: v1.b }, settings: { screen: 'cabinet' } },
    };
    const save = new Autosave(memoryBackend(saved));
    const state = (await save.load()) as AppState;
    expect(save.status.kind).toBe('saved');
    expect(state.settings.screen).toBe('cabinet');
    expect(state.designs.b).toEqual(expected(v1.b));
    expect(state.designs.b.version).toBe(2);
    expect(state.designs.b.ways.map((w) => w.kind)).toEqual(['driver', 'flat']);
    // The user's own edit is in the woofer way.
    expect(state.designs.a).toEqual(expected(edited));
    expect(woofer(state.designs.a).box).toEqual({ type: 'sealed', vb_l: 12.5 });
  });

  it('sets aside a stored state whose designs no version can read, and restores the last good one', async () => {
    const backend = memoryBackend({
      kind: 'preheard-app-state',
      version: 1,
      savedAt: 1,
      state: { designs: { a: { format: 'preheard-design', version: 1, name: 'no crossover' }, b: v1.b }, settings: {} },
    });
    backend.lastGood = { kind: 'preheard-app-state', version: 1, savedAt: 2, state: { designs: v1, settings: { screen: 'drive' } } };
    const save = new Autosave(backend);
    const state = (await save.load()) as AppState;
    expect(save.status.kind).toBe('recovered');
    expect(state.designs.a).toEqual(expected(v1.a));
    expect(state.settings.screen).toBe('drive');
    expect((backend.aside as { raw: { state: { designs: { a: { name: string } } } } }).raw.state.designs.a.name).toBe('no crossover');
  });

  it('opens a version 1 share link as version 2', async () => {
    const frag = await encodeShare(v1 as never);
    const back = await decodeShare('#' + frag);
    const a = validate(back.a);
    const b = validate(back.b);
    expect(a.ok && a.design).toEqual(expected(v1.a));
    expect(b.ok && b.design.version).toBe(2);
  });

  it('reads a version 1 design file as version 2', () => {
    const r = readDesignText(JSON.stringify(v1.b), 'old.json');
    expect(r.ok && r.design).toEqual(expected(v1.b));
    expect(r.ok && activeFilterOf(woofer(r.design))?.lowpass).toEqual({ shape: 'lr4', hz: 2200 });
  });
});
