// @vitest-environment happy-dom
// A project link opened in the page: read all or nothing, shown as a look (storage untouched), and
// kept only on request, next to the user's own variants (nothing of theirs replaced).
import { describe, expect, it, vi } from 'vitest';
import { openShareFromLocation, type TransferDeps } from '../src/ui/app/transfer.ts';
import { encodeProjectShare } from '../src/ui/share.ts';
import { demoPair } from '../src/ui/demo.ts';
import { addVariant, projectFromPair, type Project } from '../src/ui/project.ts';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend, type SavedState } from '../src/ui/persist.ts';
import { SharedView } from '../src/ui/shared-view.ts';
import type { ProblemReport } from '../src/ui/app/dialogs.tsx';

function sharedProject(): Project {
  const pair = demoPair();
  const copy = <T>(x: T): T => structuredClone(x);
  let p = projectFromPair({ a: { ...copy(pair.a), name: 'Shared small' }, b: { ...copy(pair.b), name: 'Shared vented' } }, 'Client job');
  p = addVariant(p, { ...copy(pair.a), name: 'Shared third' }, null);
  return addVariant(p, { ...copy(pair.b), name: 'Shared fourth' }, null);
}

function deps(store: Store) {
  const opened: Project[] = [];
  const problems: ProblemReport[] = [];
  const d = {
    store,
    derived: {} as TransferDeps['derived'],
    notify: vi.fn(),
    showProblems: (r: ProblemReport) => problems.push(r),
    openShared: (p: Project) => void opened.push(p),
    confirm: async () => true,
  } satisfies TransferDeps;
  return { d, opened, problems };
}

describe('a project link in the address', () => {
  it('opens every variant as a look, clears the address, and is kept next to the user’s own work', async () => {
    const mine = demoPair();
    mine.a = { ...mine.a, name: 'My own design' };
    const saved: SavedState = {
      kind: 'preheard-app-state',
      version: 2,
      savedAt: 1000,
      state: { project: projectFromPair(mine, 'My project'), settings: { screen: 'curves', theme: 'auto', cautionsDismissed: true } },
    };
    const backend = memoryBackend(saved);
    const store = new Store(demoPair);
    const autosave = new Autosave(backend);
    store.dispatch({ type: 'restore', state: (await autosave.load())! });
    autosave.attach(store);
    const view = new SharedView(store, autosave);
    const { d, opened, problems } = deps(store);
    d.openShared = (p: Project) => {
      opened.push(p);
      view.open(p);
    };
    history.replaceState(null, '', `/#${await encodeProjectShare(sharedProject())}`);
    await openShareFromLocation(d);
    expect(problems).toEqual([]);
    expect(location.hash).toBe('');
    expect(opened).toHaveLength(1);
    expect(opened[0].variants.map((v) => v.design.name)).toEqual(['Shared small', 'Shared vented', 'Shared third', 'Shared fourth']);
    const writes = backend.writes;
    await autosave.flush();
    expect(backend.writes).toBe(writes);
    expect((backend.value as SavedState).state.project.variants.map((v) => v.design.name)).toEqual(['My own design', mine.b.name]);

    await view.keep();
    await autosave.flush();
    const kept = (backend.value as SavedState).state.project;
    expect(kept.name).toBe('My project');
    expect(kept.variants.map((v) => v.design.name)).toEqual([
      'My own design',
      mine.b.name,
      'Shared small',
      'Shared vented',
      'Shared third',
      'Shared fourth',
    ]);
  });

  it('with a broken variant loads nothing and names the variant', async () => {
    const bad = sharedProject();
    const w = bad.variants[2].design.ways[0];
    if (w.kind === 'driver') w.driver = { ...w.driver, re_ohm: -4 };
    const store = new Store(demoPair);
    const before = store.get().project;
    const { d, opened, problems } = deps(store);
    history.replaceState(null, '', `/#${await encodeProjectShare(bad)}`);
    await openShareFromLocation(d);
    expect(opened).toEqual([]);
    expect(problems).toHaveLength(1);
    expect(problems[0].title).toBe('The shared link has problems');
    expect(problems[0].groups[0].errors[0].message).toMatch(/^variant 3 \(“Shared third”\): /);
    expect(store.get().project).toBe(before);
  });

  it('cut short gives one readable message', async () => {
    const store = new Store(demoPair);
    const { d, opened, problems } = deps(store);
    const frag = await encodeProjectShare(sharedProject());
    history.replaceState(null, '', `/#${frag.slice(0, frag.length >> 1)}`);
    await openShareFromLocation(d);
    expect(opened).toEqual([]);
    expect(problems[0].title).toBe('The shared link cannot be read');
    expect(problems[0].groups[0].errors[0].message).toMatch(/the link is damaged/);
  });
});
