// The project: its name, its variants (rename, compare as A or B, duplicate, remove), one planned
// level for all of them, and the project file (save, open). Removing a variant asks first.
import { MAX_VARIANTS } from '../project.ts';
import { SLOTS, SLOT_LABEL, type AppState, type Store } from '../store.ts';
import { Dialog } from '../components/Dialog.tsx';
import type { ConfirmQuestion } from './dialogs.tsx';

export interface ProjectActions {
  exportProject: () => void;
  importFile: (file: File) => void;
  /** Makes a link that carries the whole project. */
  share: () => void;
  confirm: (q: ConfirmQuestion) => Promise<boolean>;
}

const value = (e: Event) => (e.currentTarget as HTMLInputElement).value;

export function ProjectDialog(p: { store: Store; state: AppState; actions: ProjectActions; onClose: () => void }) {
  const { store, state, actions } = p;
  const { project } = state;
  const full = project.variants.length >= MAX_VARIANTS;
  const remove = async (id: string, name: string) => {
    const ok = await actions.confirm({
      title: 'Remove this variant?',
      text: `“${name}” leaves the project. Undo brings it back; save the project file first to keep a copy.`,
      action: 'Remove the variant',
    });
    if (ok) store.dispatch({ type: 'remove-variant', id });
  };
  return (
    <Dialog id="project" title="Project" onClose={p.onClose}>
      <label class="stack">
        <span>Project name</span>
        <input
          type="text"
          maxLength={200}
          value={project.name}
          data-testid="project-name"
          onInput={(e) => store.dispatch({ type: 'rename-project', name: value(e) })}
        />
      </label>
      <table class="variants" data-testid="variants">
        <caption class="visually-hidden">Variants of the project</caption>
        <thead>
          <tr>
            <th scope="col">Variant</th>
            <th scope="col">Compared as</th>
            <th scope="col">
              <span class="visually-hidden">Actions</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {project.variants.map((v, i) => (
            <tr key={v.id}>
              <td>
                <input
                  type="text"
                  maxLength={200}
                  value={v.design.name}
                  aria-label={`Name of variant ${i + 1}`}
                  onInput={(e) => store.dispatch({ type: 'rename-variant', id: v.id, name: value(e) })}
                />
              </td>
              <td class="compare-cell">
                {SLOTS.map((s) => (
                  <label class="compare-pick">
                    <input
                      type="radio"
                      name={`compare-${s}`}
                      checked={project.compared[s] === v.id}
                      onChange={() => store.dispatch({ type: 'compare', slot: s, id: v.id })}
                    />
                    <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span>
                    <span class="visually-hidden">
                      {' '}
                      compare “{v.design.name}” as {SLOT_LABEL[s]}
                    </span>
                  </label>
                ))}
              </td>
              <td class="variant-actions">
                <button type="button" disabled={full} onClick={() => store.dispatch({ type: 'duplicate-variant', id: v.id })}>
                  Duplicate<span class="visually-hidden"> “{v.design.name}”</span>
                </button>
                <button type="button" disabled={project.variants.length <= 1} onClick={() => void remove(v.id, v.design.name)}>
                  Remove<span class="visually-hidden"> “{v.design.name}”</span>
                </button>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <p class="fine">
        {project.variants.length} of at most {MAX_VARIANTS} variants. Screens compare the two chosen as A and B; the Listening bench can
        switch among up to four.
      </p>
      <label class="check">
        <input
          type="checkbox"
          checked={project.sharedLevel}
          data-testid="share-level"
          onChange={(e) => store.dispatch({ type: 'share-level', shared: (e.currentTarget as HTMLInputElement).checked })}
        />{' '}
        One planned level for every variant (set on Drive &amp; seat; the level of A is taken when this is turned on)
      </label>
      <div class="row-actions">
        <button type="button" onClick={actions.exportProject}>
          Save project file
        </button>
        <button type="button" onClick={actions.share} data-testid="share-project">
          Share the project as a link…
        </button>
        <label class="button-like">
          Open a project file, or add a design file as a variant…
          <input
            type="file"
            accept=".json,application/json"
            class="visually-hidden"
            data-testid="project-file"
            onChange={(e) => {
              const el = e.currentTarget as HTMLInputElement;
              const file = el.files?.[0];
              el.value = '';
              if (file) actions.importFile(file);
            }}
          />
        </label>
      </div>
    </Dialog>
  );
}
