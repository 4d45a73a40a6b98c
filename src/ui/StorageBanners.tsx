// What the app says about its saved work when it is not simply saving: a slow or failed start-up
// read (nothing is written, retry and export offered) and a shared link on view (keep it or go back).
import type { Autosave } from './persist.ts';
import { useSaveStatus } from './app/hooks.ts';
import { SLOTS, SLOT_LABEL, type Slot } from './store.ts';

export function StorageBanners(p: {
  autosave: Autosave;
  onRetry: () => void;
  onExport: (slot: Slot) => void;
  onKeepShared: () => void;
  onLeaveShared: () => void;
}) {
  const status = useSaveStatus(p.autosave);
  const exports = SLOTS.map((s) => (
    <button type="button" class="small" onClick={() => p.onExport(s)}>
      Export {SLOT_LABEL[s]}
    </button>
  ));
  if (status.kind === 'waiting' || status.kind === 'unread') {
    return (
      <div class="banner banner-warn" role="alert" data-testid="unread-banner" data-state={status.kind}>
        {status.message}
        {status.kind === 'unread' ? (
          <button type="button" class="small" onClick={p.onRetry}>
            Try again
          </button>
        ) : null}
        {exports}
      </div>
    );
  }
  if (status.kind === 'held') {
    return (
      <div class="banner banner-update" role="alert" data-testid="shared-banner">
        {status.message}
        <button type="button" class="primary small" onClick={p.onKeepShared}>
          Keep these designs
        </button>
        <button type="button" class="small" onClick={p.onLeaveShared}>
          Back to my designs
        </button>
      </div>
    );
  }
  return null;
}
