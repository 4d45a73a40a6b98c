// The two compared variants: each picked from the project's variants by the part of its name that
// tells it apart, what differs between them in the designer's words, and the project's dialog.
import type { Derived } from '../engine.ts';
import { plural } from '../format.ts';
import { designDifferences } from '../pair-difference.ts';
import { distinctNames, sharedBeginning } from '../pair-names.ts';
import { SLOTS, SLOT_LABEL, type AppState, type Slot } from '../store.ts';

export function PairPicker(p: {
  state: AppState;
  derived: Record<Slot, Derived>;
  compare: (slot: Slot, id: string) => void;
  openProject: () => void;
}) {
  const { project, designs } = p.state;
  const names = project.variants.map((v) => v.design.name);
  const short = distinctNames(names);
  const shared = sharedBeginning(names);
  const same = project.compared.a === project.compared.b;
  const differences = same ? [] : designDifferences(designs.a, designs.b);
  const differenceText = same ? 'the same variant' : differences.length === 0 ? 'same settings' : `differ in ${differences.join(', ')}`;
  return (
    <div class="pair" role="group" aria-label="The two variants compared">
      {SLOTS.map((s) => (
        <span class={`pair-item pair-${s}`}>
          <label class="pair-pick">
            <span class={`chip chip-${s}`} aria-hidden="true">
              {SLOT_LABEL[s]}
            </span>
            <span class="visually-hidden">
              Variant compared as {SLOT_LABEL[s]}
              {shared ? ` (of ${shared})` : ''}
            </span>
            <select
              class="pair-name"
              data-testid={`compare-${s}`}
              value={project.compared[s]}
              title={designs[s].name}
              onChange={(e) => p.compare(s, (e.currentTarget as HTMLSelectElement).value)}
            >
              {project.variants.map((v, i) => (
                <option value={v.id}>{short[i]}</option>
              ))}
            </select>
          </label>
          {p.derived[s].parse.ok ? null : (
            <span class="badge-error">{plural(p.derived[s].issues.filter((i) => i.severity === 'error').length, 'error')}</span>
          )}
        </span>
      ))}
      <span class="pair-diff" data-testid="pair-difference" title={differenceText}>
        {differenceText}
      </span>
      <button type="button" class="project-button" data-testid="open-project" onClick={p.openProject}>
        Project ({project.variants.length})
      </button>
    </div>
  );
}
