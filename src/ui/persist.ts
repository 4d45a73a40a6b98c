// Autosave: every change of the store is written to IndexedDB (through idb). When storage is full or
// unavailable the status says so and the app keeps working; export still works.
//
// Nothing is written before the stored state has been read: a slow or failing start-up read leaves
// storage untouched (the status says so, with a retry), so the demo pair can never replace saved work
// it has not seen. A stored state is used only when every variant of its project passes the same
// validation as a design file (parseDesign); the last good copy is only ever a state that passed it.
// An A/B pair stored by an earlier version (state version 1) opens as a two-variant project. While the tab shows a
// shared link, saving is held until the user keeps the shared designs.
import { openDB, type IDBPDatabase } from 'idb';
import { parseDesign } from '../engine/design/validate.ts';
import { validate } from './engine.ts';
import { checkProject, projectFromPair, type Project } from './project.ts';
import { DEFAULT_SETTINGS, stateOf, type AppState, type Settings, type Store } from './store.ts';

export interface SavedState {
  kind: 'preheard-app-state';
  version: 2;
  savedAt: number;
  state: { project: Project; settings: Settings };
}

function savedState(state: AppState, savedAt: number): SavedState {
  return { kind: 'preheard-app-state', version: 2, savedAt, state: { project: state.project, settings: state.settings } };
}

export interface StorageBackend {
  /** The current state as stored: unchecked, it may be anything. */
  load(): Promise<unknown>;
  /** Writes the current state and, in the same transaction when `good`, the copy kept as the last good one. */
  save(value: SavedState, good: boolean): Promise<void>;
  loadLastGood(): Promise<unknown>;
  /** Keeps an unreadable stored state aside, for export, instead of overwriting it. */
  setAside(raw: unknown): Promise<void>;
  loadSetAside(): Promise<unknown>;
  /**
   * Synchronous last-moment copy for a page being closed or reloaded (IndexedDB transactions still
   * open then may be dropped); read back by `load` when it is newer than the stored state.
   */
  journal?: { write(value: SavedState): void; read(): unknown; clear(): void };
}

export type SaveStatus =
  | { kind: 'starting' }
  | { kind: 'saved'; at: number }
  | { kind: 'saving' }
  | { kind: 'full'; message: string }
  | { kind: 'unavailable'; message: string }
  /** The stored state was unreadable: it was set aside and the last good state (or the demo) restored. */
  | { kind: 'recovered'; at: number; message: string }
  /** The start-up read is slow (another tab may hold the database): nothing is saved until it ends. */
  | { kind: 'waiting'; message: string }
  /** The start-up read failed: nothing is saved, so the stored designs stay as they were. */
  | { kind: 'unread'; message: string }
  /** The tab shows a shared link's designs: nothing is saved until the user keeps them. */
  | { kind: 'held'; message: string };

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
    async save(value, good) {
      const tx = (await open()).transaction(STORE, 'readwrite');
      await Promise.all([tx.store.put(value, KEY), good ? tx.store.put(value, LAST_GOOD) : null, tx.done]);
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
    journal: localStorageJournal(),
  };
}

const JOURNAL_KEY = 'preheard-unsaved-edit';

/** The journal in localStorage, which writes synchronously; absent when localStorage is unavailable. */
function localStorageJournal(): StorageBackend['journal'] {
  const ls = (): Storage | null => {
    try {
      return typeof localStorage === 'undefined' ? null : localStorage;
    } catch {
      return null;
    }
  };
  return {
    write(value) {
      try {
        ls()?.setItem(JOURNAL_KEY, JSON.stringify(value));
      } catch {
        // Full or refused: the IndexedDB write already under way is all there is.
      }
    },
    read() {
      try {
        const text = ls()?.getItem(JOURNAL_KEY);
        return text ? JSON.parse(text) : undefined;
      } catch {
        return undefined;
      }
    },
    clear() {
      try {
        ls()?.removeItem(JOURNAL_KEY);
      } catch {
        // Nothing to do: a stale journal older than the stored state is ignored on load.
      }
    },
  };
}

/** Kept in memory only (tests, or as a stand-in when IndexedDB is missing). */
export function memoryBackend(
  initial?: unknown,
): StorageBackend & { value: unknown; lastGood: unknown; aside: unknown; journaled: unknown; writes: number } {
  const copy = (v: unknown) => (v === undefined ? undefined : structuredClone(v));
  const b = {
    value: initial,
    lastGood: undefined as unknown,
    aside: undefined as unknown,
    journaled: undefined as unknown,
    writes: 0,
    async load() {
      return copy(b.value);
    },
    async save(value: SavedState, good: boolean) {
      b.writes++;
      b.value = structuredClone(value);
      if (good) b.lastGood = structuredClone(value);
    },
    journal: {
      write(value: SavedState) {
        b.journaled = structuredClone(value);
      },
      read() {
        return copy(b.journaled);
      },
      clear() {
        b.journaled = undefined;
      },
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

/** A stored state of either version: a project (2) or an A/B pair (1), not yet validated. */
export function isSavedState(
  v: unknown,
): v is { kind: 'preheard-app-state'; version: 1 | 2; savedAt: number; state: Record<string, unknown> } {
  if (v === null || typeof v !== 'object') return false;
  const s = v as { kind?: unknown; version?: unknown; savedAt?: unknown; state?: Record<string, unknown> };
  const st = s.state;
  const body = s.version === 1 ? st?.designs : s.version === 2 ? st?.project : undefined;
  return (
    s.kind === 'preheard-app-state' &&
    typeof s.savedAt === 'number' &&
    !!body &&
    typeof body === 'object' &&
    !!st?.settings &&
    typeof st.settings === 'object'
  );
}

/** True when every variant passes the design-file validation: only such a state becomes the last good one. */
export function designsValid(state: AppState): boolean {
  // Through the app's validation, kept per design object: an edit re-checks only the design it changed.
  return state.project.variants.every((v) => validate(v.design).ok);
}

/**
 * When a save starts: after the edit's own frame has been drawn, in idle time (within half a second
 * at the latest), so writing never delays the redraw of an edit. Until then the edit is not yet
 * stored, and `flushNow` journals it if the page is hidden or closed meanwhile.
 */
export function afterPaint(): Promise<void> {
  return new Promise((resolve) => {
    if (typeof requestIdleCallback === 'function') requestIdleCallback(() => resolve(), { timeout: 500 });
    else setTimeout(resolve, 0);
  });
}

/** A pause in the edits this long lets a save begin (typing or dragging lands in one write). */
export const EDIT_PAUSE_MS = 600;
/** Edits that never pause (a long drag) are still saved this long after the first unsaved one. */
export const SAVE_WITHIN_MS = 2000;

/**
 * The app's save timing. A change that comes alone (the previous one at least `EDIT_PAUSE_MS`
 * before) is saved at once, in idle time after its frame. Changes that follow each other faster
 * (typing, dragging) are a burst: their save waits for the edits to pause, or `SAVE_WITHIN_MS` at
 * most, so a burst costs a few writes, status changes and announcements to the other tabs rather
 * than one per edit, and those stay out of the way of the redraws. `cut` ends the wait at once (the
 * page is being hidden, an update is about to reload it): then the write starts without waiting
 * for idle time either.
 */
export function afterEditsPause(
  now: () => number = Date.now,
): (sinceLastEdit: () => number, burst: boolean, cut: Promise<void>) => Promise<void> {
  return async (sinceLastEdit, burst, cut) => {
    const start = now();
    const cutNow = cut.then(() => true);
    while (burst) {
      const quiet = sinceLastEdit();
      const waited = now() - start;
      // A clock set back meanwhile (negative times) ends the wait too: the save must not wait for it.
      if (quiet >= EDIT_PAUSE_MS || waited >= SAVE_WITHIN_MS || quiet < 0 || waited < 0) break;
      const pause = new Promise<boolean>((r) => setTimeout(() => r(false), Math.min(EDIT_PAUSE_MS - quiet, SAVE_WITHIN_MS - waited)));
      if (await Promise.race([pause, cutNow])) return;
    }
    if (await Promise.race([afterPaint().then(() => false), cutNow])) return;
  };
}

/** Settings as stored, with anything of the wrong type replaced by the default. */
function checkedSettings(raw: unknown): Settings {
  const out: Settings = { ...DEFAULT_SETTINGS };
  if (!raw || typeof raw !== 'object') return out;
  const r = raw as Record<string, unknown>;
  for (const [key, value] of Object.entries(r)) {
    const fallback = (DEFAULT_SETTINGS as unknown as Record<string, unknown>)[key];
    if (fallback === undefined || typeof value === typeof fallback) (out as unknown as Record<string, unknown>)[key] = value;
  }
  return out;
}

/**
 * A stored state ready to use: the right shape, and both designs valid as design files (they come
 * back as parseDesign gives them). Null when it cannot be used as it is.
 */
export function usableState(v: unknown): { savedAt: number; state: AppState } | null {
  if (!isSavedState(v)) return null;
  const settings = checkedSettings(v.state.settings);
  if (v.version === 1) {
    const designs = v.state.designs as Record<string, unknown>;
    const a = parseDesign(designs.a);
    const b = parseDesign(designs.b);
    if (!a.ok || !b.ok) return null;
    return { savedAt: v.savedAt, state: stateOf(projectFromPair({ a: a.design, b: b.design }), settings) };
  }
  const r = checkProject(v.state.project);
  return r.ok ? { savedAt: v.savedAt, state: stateOf(r.project, settings) } : null;
}

/**
 * Connects a store to a backend: every change is saved, after its frame and, for a burst of edits,
 * after the edits pause (`settle`: the app's timing is `afterEditsPause`).
 */
export class Autosave {
  status: SaveStatus = { kind: 'starting' };
  private pending: Promise<void> | null = null;
  private dirty = false;
  /** When the store last changed (`now`'s clock): a burst's save waits for the edits to pause. */
  private lastEditAt = Number.NEGATIVE_INFINITY;
  /** Ends the wait of the save under way (see `hurry`). */
  private cutWait: (() => void) | null = null;
  /** Whether the stored state has been read: until then nothing is written. */
  private read: 'no' | 'yes' | 'failed' = 'no';
  /** A shared link is on view: nothing is written until the user keeps it. */
  private holding = false;
  private store: Store | null = null;
  /** The state last written (or read) successfully, to journal only what is not yet safe. */
  private lastWritten: AppState | null = null;
  /** The state in the journal, if one was written by this tab. */
  private journaled: AppState | null = null;
  private listeners = new Set<(s: SaveStatus) => void>();
  private savedListeners = new Set<(v: SavedState) => void>();

  constructor(
    private readonly backend: StorageBackend,
    private readonly now: () => number = () => Date.now(),
    /**
     * Waits before a save begins, told how long ago the last edit came, whether the edits come in a
     * burst (a burst then lands in one write) and, by `cut`, when to stop waiting at once.
     */
    private readonly settle: (sinceLastEdit: () => number, burst: boolean, cut: Promise<void>) => Promise<void> = afterPaint,
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

  /** True once the stored state was read (or found absent): only then may it be written. */
  get hasRead(): boolean {
    return this.read === 'yes';
  }

  /** The start-up read is taking long: say so; nothing is written until it ends. */
  markSlow(): void {
    if (this.read !== 'no') return;
    this.setStatus({
      kind: 'waiting',
      message:
        'Your saved designs have not loaded yet (another preheard tab may be holding the browser storage). Nothing is saved until they load, so they cannot be overwritten; close other preheard tabs or wait. Edits made now stay in this tab.',
    });
  }

  /** Stops saving while a shared link is on view (storage and the other tabs stay as they were). */
  hold(): void {
    // An edit not yet saved (the save waits for idle time or a pause) is journalled and written
    // first, as the user's own state before the link's designs replace it: the saved designs the
    // user goes back to, or keeps the link's beside, include it, journal or not.
    if (!this.holding) {
      this.flushNow();
      if (this.dirty && this.store && this.read === 'yes') {
        this.dirty = false;
        void this.write(this.store.get());
      }
    }
    this.holding = true;
    this.setStatus({
      kind: 'held',
      message: 'You are looking at designs from a shared link. Your saved designs and your other tabs are unchanged until you keep these.',
    });
  }

  /** Saving resumes; with `save`, the state on show is written now (the user kept it). */
  release(save: boolean): void {
    if (!this.holding) return;
    this.holding = false;
    if (!save) this.dirty = false;
    this.setStatus(this.read === 'yes' ? { kind: 'saved', at: this.now() } : { kind: 'starting' });
    if (save && this.store) this.request(this.store, true);
  }

  get held(): boolean {
    return this.holding;
  }

  /**
   * Writes what is not yet safely stored to the synchronous journal: called when the page is hidden
   * or unloaded, when an IndexedDB write still under way may be dropped.
   */
  flushNow(): void {
    // A page that is only hidden lives on: its save, if waiting for a pause, starts now.
    this.hurry();
    if (!this.store || this.read !== 'yes' || this.holding || !this.backend.journal) return;
    const state = this.store.get();
    if (state === this.lastWritten || state === this.journaled) return;
    this.backend.journal.write(savedState(state, this.now()));
    this.journaled = state;
  }

  private setStatus(s: SaveStatus) {
    this.status = s;
    for (const fn of this.listeners) fn(s);
  }

  /**
   * The saved state, or undefined when there is none or it cannot be used. A stored state that fails
   * validation is never overwritten blindly: it is set aside (for export) and the last good one
   * restored. When the read itself fails, undefined is returned and nothing will be written.
   */
  async load(): Promise<AppState | undefined> {
    try {
      const saved = await this.backend.load();
      const journaled = this.backend.journal?.read();
      const journal = usableState(journaled);
      const stored = usableState(saved);
      if (saved === undefined || stored) {
        // The store is empty or usable: an edit the journal caught as the page closed wins when newer.
        if (journal && (!stored || journal.savedAt > stored.savedAt)) {
          // Restoring the journal's state writes it to IndexedDB, which then clears the journal.
          this.journaled = journal.state;
          this.markRead(journal.state, { kind: 'saved', at: journal.savedAt });
          return journal.state;
        }
        if (journaled !== undefined) this.backend.journal?.clear();
        this.markRead(stored?.state, { kind: 'saved', at: stored ? stored.savedAt : this.now() });
        return stored?.state;
      }
      // The stored state cannot be used: it is set aside, never overwritten blindly, and the newest
      // good state restored: the last good copy, or the journal when it is newer (a stale journal
      // left by a closed tab must not pass for the latest work).
      await this.backend.setAside(saved);
      const good = usableState(await this.backend.loadLastGood());
      const best = journal && (!good || journal.savedAt > good.savedAt) ? journal : good;
      if (best && best === journal) this.journaled = journal.state;
      else if (journaled !== undefined) this.backend.journal?.clear();
      this.markRead(best?.state, {
        kind: 'recovered',
        at: this.now(),
        message: best
          ? `The stored designs could not be used (they are damaged or fail the design checks), so the last good state, saved ${new Date(best.savedAt).toLocaleString()}, was restored. The stored data is kept aside: download it to keep it.`
          : 'The stored designs could not be used (they are damaged or fail the design checks) and no earlier good state exists, so the demo pair is shown. The stored data is kept aside: download it to keep it.',
      });
      return best?.state;
    } catch (e) {
      this.read = 'failed';
      const detail = e instanceof Error ? e.message : String(e);
      this.setStatus({
        kind: 'unread',
        message: `Your saved designs could not be read (${detail}), so nothing is saved in this tab and they stay as they were. Try again, or export what you make here.`,
      });
      return undefined;
    }
  }

  private markRead(state: AppState | undefined, status: SaveStatus) {
    this.read = 'yes';
    this.lastWritten = state ?? null;
    this.setStatus(this.holding ? this.status : status);
  }

  /** Saves edits made while the read was slow (the caller first puts any state it read in the store). */
  saveNow(): void {
    if (this.dirty && this.store) this.request(this.store, true);
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
    this.store = store;
    return store.subscribe(() => this.request(store));
  }

  /** A save of the store's state; `atOnce` for a step the user took on purpose (keeping a shared link). */
  private request(store: Store, atOnce = false) {
    const at = this.now();
    let burst = !atOnce && at - this.lastEditAt < EDIT_PAUSE_MS;
    this.lastEditAt = at;
    this.dirty = true;
    if (this.read !== 'yes' || this.holding) return;
    // Shown at once (the edit's own render shows it), also while an earlier write is under way: the
    // edit is not stored until the save below.
    if (this.status.kind === 'saved' || this.status.kind === 'starting') this.setStatus({ kind: 'saving' });
    if (this.pending) {
      // A step taken on purpose does not wait for the burst before it to pause.
      if (atOnce) this.hurry();
      return;
    }
    this.pending = (async () => {
      // A shared link may have come on view meanwhile: its designs are not the user's to save.
      while (this.dirty && !this.holding) {
        // Let the edit draw, and a burst of edits land, first.
        const cut = new Promise<void>((resolve) => {
          this.cutWait = resolve;
        });
        await this.settle(() => this.now() - this.lastEditAt, burst, cut);
        this.cutWait = null;
        // A link put on view, or left without keeping it, while this save waited: nothing to write.
        if (this.holding || !this.dirty) break;
        // Edits that arrive while this one is written belong to a burst: the next save waits for a pause.
        burst = true;
        this.dirty = false;
        await this.write(store.get());
      }
      this.pending = null;
    })();
  }

  /** Writes `state` and says how it went (not while a shared link is on view: that says itself). */
  private async write(state: AppState): Promise<void> {
    const value = savedState(state, this.now());
    try {
      await this.backend.save(value, designsValid(state));
      this.lastWritten = state;
      // The journal is dropped once IndexedDB holds what it held (not a newer edit it caught).
      if (this.journaled === state) {
        this.backend.journal?.clear();
        this.journaled = null;
      }
      // A recovery notice stays up until the user has seen it; saving goes on underneath. Edits
      // made while this was written are not saved yet: the status says so until they are.
      if (this.status.kind !== 'recovered' && !this.holding)
        this.setStatus(this.dirty ? { kind: 'saving' } : { kind: 'saved', at: value.savedAt });
      for (const fn of this.savedListeners) fn(value);
    } catch (e) {
      if (!this.holding) this.setStatus(describeFailure(e));
    }
  }

  /** Resolves when everything dispatched so far has been written (or has failed). */
  async flush(): Promise<void> {
    this.hurry();
    while (this.pending) await this.pending;
  }

  /** The save under way stops waiting for a pause in the edits or for idle time and writes now. */
  private hurry(): void {
    this.cutWait?.();
  }
}
