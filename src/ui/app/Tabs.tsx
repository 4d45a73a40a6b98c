// The screen navigation: ten screens in three groups (Design, Listen, Decide), one row at tablet and
// desktop widths. Each group is a tab list with one tab stop; arrow keys, Home and End move through
// all ten screens. Narrow windows show each tab's short label (a word of its name, which stays the
// tab's accessible name).
import type { ScreenId } from '../store.ts';
import { SCREENS, SCREEN_GROUPS } from './screens.tsx';

export function Tabs(p: { screen: ScreenId; go: (screen: ScreenId) => void }) {
  const { screen } = p;
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
    <nav class="tabs" aria-label="Screens" onKeyDown={onTabKey}>
      {SCREEN_GROUPS.map((group) => {
        const members = SCREENS.filter((s) => s.group === group);
        // One tab stop per group: its current screen, else its first.
        const stop = members.some((s) => s.id === screen) ? screen : members[0].id;
        const current = members.some((s) => s.id === screen);
        return (
          <div class={`tab-group${current ? ' current' : ''}`}>
            <span class="tab-group-name" id={`tabs-${group}`} aria-hidden="true">
              {group}
            </span>
            <div role="tablist" aria-label={group}>
              {members.map((s) => (
                <button
                  type="button"
                  role="tab"
                  id={`tab-${s.id}`}
                  aria-label={s.label}
                  aria-selected={screen === s.id}
                  aria-controls="screen"
                  tabIndex={s.id === stop ? 0 : -1}
                  class={screen === s.id ? 'active' : ''}
                  data-short={s.short}
                  onClick={() => p.go(s.id)}
                >
                  <span class="tab-label">{s.label}</span>
                </button>
              ))}
            </div>
          </div>
        );
      })}
    </nav>
  );
}
