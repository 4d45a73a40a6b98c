// The driver shelf: the user's own drivers kept in the browser (IndexedDB), saved from any way and
// put into any way of A or B, exported and imported as one file. The demo drivers sit on it too,
// marked invented; they are built in and never stored. Nothing on the shelf is overwritten: a name
// already taken gets a number.
import * as v from 'valibot';
import { openDB, type IDBPDatabase } from 'idb';
import { driverSchema } from '../engine/design/schema.ts';
import { schemaIssue } from '../engine/design/validate.ts';
import type { DesignDoc, DriverDoc } from '../engine/design/document.ts';
import { demoPair } from './demo.ts';

export interface ShelfEntry {
  name: string;
  savedAt: number;
  driver: DriverDoc;
  /** A demo driver: an invented part, not a real product. */
  invented?: boolean;
}

export interface ShelfBackend {
  list(): Promise<ShelfEntry[]>;
  put(entry: ShelfEntry): Promise<void>;
  remove(name: string): Promise<void>;
}

export const SHELF_FORMAT = 'preheard-driver-shelf';
export const SHELF_FILE_NAME = 'driver-shelf.preheard.json';
/** More drivers than anyone keeps; a longer file is refused rather than read. */
export const MAX_SHELF_ENTRIES = 2000;

export function indexedDbShelf(): ShelfBackend {
  let db: Promise<IDBPDatabase> | null = null;
  const open = () => {
    if (typeof indexedDB === 'undefined') return Promise.reject(new Error('this browser offers no IndexedDB'));
    db ??= openDB('preheard-shelf', 1, {
      upgrade(d) {
        d.createObjectStore('drivers', { keyPath: 'name' });
      },
    });
    db.catch(() => (db = null));
    return db;
  };
  return {
    async list() {
      return (await open()).getAll('drivers');
    },
    async put(entry) {
      await (await open()).put('drivers', entry);
    },
    async remove(name) {
      await (await open()).delete('drivers', name);
    },
  };
}

export function memoryShelf(initial: ShelfEntry[] = []): ShelfBackend {
  const items = new Map(initial.map((e) => [e.name, structuredClone(e)]));
  return {
    list: async () => [...items.values()].map((e) => structuredClone(e)),
    put: async (e) => void items.set(e.name, structuredClone(e)),
    remove: async (name) => void items.delete(name),
  };
}

/** The browser's shelf, or one in memory where the browser keeps none (tests, private modes). */
export const defaultShelf = (): ShelfBackend => (typeof indexedDB === 'undefined' ? memoryShelf() : indexedDbShelf());

/** The demo designs' drivers, marked invented. */
export function inventedDrivers(): ShelfEntry[] {
  const seen = new Map<string, ShelfEntry>();
  for (const d of Object.values(demoPair()) as DesignDoc[])
    for (const w of d.ways)
      if (w.kind === 'driver') {
        const name = w.driver.name ?? w.name ?? 'demo driver';
        if (!seen.has(name)) seen.set(name, { name, savedAt: 0, driver: structuredClone(w.driver), invented: true });
      }
  return [...seen.values()];
}

/** `name`, or `name (2)`, `name (3)`… whichever is free. */
export function freeName(name: string, taken: Iterable<string>): string {
  const used = new Set(taken);
  const base = name.trim() || 'driver';
  if (!used.has(base)) return base;
  for (let i = 2; ; i++) if (!used.has(`${base} (${i})`)) return `${base} (${i})`;
}

export function shelfFileText(entries: ShelfEntry[]): string {
  const drivers = entries
    .filter((e) => !e.invented)
    .map((e) => ({ name: e.name, saved_at: new Date(e.savedAt).toISOString(), driver: e.driver }));
  return `${JSON.stringify({ format: SHELF_FORMAT, version: 1, drivers }, null, 2)}\n`;
}

export type ShelfRead = { ok: true; entries: ShelfEntry[] } | { ok: false; message: string };

const entrySchema = v.object({
  name: v.pipe(v.string(), v.minLength(1), v.maxLength(200)),
  saved_at: v.optional(v.string()),
  driver: driverSchema,
});

/** Reads a shelf file: every driver checked; one bad entry refuses the file, naming it. */
export function readShelfFile(text: string): ShelfRead {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    return { ok: false, message: 'the file is not JSON, so it is not a driver shelf' };
  }
  const obj = json as { format?: unknown; version?: unknown; drivers?: unknown } | null;
  if (typeof obj !== 'object' || obj === null || obj.format !== SHELF_FORMAT)
    return { ok: false, message: 'the file is not a preheard driver shelf' };
  if (obj.version !== 1) return { ok: false, message: `the shelf file's version ${String(obj.version)} is not one this app reads (1)` };
  if (!Array.isArray(obj.drivers)) return { ok: false, message: 'the shelf file has no list of drivers' };
  if (obj.drivers.length > MAX_SHELF_ENTRIES) return { ok: false, message: `the shelf file has more than ${MAX_SHELF_ENTRIES} drivers` };
  const entries: ShelfEntry[] = [];
  for (let i = 0; i < obj.drivers.length; i++) {
    const r = v.safeParse(entrySchema, obj.drivers[i], { abortEarly: false });
    if (!r.success) {
      const first = schemaIssue(r.issues[0]);
      const name = (obj.drivers[i] as { name?: unknown } | null)?.name;
      return {
        ok: false,
        message: `driver ${i + 1}${typeof name === 'string' ? ` ("${name.slice(0, 60)}")` : ''}: ${first.path || 'entry'} ${first.message}`,
      };
    }
    const when = r.output.saved_at ? Date.parse(r.output.saved_at) : Number.NaN;
    entries.push({ name: r.output.name, savedAt: Number.isFinite(when) ? when : Date.now(), driver: r.output.driver as DriverDoc });
  }
  return { ok: true, entries };
}

/**
 * Adds imported entries to a shelf: the same name with the same driver is skipped, a different
 * driver under a taken name gets a numbered name. Returns how many were added.
 */
export async function importInto(shelf: ShelfBackend, incoming: ShelfEntry[]): Promise<number> {
  const have = await shelf.list();
  const names = new Set([...have.map((e) => e.name), ...inventedDrivers().map((e) => e.name)]);
  let added = 0;
  for (const e of incoming) {
    const same = have.find((h) => h.name === e.name && JSON.stringify(h.driver) === JSON.stringify(e.driver));
    if (same) continue;
    const name = freeName(e.name, names);
    names.add(name);
    await shelf.put({ ...e, name, invented: undefined });
    added++;
  }
  return added;
}

/** Longest name a shelf driver takes (as the shelf file allows). */
export const MAX_SHELF_NAME = 200;

/** Why `name` cannot name a shelf driver (empty, too long, or taken), or null when it can. */
export function nameProblem(name: string, taken: Iterable<string>): string | null {
  const n = name.trim();
  if (!n) return 'a driver on the shelf needs a name';
  if (n.length > MAX_SHELF_NAME) return `a name of at most ${MAX_SHELF_NAME} characters, please (this one has ${n.length})`;
  for (const t of taken) if (t === n) return `"${n.slice(0, 60)}" is already on the shelf: choose another name`;
  return null;
}

export type ShelfChange = { ok: true; name: string } | { ok: false; message: string };

/** Renames a driver of the user's (never an invented one): the new name must be free; nothing is overwritten. */
export async function renameEntry(shelf: ShelfBackend, from: string, to: string): Promise<ShelfChange> {
  const have = await shelf.list();
  const entry = have.find((e) => e.name === from);
  if (!entry) return { ok: false, message: `"${from.slice(0, 60)}" is no longer on the shelf` };
  const name = to.trim();
  if (name === from) return { ok: true, name };
  const taken = [...have.map((e) => e.name), ...inventedDrivers().map((e) => e.name)];
  const problem = nameProblem(name, taken);
  if (problem) return { ok: false, message: problem };
  // The new entry first: a failure between the two steps leaves the driver twice, never lost.
  await shelf.put({ ...entry, name });
  await shelf.remove(from);
  return { ok: true, name };
}

/** Takes a driver of the user's off the shelf; returns it (for an undo), or null when it was not there. */
export async function removeEntry(shelf: ShelfBackend, name: string): Promise<ShelfEntry | null> {
  const entry = (await shelf.list()).find((e) => e.name === name) ?? null;
  if (entry) await shelf.remove(name);
  return entry;
}

/** Puts a removed driver back, under a numbered name when its own was taken meanwhile. */
export async function restoreEntry(shelf: ShelfBackend, entry: ShelfEntry): Promise<string> {
  const taken = [...(await shelf.list()).map((e) => e.name), ...inventedDrivers().map((e) => e.name)];
  const name = freeName(entry.name, taken);
  await shelf.put({ ...entry, name });
  return name;
}
