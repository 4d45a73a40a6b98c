// The header, one compact row where the window allows: the brand, the two compared variants, and the
// toolbar (undo, the pair's actions, files, display preferences, cautions) with the hidden file input
// the import uses. Menus are disclosures of plain buttons. Destructive actions ask.
import { useRef } from 'preact/hooks';
import type { Derived } from '../engine.ts';
import { SLOTS, SLOT_LABEL, type AppState, type Slot, type Store } from '../store.ts';
import type { ConfirmQuestion } from './dialogs.tsx';
import { passivePair } from '../demo.ts';
import { addVariant, MAX_VARIANTS } from '../project.ts';
import { plural } from '../format.ts';
import { UNIT_SYSTEMS, unitSystemOf, type UnitSystem } from '../units.ts';
import { PairPicker } from './PairPicker.tsx';

export interface HeaderActions {
  importInto: (file: File, slot: Slot) => void;
  exportDesign: (slot: Slot) => void;
  exportProject: () => void;
  share: () => void;
  showCautions: () => void;
  confirm: (q: ConfirmQuestion) => Promise<boolean>;
  compare: (slot: Slot, id: string) => void;
  openProject: () => void;
}

function closeMenu(e: Event) {
  (e.currentTarget as HTMLElement).closest('details')?.removeAttribute('open');
}

export function Header(p: { store: Store; state: AppState; derived: Record<Slot, Derived>; actions: HeaderActions }) {
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
  const copyAToB = async () => {
    const ok = await actions.confirm({
      title: 'Copy A over B?',
      text: `Every setting of “${state.designs.b.name}” is replaced by those of “${state.designs.a.name}” (B keeps its name). Undo brings it back.`,
      action: 'Copy A to B',
    });
    if (ok) store.dispatch({ type: 'copy-a-to-b' });
  };
  const resetDemo = async () => {
    const ok = await actions.confirm({
      title: 'Reset to the demo pair?',
      text: `The project “${state.project.name}” and its ${plural(state.project.variants.length, 'variant')} give way to the two demo designs. Undo brings them back; save the project file first to keep a copy.`,
      action: 'Reset to the demo pair',
    });
    if (ok) store.dispatch({ type: 'reset-demo' });
  };
  // The passive examples join the project as two new variants compared as A and B; only a full
  // project makes them replace the compared pair, and that asks first.
  const passiveExamples = async () => {
    const pair = passivePair();
    const { project } = state;
    if (project.variants.length + 2 <= MAX_VARIANTS) {
      const next = addVariant(addVariant(project, pair.a, 'a'), pair.b, 'b');
      store.dispatch({ type: 'replace-project', project: next, reason: 'the passive two-way pair' });
      return;
    }
    const ok = await actions.confirm({
      title: 'Replace the compared pair?',
      text: `The project holds ${MAX_VARIANTS} variants, the most it can: “${state.designs.a.name}” and “${state.designs.b.name}” would be replaced by the two passive examples. Undo brings them back.`,
      action: 'Replace A and B',
    });
    if (ok) store.dispatch({ type: 'replace-pair', designs: pair, reason: 'the passive two-way pair' });
  };
  const units = unitSystemOf(state.settings);
  return (
    <header class="top">
      <div class="brand">
        <img src="/icons/icon.svg" alt="" width={24} height={24} />
        <span class="brand-name">preheard</span>
        <span class="brand-tag">hear a design before building it</span>
      </div>
      <PairPicker state={state} derived={p.derived} compare={actions.compare} openProject={actions.openProject} />
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
        <details class="menu tgroup" data-testid="pair-menu">
          <summary>Pair</summary>
          <div class="menu-body">
            <button
              type="button"
              disabled={state.project.compared.a === state.project.compared.b}
              onClick={(e) => (closeMenu(e), void copyAToB())}
            >
              Copy A to B…
            </button>
            <button type="button" onClick={(e) => (closeMenu(e), store.dispatch({ type: 'swap' }))}>
              Swap A and B
            </button>
            <button type="button" onClick={(e) => (closeMenu(e), void passiveExamples())}>
              Passive two-way pair
            </button>
            <button type="button" onClick={(e) => (closeMenu(e), void resetDemo())}>
              Reset to demo pair…
            </button>
          </div>
        </details>
        <details class="menu tgroup" data-testid="files-menu">
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
        <details class="menu tgroup" data-testid="view-menu">
          <summary>View</summary>
          <div class="menu-body menu-form">
            <label class="theme">
              Theme
              <select
                value={state.settings.theme}
                onChange={(e) =>
                  store.dispatch({
                    type: 'settings',
                    patch: { theme: (e.currentTarget as HTMLSelectElement).value as AppState['settings']['theme'] },
                  })
                }
              >
                <option value="auto">system</option>
                <option value="light">light</option>
                <option value="dark">dark</option>
              </select>
            </label>
            <label>
              Units
              <select
                data-testid="units"
                value={units}
                onChange={(e) =>
                  store.dispatch({ type: 'settings', patch: { units: (e.currentTarget as HTMLSelectElement).value as UnitSystem } })
                }
              >
                {UNIT_SYSTEMS.map((u) => (
                  <option value={u.id}>{u.label}</option>
                ))}
              </select>
            </label>
            <p class="fine">Design files keep SI units whatever is shown.</p>
          </div>
        </details>
        <button type="button" onClick={actions.showCautions}>
          Cautions
        </button>
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
