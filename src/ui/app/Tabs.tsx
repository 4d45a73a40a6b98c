// The screen tabs (arrow keys, Home and End move between them) and the two designs' names.
import type { Derived } from '../engine.ts';
import { SLOTS, SLOT_LABEL, type AppState, type ScreenId, type Slot } from '../store.ts';
import { SCREENS } from './screens.tsx';

export function Tabs(p: { state: AppState; derived: Record<Slot, Derived>; go: (screen: ScreenId) => void }) {
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
      <div class="pair" aria-label="The two designs">
        {SLOTS.map((s) => (
          <span class={`pair-item pair-${s}`}>
            <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span>
            <span class="pair-name">{p.state.designs[s].name}</span>
            {p.derived[s].parse.ok ? null : (
              <span class="badge-error">{p.derived[s].issues.filter((i) => i.severity === 'error').length} errors</span>
            )}
          </span>
        ))}
      </div>
    </nav>
  );
}
