// Projects: any number of variants, two compared, one planned level shared on request, one file for
// the whole project, and every older form (a lone design, an A/B pair) opened without loss.
import { describe, expect, it } from 'vitest';
import sealedV1 from '../public/examples/living-room-sealed.json';
import ventedV1 from '../public/examples/living-room-vented.json';
import { parseDesign } from '../src/engine/design/validate.ts';
import type { DesignDoc } from '../src/engine/design/document.ts';
import { demoPair } from '../src/ui/demo.ts';
import { Autosave, memoryBackend, type SavedState } from '../src/ui/persist.ts';
import { MAX_VARIANTS, pairOf, projectFileText, projectFromPair, readProject } from '../src/ui/project.ts';
import { Store } from '../src/ui/store.ts';

/** What parseDesign makes of a document: the migration is the engine's, independent of the project code. */
const parsed = (raw: unknown): DesignDoc => {
  const r = parseDesign(structuredClone(raw));
  if (!r.ok) throw new Error('example is invalid');
  return r.design;
};

/** A store holding a project of four variants: the demo pair and two copies of A. */
function fourVariants(): Store {
  const store = new Store(demoPair);
  store.dispatch({ type: 'duplicate-variant', id: 'v1' });
  store.dispatch({ type: 'duplicate-variant', id: 'v1' });
  return store;
}

describe('a project of many variants', () => {
  it('adds, names apart, compares any two, and removes', () => {
    const store = fourVariants();
    const p = store.get().project;
    expect(p.variants).toHaveLength(4);
    const names = p.variants.map((v) => v.design.name);
    expect(new Set(names).size).toBe(4);
    expect(names[1]).toBe(`${names[0]} (3)`);
    expect(names[2]).toBe(`${names[0]} (2)`);
    store.dispatch({ type: 'compare', slot: 'b', id: p.variants[2].id });
    expect(store.get().designs.b).toBe(p.variants[2].design);
    // An edit through slot B reaches the variant compared there, and only it.
    store.dispatch({ type: 'edit', slot: 'b', path: 'ways.0.box.vb_l', value: 19 });
    const after = store.get().project.variants;
    expect((after[2].design.ways[0] as { box: { vb_l: number } }).box.vb_l).toBe(19);
    expect(after[0].design).toBe(p.variants[0].design);
    // Removing the variant compared as B hands B to another variant; undo brings it back.
    store.dispatch({ type: 'remove-variant', id: p.variants[2].id });
    expect(store.get().project.variants).toHaveLength(3);
    expect(store.get().project.variants.some((v) => v.id === store.get().project.compared.b)).toBe(true);
    store.dispatch({ type: 'undo' });
    expect(store.get().project.variants).toHaveLength(4);
    expect(store.get().project.compared.b).toBe(p.variants[2].id);
    // The last variant is never removed.
    for (const v of store.get().project.variants) store.dispatch({ type: 'remove-variant', id: v.id });
    expect(store.get().project.variants).toHaveLength(1);
  });

  it('one planned level shared: turning it on gives every variant A’s level, and an edit reaches all', () => {
    const store = fourVariants();
    store.dispatch({ type: 'compare', slot: 'a', id: 'v2' });
    const levelOfA = store.get().designs.a.listening.level;
    store.dispatch({ type: 'share-level', shared: true });
    for (const v of store.get().project.variants) expect(v.design.listening.level).toEqual(levelOfA);
    store.dispatch({ type: 'edit', slot: 'b', path: 'listening.level.spl_db', value: 97 });
    for (const v of store.get().project.variants) expect(v.design.listening.level).toEqual({ mode: 'spl', spl_db: 97 });
    // Other listening fields stay each variant's own.
    store.dispatch({ type: 'edit', slot: 'b', path: 'listening.distance_m', value: 2.5 });
    expect(store.get().project.variants.filter((v) => v.design.listening.distance_m === 2.5)).toHaveLength(1);
    // Apart again: an edit of one level stays in its variant.
    store.dispatch({ type: 'share-level', shared: false });
    store.dispatch({ type: 'edit', slot: 'a', path: 'listening.level.spl_db', value: 88 });
    expect(
      store
        .get()
        .project.variants.map((v) => (v.design.listening.level as { spl_db: number }).spl_db)
        .sort(),
    ).toEqual([88, 97, 97, 97]);
  });
});

describe('the project file', () => {
  it('saves and opens four variants with their comparison and shared level unchanged', () => {
    const store = fourVariants();
    store.dispatch({ type: 'share-level', shared: true });
    store.dispatch({ type: 'compare', slot: 'b', id: 'v4' });
    store.dispatch({ type: 'rename-project', name: 'Okafor shelf' });
    const text = projectFileText(store.get().project);
    const r = readProject(JSON.parse(text));
    expect(r.ok && r.kind).toBe('project');
    if (!r.ok) return;
    expect(r.project).toEqual(store.get().project);
  });

  it('refuses the whole file when one variant fails the design checks, naming that variant', () => {
    const p = JSON.parse(projectFileText(projectFromPair(demoPair()))) as { variants: { design: Record<string, unknown> }[] };
    p.variants[1].design.ways = [];
    const r = readProject(p);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.length).toBeGreaterThan(0);
    expect(r.errors.every((e) => e.path.startsWith('variants.1'))).toBe(true);
    expect(r.errors[0].message).toMatch(/^variant 2 \(“/);
  });

  it.each([
    ['not an object', 'a project', /no project or design/],
    [
      'no variants',
      { format: 'preheard-project', version: 1, name: 'x', variants: [], compared: { a: 'v1', b: 'v1' } },
      /at least one variant/,
    ],
    [
      'too many variants',
      { format: 'preheard-project', version: 1, name: 'x', variants: Array(MAX_VARIANTS + 1).fill({}), compared: {} },
      /at most 64/,
    ],
    ['a later version', { format: 'preheard-project', version: 9, name: 'x', variants: [], compared: {} }, /version 9/],
  ])('%s: one clear message', (_name, raw, message) => {
    const r = readProject(raw);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => e.message).join(' ')).toMatch(message);
  });

  it('compared ids must name variants, and ids must be distinct', () => {
    const p = JSON.parse(projectFileText(projectFromPair(demoPair())));
    p.compared.b = 'v7';
    p.variants[1].id = 'v1';
    const r = readProject(p);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => e.path)).toEqual(expect.arrayContaining(['variants.1.id', 'compared.b']));
  });
});

describe('older forms open as a project without loss', () => {
  it('a version 1 design file: one variant, compared in both slots, the design as parseDesign migrates it', () => {
    const r = readProject(structuredClone(ventedV1));
    expect(r.ok && r.kind).toBe('design');
    if (!r.ok) return;
    expect(r.project.variants).toHaveLength(1);
    expect(pairOf(r.project).a).toEqual(parsed(ventedV1));
    expect(pairOf(r.project).b).toBe(pairOf(r.project).a);
  });

  it('an A/B pair stored by the first versions of the app: two variants, A and B as they were', async () => {
    const saved = { kind: 'preheard-app-state', version: 1, savedAt: 3, state: { designs: { a: sealedV1, b: ventedV1 }, settings: {} } };
    const backend = memoryBackend(saved);
    const autosave = new Autosave(backend);
    const state = await autosave.load();
    expect(state?.project.variants.map((v) => v.design)).toEqual([parsed(sealedV1), parsed(ventedV1)]);
    expect(state?.designs).toEqual({ a: parsed(sealedV1), b: parsed(ventedV1) });
    // Saved again as a project (version 2 of the stored state), never as a pair.
    const store = new Store(demoPair, state);
    autosave.attach(store);
    store.dispatch({ type: 'duplicate-variant', id: 'v2' });
    await autosave.flush();
    const written = backend.value as SavedState;
    expect(written.version).toBe(2);
    expect(written.state.project.variants).toHaveLength(3);
    const again = await new Autosave(backend).load();
    if (!again) throw new Error('the project was not read back');
    expect(again.project.variants.map((v) => v.design.name)).toEqual(written.state.project.variants.map((v) => v.design.name));
  });
});
