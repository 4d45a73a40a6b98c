// Autosave: every change of the store is written to IndexedDB (through idb). When storage is full or
// unavailable the status says so and the app keeps working; export still works.
import { openDB, type IDBPDatabase } from 'idb';
import type { AppState, Store } from './store.ts';
import { upgradeState } from './upgrade.ts';

export interface SavedState {
  kind: 'preheard-app-state';
  version: 1;
  savedAt: number;
  state: AppState;
}

export interface StorageBackend {
  /** The current state as stored: unchecked, it may be anything. */
  load(): Promise<unknown>;
  /** Writes the current state and, in the same transaction, the copy kept as the last good one. */
  save(value: SavedState): Promise<void>;
  loadLastGood(): Promise<unknown>;
  /** Keeps an unreadable stored state aside, for export, instead of overwriting it. */
  setAside(raw: unknown): Promise<void>;
  loadSetAside(): Promise<unknown>;
}

export type SaveStatus =
  | { kind: 'starting' }
  | { kind: 'saved'; at: number }
  | { kind: 'saving' }
  | { kind: 'full'; message: string }
  | { kind: 'unavailable'; message: string }
  /** The stored state was unreadable: it was set aside and the last good state (or the demo) restored. */
  | { kind: 'recovered'; at: number; message: string };

const DB_NAME = 'preheard';
const STORE = 'app';
const KEY = 'current';
const LAST_GOOD = 'last-good';
const SET_ASIDE = 'set-aside';

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
      return (await open()).get(STORE, KEY);
    },
    async save(value) {
      const tx = (await open()).transaction(STORE, 'readwrite');
      await Promise.all([tx.store.put(value, KEY), tx.store.put(value, LAST_GOOD), tx.done]);
    },
    async loadLastGood() {
      return (await open()).get(STORE, LAST_GOOD);
    },
    async setAside(raw) {
      await (await open()).put(STORE, { setAsideAt: Date.now(), raw }, SET_ASIDE);
    },
    async loadSetAside() {
      return (await open()).get(STORE, SET_ASIDE);
    },
  };
}

/** Kept in memory only (tests, or as a stand-in when IndexedDB is missing). */
export function memoryBackend(initial?: unknown): StorageBackend & { value: unknown; lastGood: unknown; aside: unknown } {
  const copy = (v: unknown) => (v === undefined ? undefined : structuredClone(v));
  const b = {
    value: initial,
    lastGood: undefined as unknown,
    aside: undefined as unknown,
    async load() {
      return copy(b.value);
    },
    async save(value: SavedState) {
      b.value = structuredClone(value);
      b.lastGood = structuredClone(value);
    },
    async loadLastGood() {
      return copy(b.lastGood);
    },
    async setAside(raw: unknown) {
      b.aside = { setAsideAt: Date.now(), raw: copy(raw) };
    },
    async loadSetAside() {
      return copy(b.aside);
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
  private savedListeners = new Set<(v: SavedState) => void>();

  constructor(
    private readonly backend: StorageBackend,
    private readonly now: () => number = () => Date.now(),
  ) {}

  onStatus(fn: (s: SaveStatus) => void): () => void {
    this.listeners.add(fn);
    return () => this.listeners.delete(fn);
  }

  /** Called after every successful write (the tab sync announces it to other tabs). */
  onSaved(fn: (v: SavedState) => void): () => void {
    this.savedListeners.add(fn);
    return () => this.savedListeners.delete(fn);
  }

  /** The user has read the recovery notice. */
  acknowledge(): void {
    if (this.status.kind === 'recovered') this.setStatus({ kind: 'saved', at: this.now() });
  }

  private setStatus(s: SaveStatus) {
    this.status = s;
    for (const fn of this.listeners) fn(s);
  }

  /**
   * The saved state, or undefined when there is none or it cannot be read. An unreadable stored
   * state is never overwritten blindly: it is set aside (for export) and the last good one restored.
   */
  async load(): Promise<AppState | undefined> {
    try {
      const saved = await this.backend.load();
      if (saved === undefined) {
        this.setStatus({ kind: 'saved', at: this.now() });
        return undefined;
      }
      // Designs saved by an earlier version are migrated on the way in; unreadable ones are set aside.
      const current = isSavedState(saved) ? upgradeState(saved.state) : null;
      if (current) {
        this.setStatus({ kind: 'saved', at: (saved as SavedState).savedAt });
        return current;
      }
      await this.backend.setAside(saved);
      const good = await this.backend.loadLastGood();
      const goodState = isSavedState(good) ? upgradeState(good.state) : null;
      const restored = goodState && isSavedState(good) ? { savedAt: good.savedAt, state: goodState } : undefined;
      this.setStatus({
        kind: 'recovered',
        at: this.now(),
        message: restored
          ? `The stored designs could not be read, so the last good state, saved ${new Date(restored.savedAt).toLocaleString()}, was restored. The unreadable data is kept aside: download it to keep it.`
          : 'The stored designs could not be read and no earlier good state exists, so the demo pair is shown. The unreadable data is kept aside: download it to keep it.',
      });
      return restored?.state;
    } catch (e) {
      this.setStatus(describeFailure(e));
      return undefined;
    }
  }

  /** What was set aside as unreadable, as JSON text for download, or null. */
  async setAsideText(): Promise<string | null> {
    try {
      const aside = await this.backend.loadSetAside();
      return aside === undefined ? null : JSON.stringify(aside, null, 2);
    } catch {
      return null;
    }
  }

  attach(store: Store): () => void {
    return store.subscribe(() => this.request(store));
  }

  private request(store: Store) {
    this.dirty = true;
    if (this.pending) return;
    if (this.status.kind === 'saved' || this.status.kind === 'starting') this.setStatus({ kind: 'saving' });
    this.pending = (async () => {
      // Let a burst of intents in the same task land first.
      await Promise.resolve();
      while (this.dirty) {
        this.dirty = false;
        const value: SavedState = { kind: 'preheard-app-state', version: 1, savedAt: this.now(), state: store.get() };
        try {
          await this.backend.save(value);
          // A recovery notice stays up until the user has seen it; saving goes on underneath.
          if (this.status.kind !== 'recovered') this.setStatus({ kind: 'saved', at: value.savedAt });
          for (const fn of this.savedListeners) fn(value);
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
