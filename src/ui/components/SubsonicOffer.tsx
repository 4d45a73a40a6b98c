// Checks that act: when a design's first limit at the planned level is cone excursion below its box
// tuning, the engine's subsonic high-pass (align/subsonic.ts) is offered, applied in one undoable step.
import { useApp } from '../context.ts';
import { subsonicFor } from '../engine.ts';
import { num } from '../format.ts';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';

function Offer({ slot }: { slot: Slot }) {
  const { state, derived, store, dispatch } = useApp();
  const d = derived[slot];
  if (!d.parse.ok || d.stale || !d.system || !d.analysis) return null;
  const s = subsonicFor(d.system, d.analysis);
  if (!s) return null;
  const apply = () => {
    const design = store.get().designs[slot];
    const ways = design.ways.map((w, i) => {
      if (i !== s.wayIndex || w.kind === 'flat') return w;
      const filter = w.filter?.type === 'active' ? w.filter : { type: 'active' as const };
      return { ...w, filter: { ...filter, highpass: { shape: 'bw2' as const, hz: s.cornerHz } } };
    });
    dispatch({
      type: 'replace',
      slot,
      design: { ...design, ways },
      reason: `add a ${s.cornerHz} Hz subsonic high-pass to ${SLOT_LABEL[slot]}`,
    });
  };
  const several = state.designs[slot].ways.length > 1;
  return (
    <div class="offer" data-testid={`subsonic-${slot}`}>
      <p>
        <span class={`chip chip-${slot}`}>{SLOT_LABEL[slot]}</span> At the planned level the cone passes Xmax below the {num(s.fbHz)} Hz
        tuning: {num(s.beforeMm)} mm at {num(s.beforeHz)} Hz against {num(s.xmaxMm)} mm. A {s.cornerHz} Hz subsonic high-pass (2nd-order
        Butterworth{several ? `, on the ${s.wayName}` : ''}) keeps it to {num(s.afterMm)} mm.
      </p>
      <p class="fine">
        The corner is the lowest whole hertz at which the filter brings every excursion below the tuning within Xmax, checked with the
        filter in place (the planned drive rises a little when bass is taken out).
      </p>
      <button type="button" class="small" onClick={apply}>
        Add the {s.cornerHz} Hz high-pass to {SLOT_LABEL[slot]}
      </button>
    </div>
  );
}

export function SubsonicOffers() {
  return (
    <>
      {SLOTS.map((s) => (
        <Offer slot={s} />
      ))}
    </>
  );
}
