// Two tabs editing at once stay consistent: after each save a tab announces its project on a
// BroadcastChannel, and the other tabs adopt it as an undoable step. The last writer wins.
import type { Autosave } from './persist.ts';
import type { Project } from './project.ts';
import type { Designs, Store } from './store.ts';
import { upgradeDesign, upgradeDesigns } from './upgrade.ts';

interface Announcement {
  kind: 'preheard-project';
  tab: string;
  savedAt: number;
  project: Project;
}

/** What a tab of the first versions announced: its A and B only. */
interface PairAnnouncement {
  kind: 'preheard-designs';
  tab: string;
  savedAt: number;
  designs: Designs;
}

const isRecord = (v: unknown): v is Record<string, unknown> => !!v && typeof v === 'object' && !Array.isArray(v);

/**
 * An announced project with every variant brought to the current document version (designs being
 * edited there may have errors, so they are migrated, not validated), or null when it is not one.
 */
function upgradeProject(raw: unknown): Project | null {
  if (!isRecord(raw) || typeof raw.name !== 'string' || !Array.isArray(raw.variants) || !isRecord(raw.compared)) return null;
  const variants: Project['variants'] = [];
  for (const v of raw.variants) {
    const design = isRecord(v) && typeof v.id === 'string' ? upgradeDesign(v.design) : null;
    if (!design) return null;
    variants.push({ id: (v as { id: string }).id, design });
  }
  const ids = new Set(variants.map((v) => v.id));
  const { a, b } = raw.compared;
  if (!variants.length || typeof a !== 'string' || typeof b !== 'string' || !ids.has(a) || !ids.has(b)) return null;
  return { name: raw.name, variants, compared: { a, b }, sharedLevel: raw.sharedLevel === true };
}

export function connectTabs(store: Store, autosave: Autosave, channel: BroadcastChannel, tab: string = crypto.randomUUID()): () => void {
  // The project last exchanged with another tab: neither re-announced nor re-adopted, so two tabs never echo.
  let shared = JSON.stringify(store.get().project);
  const offSaved = autosave.onSaved((saved) => {
    const text = JSON.stringify(saved.state.project);
    if (text === shared) return;
    shared = text;
    channel.postMessage({ kind: 'preheard-project', tab, savedAt: saved.savedAt, project: saved.state.project } satisfies Announcement);
  });
  channel.onmessage = (ev) => {
    const msg = ev.data as Partial<Announcement | PairAnnouncement> | null;
    // A tab showing a shared link keeps showing it; it catches up when it goes back to saved work.
    if (!isRecord(msg) || typeof msg.tab !== 'string' || msg.tab === tab || autosave.held) return;
    if (msg.kind === 'preheard-project') {
      const project = upgradeProject(msg.project);
      if (!project) return;
      const text = JSON.stringify(project);
      if (text === JSON.stringify(store.get().project)) return;
      shared = text;
      store.dispatch({ type: 'replace-project', project, reason: 'changes made in another tab' });
    } else if (msg.kind === 'preheard-designs' && isRecord(msg.designs)) {
      // A tab still running an earlier version announces its A and B: they replace the compared pair.
      const designs = upgradeDesigns(msg.designs as { a: unknown; b: unknown });
      if (!designs || JSON.stringify(designs) === JSON.stringify(store.get().designs)) return;
      store.dispatch({ type: 'replace-pair', designs, reason: 'changes made in another tab' });
      shared = JSON.stringify(store.get().project);
    }
  };
  return () => {
    offSaved();
    channel.close();
  };
}
