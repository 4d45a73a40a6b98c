// The track the user opened, and the offline render of it, kept across reloads in IndexedDB. The
// file's own bytes are kept (decoding them again is quicker than storing the decoded samples, and
// several times smaller); a file larger than MAX_KEPT_TRACK_BYTES is not kept, and the bench says
// so. The render results are kept with the designs and the track they belong to, and used again
// only when both are the same (any design change makes them stale, as in the running page).
// The Headroom probe's findings are kept the same way, keyed alike (the track and both designs).
// Storage failures never reach the user's work: the track then simply has to be opened again.
import { openDB, type IDBPDatabase } from 'idb';
import type { SpeakerSystem } from '../engine/system.ts';
import type { DesignRender } from './jobs.ts';
import type { DesignSlot } from './protocol.ts';
import type { HeadroomResult } from './headroom.worker.ts';

/** Largest file kept for the next visit, bytes: a long lossless track fits, browser storage stays modest. */
export const MAX_KEPT_TRACK_BYTES = 150 * 1024 * 1024;

const DB_NAME = 'preheard-track';
const STORE = 'kept';
const TRACK = 'track';
const RESULTS = 'results';
const HEADROOM = 'headroom';

export interface KeptTrack {
  name: string;
  type: string;
  bytes: ArrayBuffer;
  savedAt: number;
}

interface KeptResults<T = Record<DesignSlot, DesignRender>> {
  /** Which track and which designs (as JSON) the results were rendered for. */
  key: string;
  results: T;
}

/** Each design's headroom (null where its search failed). */
export type HeadroomResults = Record<DesignSlot, HeadroomResult | null>;

let db: Promise<IDBPDatabase> | null = null;
function open(): Promise<IDBPDatabase> {
  if (typeof indexedDB === 'undefined') return Promise.reject(new Error('no IndexedDB'));
  db ??= openDB(DB_NAME, 1, {
    upgrade(d) {
      d.createObjectStore(STORE);
    },
  });
  db.catch(() => (db = null));
  return db;
}

/** What the results of a render belong to: the track (name and length) and both designs. */
export function resultsKey(track: { name: string; frames: number }, systems: Record<DesignSlot, SpeakerSystem>): string {
  return JSON.stringify({ track: track.name, frames: track.frames, a: systems.a, b: systems.b });
}

/** Keeps a file the user opened; false when it is too large to keep or storage refused it. */
export async function keepTrack(file: { name: string; type: string; bytes: ArrayBuffer }): Promise<boolean> {
  try {
    const d = await open();
    if (file.bytes.byteLength > MAX_KEPT_TRACK_BYTES) {
      await d.delete(STORE, TRACK);
      await d.delete(STORE, RESULTS);
      return false;
    }
    const tx = d.transaction(STORE, 'readwrite');
    await Promise.all([tx.store.put({ ...file, savedAt: Date.now() } satisfies KeptTrack, TRACK), tx.store.delete(RESULTS), tx.done]);
    return true;
  } catch {
    return false;
  }
}

/** Forgets the kept track (the user chose the demo track, or asked). */
export async function forgetTrack(): Promise<void> {
  try {
    const tx = (await open()).transaction(STORE, 'readwrite');
    await Promise.all([tx.store.delete(TRACK), tx.store.delete(RESULTS), tx.done]);
  } catch {
    // Nothing kept, or storage unavailable: nothing to forget.
  }
}

export async function keptTrack(): Promise<KeptTrack | null> {
  try {
    const v = (await (await open()).get(STORE, TRACK)) as Partial<KeptTrack> | undefined;
    if (!v || typeof v.name !== 'string' || !(v.bytes instanceof ArrayBuffer)) return null;
    return { name: v.name, type: typeof v.type === 'string' ? v.type : '', bytes: v.bytes, savedAt: Number(v.savedAt) || 0 };
  } catch {
    return null;
  }
}

export async function keepResults(key: string, results: Record<DesignSlot, DesignRender>): Promise<void> {
  try {
    await (await open()).put(STORE, { key, results } satisfies KeptResults, RESULTS);
  } catch {
    // Full or unavailable: the results are rendered again next time.
  }
}

/** The kept results when they belong to exactly this track and these designs, else null. */
export async function keptResults(key: string): Promise<Record<DesignSlot, DesignRender> | null> {
  try {
    const v = (await (await open()).get(STORE, RESULTS)) as Partial<KeptResults> | undefined;
    return v && v.key === key && v.results ? v.results : null;
  } catch {
    return null;
  }
}

export async function keepHeadroom(key: string, results: HeadroomResults): Promise<void> {
  try {
    await (await open()).put(STORE, { key, results } satisfies KeptResults<HeadroomResults>, HEADROOM);
  } catch {
    // Full or unavailable: the search is run again next time.
  }
}

/** The kept headroom findings when they belong to exactly this track and these designs, else null. */
export async function keptHeadroom(key: string): Promise<HeadroomResults | null> {
  try {
    const v = (await (await open()).get(STORE, HEADROOM)) as Partial<KeptResults<HeadroomResults>> | undefined;
    return v && v.key === key && v.results && 'a' in v.results && 'b' in v.results ? v.results : null;
  } catch {
    return null;
  }
}

/** Whether any headroom findings are kept at all (cheap: decides whether the audio side must start to check them). */
export async function hasKeptHeadroom(): Promise<boolean> {
  try {
    return (await (await open()).count(STORE, HEADROOM)) > 0;
  } catch {
    return false;
  }
}
