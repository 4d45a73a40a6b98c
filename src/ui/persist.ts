// Autosave: every change of the store is written to IndexedDB (through idb). When storage is full or
// unavailable the status says so and the app keeps working; export still works.
import { openDB, type IDBPDatabase } from 'idb';
import type { AppState, Store } from './store.ts';

export interface SavedState {
  kind: 'preheard-app-state';
  version: 1;
  savedAt: number;
  state: AppState;
}

export interface StorageBackend {
  load(): Promise<SavedState | undefined>;
  save(value: SavedState): Promise<void>;
}

export type SaveStatus =
  | { kind: 'starting' }
  | { kind: 'saved'; at: number }
  | { kind: 'saving' }
  | { kind: 'full'; message: string }
  | { kind: 'unavailable'; message: string };

const DB_NAME = 'preheard';
const STORE = 'app';
const KEY = 'current';

export function indexedDbBackend(): StorageBackend {
  let db: Promise<IDBPDatabase> | null = null;
  const open = () => {
    if (typeof indexedDB === 'undefined') return Promise.reject(new Error('this browser offers no IndexedDB'));
    db ??= openDB(DB_NAME, 1, {
      upgrade(d) {
        d.createObjectStore(STORE);
      },
    });
    // A failed open may succeed later (e.g. after the user frees space): do not cache the failure.
    db.catch(() => (db = null));
    return db;
  };
  return {
    async load() {
      const d = await open();
      return (await d.get(STORE, KEY)) as SavedState | undefined;
    },
    async save(value) {
      const d = await open();
      await d.put(STORE, value, KEY);
    },
  };
}

/** Kept in memory only (tests, or as a stand-in when IndexedDB is missing). */
export function memoryBackend(initial?: SavedState): StorageBackend & { value: SavedState | undefined } {
  const b = {
    value: initial,
    async load() {
      return b.value === undefined ? undefined : structuredClone(b.value);
    },
    async save(value: SavedState) {
      b.value = structuredClone(value);
    },
  };
  return b;
}

function describeFailure(e: unknown): SaveStatus {
  const name = e instanceof Error || (typeof DOMException !== 'undefined' && e instanceof DOMException) ? (e as Error).name : '';
  const detail = e instanceof Error ? e.message : String(e);
  if (name === 'QuotaExceededError' || /quota/i.test(detail)) {
    return {
      kind: 'full',
      message: `Browser storage is full, so this change was not saved (${detail}). Export your designs to keep them, then free some space for this site.`,
    };
  }
  return {
    kind: 'unavailable',
    message: `Browser storage is unavailable, so changes are kept in this tab only (${detail}). Export your designs to keep them.`,
  };
}

export function isSavedState(v: unknown): v is SavedState {
  if (v === null || typeof v !== 'object') return false;
  const s = v as Partial<SavedState>;
  const st = s.state as Partial<AppState> | undefined;
  return (
    s.kind === 'preheard-app-state' &&
    s.version === 1 &&
    !!st &&
    typeof st === 'object' &&
    !!st.designs &&
    typeof st.designs.a === 'object' &&
    typeof st.designs.b === 'object' &&
    !!st.settings
  );
}

/** Connects a store to a backend: every change is saved (coalesced within one task). */
export class Autosave {
  status: SaveStatus = { kind: 'starting' };
  private pending: Promise<void> | null = null;
  private dirty = false;
  private listeners = new Set<(s: SaveStatus) => void>();

  constructor(
    private readonly backend: StorageBackend,
    private readonly now: () => number = () => Date.now(),
  ) {}

  onStatus(fn: (s: SaveStatus) => void): () => void {
    this.listeners.add(fn);
    return () => this.listeners.delete(fn);
  }

  private setStatus(s: SaveStatus) {
    this.status = s;
    for (const fn of this.listeners) fn(s);
  }

  /** The saved state, or undefined when there is none or it cannot be read. */
  async load(): Promise<AppState | undefined> {
    try {
      const saved = await this.backend.load();
      this.setStatus({ kind: 'saved', at: saved?.savedAt ?? this.now() });
      return isSavedState(saved) ? saved.state : undefined;
    } catch (e) {
      this.setStatus(describeFailure(e));
      return undefined;
    }
  }

  attach(store: Store): () => void {
    return store.subscribe(() => this.request(store));
  }

  private request(store: Store) {
    this.dirty = true;
    if (this.pending) return;
    if (this.status.kind !== 'full' && this.status.kind !== 'unavailable') this.setStatus({ kind: 'saving' });
    this.pending = (async () => {
      // Let a burst of intents in the same task land first.
      await Promise.resolve();
      while (this.dirty) {
        this.dirty = false;
        const value: SavedState = { kind: 'preheard-app-state', version: 1, savedAt: this.now(), state: store.get() };
        try {
          await this.backend.save(value);
          this.setStatus({ kind: 'saved', at: value.savedAt });
        } catch (e) {
          this.setStatus(describeFailure(e));
        }
      }
      this.pending = null;
    })();
  }

  /** Resolves when everything dispatched so far has been written (or has failed). */
  async flush(): Promise<void> {
    while (this.pending) await this.pending;
  }
}
