// The driver shelf on the Driver sheet: save the shown way's driver, put a shelf driver into the
// shown way of A or B (one undoable step), rename and delete the user's own drivers (a delete asks
// first and can be undone), export and import the whole shelf as one file.
import { useEffect, useState } from 'preact/hooks';
import { useApp } from '../context.ts';
import { Group, Row } from './Sheet.tsx';
import { useShownWays } from './WayPicker.tsx';
import { downloadText } from '../files.ts';
import {
  defaultShelf,
  freeName,
  importInto,
  inventedDrivers,
  MAX_SHELF_NAME,
  removeEntry,
  renameEntry,
  restoreEntry,
  readShelfFile,
  SHELF_FILE_NAME,
  shelfFileText,
  type ShelfBackend,
  type ShelfEntry,
} from '../shelf.ts';
import { SLOT_LABEL, type Slot } from '../store.ts';
import { ConfirmDialog } from '../app/dialogs.tsx';

let shared: ShelfBackend | null = null;
/** One shelf for the page. */
const shelf = () => (shared ??= defaultShelf());

/** Largest shelf file read. */
const MAX_SHELF_FILE_BYTES = 4 << 20;

export function DriverShelf() {
  const { state, dispatch } = useApp();
  const shown = useShownWays();
  const [own, setOwn] = useState<ShelfEntry[]>([]);
  const [picked, setPicked] = useState<Record<Slot, string>>({ a: '', b: '' });
  const [note, setNote] = useState<string | null>(null);
  const [renaming, setRenaming] = useState<{ from: string; text: string } | null>(null);
  const [asking, setAsking] = useState<ShelfEntry | null>(null);
  /** The driver just deleted, while its undo is offered. */
  const [deleted, setDeleted] = useState<ShelfEntry | null>(null);
  const refresh = () =>
    shelf()
      .list()
      .then((list) => setOwn(list.sort((x, y) => x.name.localeCompare(y.name))))
      .catch((e: unknown) => setNote(`the shelf cannot be read: ${e instanceof Error ? e.message : String(e)}`));
  useEffect(() => {
    void refresh();
  }, []);
  const all = [...own, ...inventedDrivers()];

  const save = async (s: Slot) => {
    const way = shown[s].way;
    if (way.kind !== 'driver') return;
    const name = freeName(
      way.driver.name ?? way.name ?? 'driver',
      all.map((e) => e.name),
    );
    try {
      await shelf().put({ name, savedAt: Date.now(), driver: structuredClone(way.driver) });
      setNote(`saved "${name}" on the shelf`);
      await refresh();
    } catch (e) {
      setNote(`could not save on the shelf: ${e instanceof Error ? e.message : String(e)}`);
    }
  };
  const put = (s: Slot) => {
    const entry = all.find((e) => e.name === picked[s]);
    const index = shown[s].index;
    if (!entry) return;
    const design = state.designs[s];
    const ways = design.ways.map((w, i) => (i === index && w.kind === 'driver' ? { ...w, driver: structuredClone(entry.driver) } : w));
    dispatch({ type: 'replace', slot: s, design: { ...design, ways }, reason: `put ${entry.name} from the shelf into ${SLOT_LABEL[s]}` });
    setNote(`put "${entry.name}" into ${SLOT_LABEL[s]}`);
  };
  const failed = (what: string) => (e: unknown) => setNote(`${what}: ${e instanceof Error ? e.message : String(e)}`);
  const rename = async () => {
    if (!renaming) return;
    const r = await renameEntry(shelf(), renaming.from, renaming.text).catch(failed('could not rename on the shelf'));
    if (!r) return;
    if (!r.ok) return setNote(r.message);
    setRenaming(null);
    setNote(r.name === renaming.from ? null : `renamed "${renaming.from}" to "${r.name}"`);
    // A pick of the old name follows the driver.
    setPicked({ a: picked.a === renaming.from ? r.name : picked.a, b: picked.b === renaming.from ? r.name : picked.b });
    await refresh();
  };
  const remove = async (entry: ShelfEntry) => {
    setAsking(null);
    const gone = await removeEntry(shelf(), entry.name).catch(failed('could not delete from the shelf'));
    if (gone === undefined) return;
    setDeleted(gone);
    setNote(gone ? `deleted "${gone.name}" from the shelf` : `"${entry.name}" was no longer on the shelf`);
    setPicked({ a: picked.a === entry.name ? '' : picked.a, b: picked.b === entry.name ? '' : picked.b });
    await refresh();
  };
  const undoDelete = async () => {
    if (!deleted) return;
    const name = await restoreEntry(shelf(), deleted).catch(failed('could not put the driver back'));
    if (name === undefined) return;
    setDeleted(null);
    setNote(name === deleted.name ? `"${name}" is back on the shelf` : `"${deleted.name}" is back on the shelf as "${name}"`);
    await refresh();
  };
  const exportShelf = () => downloadText(shelfFileText(own), SHELF_FILE_NAME);
  const importShelf = async (e: Event) => {
    const input = e.currentTarget as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    if (file.size > MAX_SHELF_FILE_BYTES) return setNote(`${file.name} is larger than 4 MiB, too large for a driver shelf`);
    const r = readShelfFile(await file.text());
    if (!r.ok) return setNote(`${file.name}: ${r.message}; nothing was added`);
    try {
      const added = await importInto(shelf(), r.entries);
      setNote(`${file.name}: ${added} driver${added === 1 ? '' : 's'} added to the shelf`);
      await refresh();
    } catch (err) {
      setNote(`could not add to the shelf: ${err instanceof Error ? err.message : String(err)}`);
    }
  };

  return (
    <Group title="Driver shelf" note="your drivers, kept in this browser">
      <Row
        label="From the shelf"
        hint="into the way shown"
        cell={(s) =>
          shown[s].way.kind === 'driver' ? (
            <span class="shelf-pick">
              <select
                aria-label={`Shelf driver for ${SLOT_LABEL[s]}`}
                value={picked[s]}
                onChange={(e) => setPicked({ ...picked, [s]: e.currentTarget.value })}
              >
                <option value="">choose a driver…</option>
                {all.map((e) => (
                  <option value={e.name} key={e.name}>
                    {e.invented ? `${e.name} — invented demo driver` : e.name}
                  </option>
                ))}
              </select>
              <button type="button" disabled={!picked[s]} onClick={() => put(s)}>
                Put in {SLOT_LABEL[s]}
              </button>
            </span>
          ) : null
        }
      />
      <Row
        label="To the shelf"
        cell={(s) =>
          shown[s].way.kind === 'driver' ? (
            <button type="button" onClick={() => void save(s)}>
              Save {SLOT_LABEL[s]}'s driver
            </button>
          ) : null
        }
      />
      {own.length ? (
        <div class="sheet-fold" role="row">
          <span role="cell">
            <details class="shelf-own" data-testid="shelf-own">
              <summary>Your drivers ({own.length}): rename or delete</summary>
              <ul class="shelf-list">
                {own.map((e) => (
                  <li key={e.name} data-name={e.name}>
                    {renaming?.from === e.name ? (
                      <form
                        class="shelf-rename"
                        onSubmit={(ev) => {
                          ev.preventDefault();
                          void rename();
                        }}
                      >
                        <input
                          type="text"
                          value={renaming.text}
                          maxLength={MAX_SHELF_NAME + 1}
                          aria-label={`New name for ${e.name}`}
                          onInput={(ev) => setRenaming({ from: e.name, text: ev.currentTarget.value })}
                          onKeyDown={(ev) => ev.key === 'Escape' && (ev.preventDefault(), setRenaming(null))}
                        />
                        <button type="submit">Save the name</button>
                        <button type="button" onClick={() => setRenaming(null)}>
                          Cancel
                        </button>
                      </form>
                    ) : (
                      <>
                        <span class="shelf-name">{e.name}</span>
                        <button
                          type="button"
                          class="small"
                          aria-label={`Rename ${e.name}`}
                          onClick={() => setRenaming({ from: e.name, text: e.name })}
                        >
                          Rename
                        </button>
                        <button type="button" class="small danger" aria-label={`Delete ${e.name}`} onClick={() => setAsking(e)}>
                          Delete
                        </button>
                      </>
                    )}
                  </li>
                ))}
              </ul>
            </details>
          </span>
        </div>
      ) : null}
      {asking ? (
        <ConfirmDialog
          question={{
            title: 'Delete a driver from the shelf?',
            text: `"${asking.name}" leaves the shelf of this browser. Designs that use it keep their own copy, and the shelf offers an undo right after.`,
            action: 'Delete it',
          }}
          onAnswer={(yes) => (yes ? void remove(asking) : setAsking(null))}
        />
      ) : null}
      <div class="sheet-fold" role="row">
        <span role="cell" class="shelf-actions">
          <button type="button" onClick={exportShelf} disabled={own.length === 0}>
            Export the shelf
          </button>
          <label class="file-button">
            Import a shelf
            <input type="file" accept=".json,application/json" onChange={(e) => void importShelf(e)} aria-label="Import a shelf file" />
          </label>
          {note ? (
            <span class="group-note" role="status" data-testid="shelf-note">
              {note}
            </span>
          ) : null}
          {deleted ? (
            <button type="button" class="small" onClick={() => void undoDelete()} data-testid="shelf-undo">
              Undo the delete
            </button>
          ) : null}
        </span>
      </div>
    </Group>
  );
}
