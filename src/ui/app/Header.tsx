// The header: the brand and the toolbar of actions on the project and its compared pair (undo, copy,
// files, share, theme, cautions), with the hidden file input the import uses. Destructive actions ask.
import { useRef } from 'preact/hooks';
import { SLOTS, SLOT_LABEL, type AppState, type Slot, type Store } from '../store.ts';
import type { ConfirmQuestion } from './dialogs.tsx';
import { passivePair } from '../demo.ts';

export interface HeaderActions {
  importInto: (file: File, slot: Slot) => void;
  exportDesign: (slot: Slot) => void;
  exportProject: () => void;
  share: () => void;
  showCautions: () => void;
  confirm: (q: ConfirmQuestion) => Promise<boolean>;
}

function closeMenu(e: Event) {
  (e.currentTarget as HTMLElement).closest('details')?.removeAttribute('open');
}

export function Header(p: { store: Store; state: AppState; actions: HeaderActions }) {
  const { store, state, actions } = p;
  const fileInput = useRef<HTMLInputElement>(null);
  const importSlot = useRef<Slot>('a');
  const startImport = (slot: Slot) => {
    importSlot.current = slot;
    fileInput.current?.click();
  };
  const onFile = (e: Event) => {
    const el = e.currentTarget as HTMLInputElement;
    const file = el.files?.[0];
    el.value = '';
    if (file) actions.importInto(file, importSlot.current);
  };
  return (
    <header class="top">
      <div class="brand">
        <img src="/icons/icon.svg" alt="" width={28} height={28} />
        <span class="brand-name">preheard</span>
        <span class="brand-tag">hear a design before building it</span>
      </div>
      <div class="toolbar" role="toolbar" aria-label="Design actions">
        <div class="tgroup">
          <button
            type="button"
            onClick={() => store.dispatch({ type: 'undo' })}
            disabled={!store.canUndo()}
            title={store.undoLabel() ? `Undo ${store.undoLabel()}` : 'Nothing to undo'}
          >
            Undo
          </button>
          <button
            type="button"
            onClick={() => store.dispatch({ type: 'redo' })}
            disabled={!store.canRedo()}
            title={store.redoLabel() ? `Redo ${store.redoLabel()}` : 'Nothing to redo'}
          >
            Redo
          </button>
        </div>
        <div class="tgroup">
          <button
            type="button"
            disabled={state.project.compared.a === state.project.compared.b}
            onClick={async () => {
              const ok = await actions.confirm({
                title: 'Copy A over B?',
                text: `Every setting of “${state.designs.b.name}” is replaced by those of “${state.designs.a.name}” (B keeps its name). Undo brings it back.`,
                action: 'Copy A to B',
              });
              if (ok) store.dispatch({ type: 'copy-a-to-b' });
            }}
          >
            Copy A to B
          </button>
          <button type="button" onClick={() => store.dispatch({ type: 'swap' })}>
            Swap
          </button>
          <button
            type="button"
            onClick={async () => {
              const n = state.project.variants.length;
              const ok = await actions.confirm({
                title: 'Reset to the demo pair?',
                text: `The project “${state.project.name}” and its ${n === 1 ? 'variant' : `${n} variants`} give way to the two demo designs. Undo brings them back; save the project file first to keep a copy.`,
                action: 'Reset to the demo pair',
              });
              if (ok) store.dispatch({ type: 'reset-demo' });
            }}
          >
            Reset to demo pair
          </button>
          <button
            type="button"
            onClick={() => store.dispatch({ type: 'replace-pair', designs: passivePair(), reason: 'the passive two-way pair' })}
          >
            Passive two-way pair
          </button>
        </div>
        <details class="menu tgroup">
          <summary>Files</summary>
          <div class="menu-body" role="menu">
            {SLOTS.map((s) => (
              <button type="button" role="menuitem" onClick={(e) => (closeMenu(e), startImport(s))}>
                Add a design file as a variant, compared as {SLOT_LABEL[s]}…
              </button>
            ))}
            {SLOTS.map((s) => (
              <button type="button" role="menuitem" onClick={(e) => (closeMenu(e), actions.exportDesign(s))}>
                Export design {SLOT_LABEL[s]}
              </button>
            ))}
            <button type="button" role="menuitem" onClick={(e) => (closeMenu(e), actions.exportProject())}>
              Save project file (every variant)
            </button>
            <button type="button" role="menuitem" onClick={(e) => (closeMenu(e), actions.share())}>
              Share link…
            </button>
          </div>
        </details>
        <div class="tgroup">
          <label class="theme">
            <span class="visually-hidden">Theme</span>
            <select
              value={state.settings.theme}
              onChange={(e) =>
                store.dispatch({
                  type: 'settings',
                  patch: { theme: (e.currentTarget as HTMLSelectElement).value as AppState['settings']['theme'] },
                })
              }
            >
              <option value="auto">Theme: system</option>
              <option value="light">Theme: light</option>
              <option value="dark">Theme: dark</option>
            </select>
          </label>
          <button type="button" onClick={actions.showCautions}>
            Cautions
          </button>
        </div>
      </div>
      <input
        ref={fileInput}
        type="file"
        accept=".json,application/json"
        class="visually-hidden"
        tabIndex={-1}
        aria-hidden="true"
        data-testid="import-file"
        onChange={onFile}
      />
    </header>
  );
}
