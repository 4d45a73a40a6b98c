// The driver shelf on the Driver sheet: save the shown way's driver, put a shelf driver into the
// shown way of A or B (one undoable step), export and import the whole shelf as one file.
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
  readShelfFile,
  SHELF_FILE_NAME,
  shelfFileText,
  type ShelfBackend,
  type ShelfEntry,
} from '../shelf.ts';
import { SLOT_LABEL, type Slot } from '../store.ts';

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
        </span>
      </div>
    </Group>
  );
}
