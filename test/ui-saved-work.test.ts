// The app never writes over saved work it has not read, never uses a stored state that fails the
// design checks, opens share links without touching storage, and keeps an edit made just before
// the page closes.
import { describe, expect, it } from 'vitest';
import { Autosave, memoryBackend, type SavedState, type StorageBackend } from '../src/ui/persist.ts';
import { Store } from '../src/ui/store.ts';
import { demoPair } from '../src/ui/demo.ts';
import { retryStorage, startStorage } from '../src/ui/startup.ts';
import { SharedView } from '../src/ui/shared-view.ts';
import { connectTabs } from '../src/ui/tabsync.ts';
import { setAt } from '../src/ui/paths.ts';
import type { DesignDoc } from '../src/engine/design/document.ts';
import { pairOf, projectFromPair } from '../src/ui/project.ts';

/** The compared pair of a stored state. */
const savedPair = (v: unknown) => pairOf((v as SavedState).state.project);

/** The woofer box (the first way) of a design, any box kind. */
const boxOf = (d: DesignDoc | undefined) => {
  if (!d) throw new Error('no design');
  return (d.ways[0] as { box: { type: string; vb_l: number } }).box;
};

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** A stored state whose design A has a 23.5 l box: the user's own work. */
function usersWork(): SavedState {
  const designs = demoPair();
  designs.a = { ...setAt(designs.a, 'ways.0.box.vb_l', 23.5), name: 'My own design' };
  return {
    kind: 'preheard-app-state',
    version: 2,
    savedAt: 1000,
    state: { project: projectFromPair(designs), settings: { screen: 'curves', theme: 'auto', cautionsDismissed: true } },
  };
}

describe('a slow or failing start-up read never leads to an overwrite', () => {
  it('a read slower than the wait: nothing written while waiting, then the saved designs come back', async () => {
    const backend = memoryBackend(usersWork());
    const slow: StorageBackend = { ...backend, load: async () => (await sleep(150), backend.load()) };
    const store = new Store(demoPair);
    const autosave = new Autosave(slow);
    await startStorage(store, autosave, 20);
    expect(autosave.status.kind).toBe('waiting');
    // The first-run cautions are dismissed and an edit made, as a user would while waiting.
    store.dispatch({ type: 'settings', patch: { cautionsDismissed: true } });
    store.dispatch({ type: 'edit', slot: 'b', path: 'ways.0.box.vb_l', value: 9 });
    await autosave.flush();
    expect(backend.writes).toBe(0);
    expect(savedPair(backend.value).a.name).toBe('My own design');
    await sleep(250);
    await autosave.flush();
    expect(store.get().designs.a.name).toBe('My own design');
    expect(autosave.status.kind).toBe('saved');
    expect(savedPair(backend.lastGood).a.name).toBe('My own design');
    // The edit made while waiting is one undo away.
    store.dispatch({ type: 'undo' });
    expect(boxOf(store.get().designs.b).vb_l).toBe(9);
  });

  it('a failed read: nothing written, says so; Try again reads and restores', async () => {
    const backend = memoryBackend(usersWork());
    let fail = true;
    const flaky: StorageBackend = {
      ...backend,
      load: async () => {
        if (fail) throw new Error('the database is blocked');
        return backend.load();
      },
    };
    const store = new Store(demoPair);
    const autosave = new Autosave(flaky);
    await startStorage(store, autosave, 20);
    expect(autosave.status.kind).toBe('unread');
    store.dispatch({ type: 'settings', patch: { cautionsDismissed: true } });
    store.dispatch({ type: 'swap' });
    await autosave.flush();
    expect(backend.writes).toBe(0);
    fail = false;
    await retryStorage(store, autosave);
    await autosave.flush();
    expect(store.get().designs.a.name).toBe('My own design');
    expect(autosave.status.kind).toBe('saved');
  });
});

describe('a stored state is validated as a design file before use', () => {
  const cases: [string, (s: SavedState) => void][] = [
    ['variants = [{}, {}]', (s) => ((s.state.project.variants as unknown) = [{}, {}])],
    ['box: {type: "bogus"}', (s) => ((s.state.project.variants[0].design.ways[0] as unknown as { box: unknown }).box = { type: 'bogus' })],
    ['a variant missing', (s) => s.state.project.variants.pop()],
    ['a compared variant unknown', (s) => (s.state.project.compared.b = 'v9')],
    ['a variant not a design', (s) => ((s.state.project.variants[1].design as unknown) = 'vented')],
    ['settings not an object', (s) => ((s.state as unknown as { settings: unknown }).settings = 7)],
  ];
  for (const [name, damage] of cases) {
    it(`${name}: set aside, the last good state restored, no exception`, async () => {
      const good = usersWork();
      const backend = memoryBackend(good);
      backend.lastGood = structuredClone(good);
      const bad = structuredClone(good);
      bad.savedAt = 2000;
      damage(bad);
      backend.value = bad;
      const autosave = new Autosave(backend);
      const state = await autosave.load();
      expect(autosave.status.kind).toBe('recovered');
      expect(state?.designs.a.name).toBe('My own design');
      expect(JSON.parse((await autosave.setAsideText())!).raw).toEqual(bad);
    });
  }

  it('an edit that fails the checks is saved, but never becomes the last good state', async () => {
    const backend = memoryBackend(usersWork());
    backend.lastGood = usersWork();
    const store = new Store(demoPair);
    const autosave = new Autosave(backend);
    store.dispatch({ type: 'restore', state: (await autosave.load())! });
    autosave.attach(store);
    store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.type', value: 'bogus' });
    await autosave.flush();
    expect(boxOf(savedPair(backend.value).a).type).toBe('bogus');
    expect(boxOf(savedPair(backend.lastGood).a).type).toBe(boxOf(savedPair(usersWork()).a).type);
    // Next start: the bad state is set aside and the last good one restored.
    const next = new Autosave(backend);
    expect(boxOf((await next.load())?.designs.a).vb_l).toBe(23.5);
    expect(next.status.kind).toBe('recovered');
  });
});

describe('a share link is a look until the user keeps it', () => {
  it('storage and other tabs are untouched; keep saves; back restores the saved designs', async () => {
    const name = `preheard-share-${Math.random()}`;
    const backend = memoryBackend(usersWork());
    const [s1, s2] = [new Store(demoPair), new Store(demoPair)];
    const [a1, a2] = [new Autosave(backend), new Autosave(backend)];
    for (const [s, a] of [
      [s1, a1],
      [s2, a2],
    ] as const) {
      s.dispatch({ type: 'restore', state: (await a.load())! });
      a.attach(s);
    }
    const [c1, c2] = [new BroadcastChannel(name), new BroadcastChannel(name)];
    const off = [connectTabs(s1, a1, c1 as never, 't1'), connectTabs(s2, a2, c2 as never, 't2')];
    const writes = backend.writes;
    const shared = demoPair();
    shared.a = { ...shared.a, name: 'From a link' };
    const view = new SharedView(s1, a1);
    view.open(projectFromPair(shared));
    s1.dispatch({ type: 'edit', slot: 'b', path: 'ways.0.box.vb_l', value: 11 });
    await a1.flush();
    await sleep(50);
    expect(a1.status.kind).toBe('held');
    expect(backend.writes).toBe(writes);
    expect(s2.get().designs.a.name).toBe('My own design');
    await view.leave();
    await a1.flush();
    expect(s1.get().designs.a.name).toBe('My own design');
    expect(savedPair(backend.value).a.name).toBe('My own design');

    view.open(projectFromPair(shared));
    await view.keep();
    await a1.flush();
    await sleep(50);
    expect(savedPair(backend.value).a.name).toBe('From a link');
    expect(s2.get().designs.a.name).toBe('From a link');
    for (const f of off) f();
  });
});

describe('an edit made just before the page closes', () => {
  it('is caught by the journal when the IndexedDB write does not finish, and restored on the next start', async () => {
    const backend = memoryBackend(usersWork());
    const store = new Store(demoPair);
    const autosave = new Autosave(backend);
    store.dispatch({ type: 'restore', state: (await autosave.load())! });
    // From here on every IndexedDB write is dropped, as when the page is torn down mid-transaction.
    backend.save = () => new Promise(() => undefined);
    autosave.attach(store);
    store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: 31 });
    autosave.flushNow();
    const next = new Autosave(backend);
    expect(boxOf((await next.load())?.designs.a).vb_l).toBe(31);
  });

  it('waits for idle time after its frame before it is written, and is journalled if the page closes first', async () => {
    const backend = memoryBackend(usersWork());
    const store = new Store(demoPair);
    let idle = () => {};
    const autosave = new Autosave(
      backend,
      () => Date.now(),
      () => new Promise<void>((r) => (idle = r)),
    );
    store.dispatch({ type: 'restore', state: (await autosave.load())! });
    autosave.attach(store);
    const writes = backend.writes;
    store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: 31 });
    store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: 32 });
    await sleep(20);
    // Nothing written yet: the edit's redraw goes first; the status says the save is under way.
    expect(backend.writes).toBe(writes);
    expect(autosave.status.kind).toBe('saving');
    autosave.flushNow();
    expect(boxOf(savedPair(backend.journaled).a).vb_l).toBe(32);
    idle();
    await autosave.flush();
    // Both edits in one write, and the journal dropped once IndexedDB holds them.
    expect(backend.writes).toBe(writes + 1);
    expect(boxOf(savedPair(backend.value).a).vb_l).toBe(32);
    expect(backend.journaled).toBeUndefined();
  });

  it('made just before a shared link opens in the same tab, is in the saved designs the user goes back to', async () => {
    const backend = memoryBackend(usersWork());
    const store = new Store(demoPair);
    let idle = () => {};
    const autosave = new Autosave(
      backend,
      () => Date.now(),
      () => new Promise<void>((r) => (idle = r)),
    );
    store.dispatch({ type: 'restore', state: (await autosave.load())! });
    autosave.attach(store);
    store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: 27 });
    const view = new SharedView(store, autosave);
    const shared = demoPair();
    shared.a = { ...shared.a, name: 'From a link' };
    view.open(projectFromPair(shared));
    idle();
    await autosave.flush();
    // The link's designs are never saved; the edit made before it is kept.
    expect(savedPair(backend.value).a.name).toBe('My own design');
    await view.leave();
    expect(boxOf(store.get().designs.a).vb_l).toBe(27);
    idle();
    await autosave.flush();
    expect(boxOf(savedPair(backend.value).a).vb_l).toBe(27);
  });

  it('an older journal does not win over a newer stored state', async () => {
    const backend = memoryBackend(usersWork());
    backend.journaled = { ...usersWork(), savedAt: 10 };
    (backend.journaled as SavedState).state.project.variants[0].design.name = 'stale';
    const autosave = new Autosave(backend);
    expect((await autosave.load())?.designs.a.name).toBe('My own design');
    expect(backend.journaled).toBeUndefined();
  });

  it('a stale journal left by a closed tab does not pass for the latest work when the stored state is damaged', async () => {
    const backend = memoryBackend({ kind: 'preheard-app-state', version: 1, state: 'scrambled' });
    backend.lastGood = usersWork();
    backend.journaled = { ...usersWork(), savedAt: 10 };
    (backend.journaled as SavedState).state.project.variants[0].design.name = 'stale';
    const autosave = new Autosave(backend);
    expect((await autosave.load())?.designs.a.name).toBe('My own design');
    expect(JSON.stringify(backend.aside)).toContain('scrambled');
    expect(backend.journaled).toBeUndefined();
  });

  it('a journal newer than the last good copy is what a damaged store gives way to', async () => {
    const backend = memoryBackend({ kind: 'preheard-app-state', version: 2, state: 'scrambled' });
    backend.lastGood = usersWork();
    backend.journaled = { ...usersWork(), savedAt: 5000 };
    (backend.journaled as SavedState).state.project.variants[0].design.name = 'caught at close';
    const autosave = new Autosave(backend);
    expect((await autosave.load())?.designs.a.name).toBe('caught at close');
    expect(backend.aside).toBeDefined();
  });
});
