// Two tabs editing at once stay consistent: after each save a tab announces its designs on a
// BroadcastChannel, and the other tabs adopt them as an undoable step. The last writer wins.
import type { Autosave } from './persist.ts';
import type { Designs, Store } from './store.ts';
import { upgradeDesigns } from './upgrade.ts';

interface Announcement {
  kind: 'preheard-designs';
  tab: string;
  savedAt: number;
  designs: Designs;
}

const isAnnouncement = (v: unknown): v is Announcement =>
  !!v &&
  typeof v === 'object' &&
  (v as Announcement).kind === 'preheard-designs' &&
  typeof (v as Announcement).tab === 'string' &&
  !!(v as Announcement).designs;

export function connectTabs(store: Store, autosave: Autosave, channel: BroadcastChannel, tab: string = crypto.randomUUID()): () => void {
  // The designs last exchanged with another tab: neither re-announced nor re-adopted, so two tabs never echo.
  let shared = JSON.stringify(store.get().designs);
  const offSaved = autosave.onSaved((saved) => {
    const text = JSON.stringify(saved.state.designs);
    if (text === shared) return;
    shared = text;
    channel.postMessage({ kind: 'preheard-designs', tab, savedAt: saved.savedAt, designs: saved.state.designs } satisfies Announcement);
  });
  channel.onmessage = (ev) => {
    // A tab showing a shared link keeps showing it; it catches up when it goes back to saved work.
    if (!isAnnouncement(ev.data) || ev.data.tab === tab || autosave.held) return;
    // A tab still running an earlier version announces earlier documents: migrate them.
    const designs = upgradeDesigns(ev.data.designs);
    if (!designs) return;
    const text = JSON.stringify(designs);
    if (text === JSON.stringify(store.get().designs)) return;
    shared = text;
    store.dispatch({ type: 'replace-pair', designs, reason: 'changes made in another tab' });
  };
  return () => {
    offSaved();
    channel.close();
  };
}
