// What the page says about itself: an update ready, storage trouble, a recovered state, and the
// save status in the footer.
import type { Autosave, SaveStatus } from '../persist.ts';
import type { UpdateHandle } from '../pwa.ts';
import { downloadText } from '../files.ts';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';
import { useSaveStatus } from './hooks.ts';

async function downloadSetAside(autosave: Autosave) {
  const text = await autosave.setAsideText();
  if (text === null) return;
  downloadText(text, 'preheard-unreadable-state.json');
}

export function Banners(p: { update: UpdateHandle | null; autosave: Autosave; exportDesign: (slot: Slot) => void }) {
  const { update, autosave } = p;
  const status = useSaveStatus(autosave);
  const storageTrouble = status.kind === 'full' || status.kind === 'unavailable' ? status : null;
  return (
    <>
      {update ? (
        <div class="banner banner-update" role="status">
          A new version of preheard is ready.
          <button type="button" class="primary small" onClick={() => update.apply(() => autosave.flush())}>
            Reload to update
          </button>
          <span class="fine">Your designs are saved first; nothing is lost.</span>
        </div>
      ) : null}
      {storageTrouble ? (
        <div class="banner banner-warn" role="alert" data-testid="storage-banner">
          {storageTrouble.message}
          {SLOTS.map((s) => (
            <button type="button" class="small" onClick={() => p.exportDesign(s)}>
              Export {SLOT_LABEL[s]}
            </button>
          ))}
        </div>
      ) : null}
      {status.kind === 'recovered' ? (
        <div class="banner banner-warn" role="alert" data-testid="recovery-banner">
          {status.message}
          <button type="button" class="small" onClick={() => void downloadSetAside(autosave)}>
            Download the unreadable data
          </button>
          <button type="button" class="small" onClick={() => autosave.acknowledge()}>
            Dismiss
          </button>
        </div>
      ) : null}
    </>
  );
}

const SAVE_WORDS: Record<Exclude<SaveStatus['kind'], 'saved'>, string> = {
  saving: 'Saving…',
  starting: 'Opening storage…',
  full: 'Not saved: storage full',
  recovered: 'Recovered the last good state',
  waiting: 'Not saved yet: your saved designs are still loading',
  unread: 'Not saved: your saved designs could not be read',
  held: 'Not saved: a shared link is on view',
  unavailable: 'Not saved: storage unavailable',
};

export function SaveIndicator({ autosave }: { autosave: Autosave }) {
  const status = useSaveStatus(autosave);
  const text = status.kind === 'saved' ? `Saved on this device ${new Date(status.at).toLocaleTimeString()}` : SAVE_WORDS[status.kind];
  return (
    <span class={`save save-${status.kind}`} data-testid="save-status" data-state={status.kind}>
      {text}
    </span>
  );
}
