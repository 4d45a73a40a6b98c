// Start-up: read the stored state, but never let a slow or failing read lead to the demo pair being
// saved over it. The page shows after at most `waitMs`; if the read is still going, the status says
// so and nothing is written until it ends; then the stored designs are put on show (as an undoable
// step when the user edited meanwhile, so no edit of either kind is lost) and saving begins.
import type { Autosave } from './persist.ts';
import type { AppState, Store } from './store.ts';

/** Also journals the last edit when the page is hidden or closed (see Autosave.flushNow). */
export function flushOnLeave(autosave: Autosave): void {
  window.addEventListener('pagehide', () => autosave.flushNow());
  document.addEventListener('visibilitychange', () => {
    if (document.visibilityState === 'hidden') autosave.flushNow();
  });
}

export async function startStorage(store: Store, autosave: Autosave, waitMs = 3000): Promise<void> {
  autosave.attach(store);
  const reading = autosave.load();
  const timedOut = Symbol('timed out');
  const first = await Promise.race([reading, new Promise<typeof timedOut>((r) => setTimeout(() => r(timedOut), waitMs))]);
  if (first !== timedOut) {
    adopt(store, autosave, first, false);
    return;
  }
  autosave.markSlow();
  void reading.then((late) => adopt(store, autosave, late, store.canUndo()));
}

/** Reads again after a failed read (the status banner's Retry). */
export async function retryStorage(store: Store, autosave: Autosave): Promise<void> {
  adopt(store, autosave, await autosave.load(), store.canUndo());
}

function adopt(store: Store, autosave: Autosave, state: AppState | undefined, userEdited: boolean) {
  if (!autosave.hasRead) return;
  if (state) {
    if (userEdited) {
      // Keep the edits made while waiting one undo away, and the user's reading of the cautions.
      store.dispatch({ type: 'replace-project', project: state.project, reason: 'load your saved designs' });
      store.dispatch({ type: 'settings', patch: { ...state.settings, screen: store.get().settings.screen } });
    } else store.dispatch({ type: 'restore', state });
  }
  autosave.saveNow();
}
