// The way each design's Driver sheet and Cabinet show, and the rows that pick, add, remove, rename
// and copy ways. The choice is kept in the settings, so both screens show the same way.
import { useApp } from '../context.ts';
import { SLOT_LABEL, SLOTS, type Slot } from '../store.ts';
import { addWay, canAddWay, canRemoveWay, clampWay, copyWayInto, MAX_WAYS, NEW_WAY_LABEL, removeWay, type NewWayKind } from '../ways.ts';
import type { WayDoc } from '../../engine/design/document.ts';
import { Row, TextField } from './Sheet.tsx';

/** The index of the way shown for each design. */
export function useWayIndex(): Record<Slot, number> {
  const { state } = useApp();
  const chosen = state.settings.way ?? {};
  return { a: clampWay(state.designs.a, chosen.a), b: clampWay(state.designs.b, chosen.b) };
}

/** The way shown for each design, its index and its field path ("ways.1"). */
export function useShownWays(): Record<Slot, { index: number; way: WayDoc; path: string }> {
  const { state } = useApp();
  const idx = useWayIndex();
  const of = (s: Slot) => ({ index: idx[s], way: state.designs[s].ways[idx[s]], path: `ways.${idx[s]}` });
  return { a: of('a'), b: of('b') };
}

const other = (s: Slot): Slot => (s === 'a' ? 'b' : 'a');

function WayControls(p: { slot: Slot }) {
  const { state, dispatch, store, confirm } = useApp();
  const idx = useWayIndex();
  const doc = state.designs[p.slot];
  const index = idx[p.slot];
  const label = SLOT_LABEL[p.slot];
  const to = other(p.slot);
  const select = (slot: Slot, i: number) =>
    dispatch({ type: 'settings', patch: { way: { ...idx, ...store.get().settings.way, [slot]: i } } });
  const add = (kind: NewWayKind) => {
    const cur = store.get().designs[p.slot];
    const next = addWay(cur, kind);
    if (next === cur) return;
    dispatch({ type: 'replace', slot: p.slot, design: next, reason: `add a ${kind} way to ${label}` });
    select(p.slot, next.ways.length - 1);
  };
  const remove = async () => {
    const name = store.get().designs[p.slot].ways[index].name;
    const ok = confirm
      ? await confirm({
          title: 'Remove this way?',
          text: `The way “${name}” of design ${label} goes, with its driver, box and filter. Undo brings it back.`,
          action: 'Remove the way',
        })
      : true;
    if (!ok) return;
    const cur = store.get().designs[p.slot];
    dispatch({ type: 'replace', slot: p.slot, design: removeWay(cur, index), reason: `remove way “${name}” from ${label}` });
    select(p.slot, Math.max(0, index - 1));
  };
  const copy = () => {
    const way = store.get().designs[p.slot].ways[index];
    const done = copyWayInto(store.get().designs[to], way);
    if (!done) return;
    dispatch({ type: 'replace', slot: to, design: done.doc, reason: `copy way “${way.name}” from ${label} to ${SLOT_LABEL[to]}` });
    select(to, done.index);
  };
  const target = state.designs[to];
  const copyable = copyWayInto(target, doc.ways[index]) !== null;
  return (
    <div class="way-controls">
      <select
        aria-label={`Way, design ${label}`}
        data-testid={`way-pick-${p.slot}`}
        value={String(index)}
        onChange={(e) => select(p.slot, Number((e.currentTarget as HTMLSelectElement).value))}
      >
        {doc.ways.map((w, i) => (
          <option value={String(i)}>
            {w.name || `way ${i + 1}`}
            {w.kind === 'flat' ? ' (flat band)' : ''}
          </option>
        ))}
      </select>
      <select
        aria-label={`Add a way to design ${label}`}
        data-testid={`way-add-${p.slot}`}
        value=""
        disabled={!canAddWay(doc)}
        title={canAddWay(doc) ? undefined : `A design has at most ${MAX_WAYS} ways`}
        onChange={(e) => {
          const v = (e.currentTarget as HTMLSelectElement).value as NewWayKind | '';
          (e.currentTarget as HTMLSelectElement).value = '';
          if (v) add(v);
        }}
      >
        <option value="">Add way…</option>
        {(Object.keys(NEW_WAY_LABEL) as NewWayKind[]).map((k) => (
          <option value={k}>{NEW_WAY_LABEL[k]}</option>
        ))}
      </select>
      <button
        type="button"
        class="small"
        disabled={!canRemoveWay(doc, index)}
        title={canRemoveWay(doc, index) ? undefined : 'A design keeps at least one way with a driver'}
        aria-label={`Remove way ${doc.ways[index].name} from design ${label}`}
        onClick={() => void remove()}
      >
        Remove
      </button>
      <button
        type="button"
        class="small"
        disabled={!copyable}
        title={
          copyable
            ? `Replaces the way of the same name in ${SLOT_LABEL[to]}, or adds it`
            : `Design ${SLOT_LABEL[to]} has no room for another way`
        }
        aria-label={`Copy to ${SLOT_LABEL[to]}: way ${doc.ways[index].name} from design ${label} to design ${SLOT_LABEL[to]}`}
        data-testid={`way-copy-${p.slot}`}
        onClick={copy}
      >
        Copy to {SLOT_LABEL[to]}
      </button>
    </div>
  );
}

/** The way rows at the top of a per-way sheet: which way, and its name. */
export function WayRows() {
  const shown = useShownWays();
  return (
    <>
      <Row label="Way" hint={`up to ${MAX_WAYS} per design`} cell={(s) => <WayControls slot={s} />} />
      <Row label="Way name" cell={(s) => <TextField slot={s} path={`${shown[s].path}.name`} label="Way name" />} />
    </>
  );
}

/** True when some design's shown way is of this kind (a group of rows is drawn only then). */
export function anyShown(shown: ReturnType<typeof useShownWays>, kind: WayDoc['kind']): boolean {
  return SLOTS.some((s) => shown[s].way.kind === kind);
}
