// The bench's variant switch: with more than two variants in the project, up to four of them are a
// click apart. The two compared as A and B play in their lanes (switching is instant); another
// variant takes the lane not being heard (it becomes the compared A or B) and is heard as soon as
// the lane has its design, a block or two later.
import type { BenchAudio, BenchState } from '../../audio/bench.ts';
import { MAX_BENCH_VARIANTS, type Project, type Variant } from '../project.ts';
import { distinctNames } from '../pair-names.ts';
import { SLOTS, SLOT_LABEL, type Slot, type Store } from '../store.ts';

/** The variants on the bench: the compared pair first, then the project's next ones, four at most. */
export function benchVariants(project: Project): Variant[] {
  const compared = SLOTS.map((s) => project.compared[s]);
  const first = project.variants.filter((v) => compared.includes(v.id));
  const rest = project.variants.filter((v) => !compared.includes(v.id));
  return [...first, ...rest].slice(0, MAX_BENCH_VARIANTS);
}

export function VariantSwitch(p: { bench: BenchAudio; state: BenchState; store: Store; project: Project }) {
  const { project } = p;
  if (project.variants.length <= 2) return null;
  const slotOf = (id: string): Slot | null => SLOTS.find((s) => project.compared[s] === id) ?? null;
  const listen = (v: Variant) => {
    const slot = slotOf(v.id) ?? (p.state.lane === 'a' ? 'b' : 'a');
    p.store.dispatch({ type: 'compare', slot, id: v.id });
    p.bench.selectLane(slot);
  };
  return (
    <div class="variant-switch" role="radiogroup" aria-label="Variant heard" data-testid="variant-switch">
      {benchVariants(project).map((v, i, shown) => {
        const slot = slotOf(v.id);
        const on = slot !== null && p.state.lane === slot;
        return (
          <button type="button" role="radio" aria-checked={on} class={`lane${on ? ' on' : ''}`} onClick={() => listen(v)}>
            {slot ? <span class={`chip chip-${slot}`}>{SLOT_LABEL[slot]}</span> : null}
            <span class="lane-name" title={v.design.name}>
              {distinctNames(shown.map((w) => w.design.name))[i]}
            </span>
          </button>
        );
      })}
      {project.variants.length > MAX_BENCH_VARIANTS ? (
        <span class="fine">
          The first {MAX_BENCH_VARIANTS} of {project.variants.length} variants; compare others as A or B to hear them.
        </span>
      ) : null}
    </div>
  );
}
