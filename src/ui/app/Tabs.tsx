// The screen tabs (arrow keys, Home and End move between them) and the two compared variants, each
// chosen from the project's variants, with the project's own dialog one button away.
import type { Derived } from '../engine.ts';
import { SLOTS, SLOT_LABEL, type AppState, type ScreenId, type Slot } from '../store.ts';
import { SCREENS } from './screens.tsx';
import { plural } from '../format.ts';

export function Tabs(p: {
  state: AppState;
  derived: Record<Slot, Derived>;
  go: (screen: ScreenId) => void;
  compare: (slot: Slot, id: string) => void;
  openProject: () => void;
}) {
  const { project } = p.state;
  const screen = p.state.settings.screen;
  const onTabKey = (e: KeyboardEvent) => {
    const i = SCREENS.findIndex((s) => s.id === screen);
    let j = -1;
    if (e.key === 'ArrowRight') j = (i + 1) % SCREENS.length;
    else if (e.key === 'ArrowLeft') j = (i - 1 + SCREENS.length) % SCREENS.length;
    else if (e.key === 'Home') j = 0;
    else if (e.key === 'End') j = SCREENS.length - 1;
    if (j < 0) return;
    e.preventDefault();
    p.go(SCREENS[j].id);
    document.getElementById(`tab-${SCREENS[j].id}`)?.focus();
  };
  return (
    <nav class="tabs" aria-label="Screens">
      <div role="tablist" aria-label="Screens" onKeyDown={onTabKey}>
        {SCREENS.map((s) => (
          <button
            type="button"
            role="tab"
            id={`tab-${s.id}`}
            aria-selected={screen === s.id}
            aria-controls="screen"
            tabIndex={screen === s.id ? 0 : -1}
            class={screen === s.id ? 'active' : ''}
            onClick={() => p.go(s.id)}
          >
            {s.label}
          </button>
        ))}
      </div>
      <div class="pair" role="group" aria-label="The two variants compared">
        {SLOTS.map((s) => (
          <span class={`pair-item pair-${s}`}>
            <label class="pair-pick">
              <span class={`chip chip-${s}`} aria-hidden="true">
                {SLOT_LABEL[s]}
              </span>
              <span class="visually-hidden">Variant compared as {SLOT_LABEL[s]}</span>
              <select
                class="pair-name"
                data-testid={`compare-${s}`}
                value={project.compared[s]}
                title={p.state.designs[s].name}
                onChange={(e) => p.compare(s, (e.currentTarget as HTMLSelectElement).value)}
              >
                {project.variants.map((v) => (
                  <option value={v.id}>{v.design.name}</option>
                ))}
              </select>
            </label>
            {p.derived[s].parse.ok ? null : (
              <span class="badge-error">{plural(p.derived[s].issues.filter((i) => i.severity === 'error').length, 'error')}</span>
            )}
          </span>
        ))}
        <button type="button" class="project-button" data-testid="open-project" onClick={p.openProject}>
          Project ({project.variants.length})
        </button>
      </div>
    </nav>
  );
}
