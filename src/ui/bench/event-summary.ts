// The stress events of a render summarised as a reader needs them at high levels, where they are
// too many to list: per design, kind and way, how many, how long in all, and the worst one (the
// highest peak against its limit), so the user can jump straight to it.
import type { EventKind, StressEvent } from '../../engine/render/events.ts';
import type { Slot } from '../store.ts';
import { wayOfEvent } from './event-lanes.ts';

export interface EventGroup {
  slot: Slot;
  kind: EventKind;
  /** The way whose limit was crossed (the first driver way's name for events that name none). */
  way: string;
  count: number;
  /** Total time spent in these events, s. */
  seconds: number;
  worst: StressEvent;
}

/** How far past its limit an event went: peak / limit (1 at the limit). */
export const severity = (e: StressEvent): number => (e.limit > 0 ? Math.abs(e.peak) / e.limit : Math.abs(e.peak));

export function summarizeEvents(events: Record<Slot, StressEvent[]>, firstWay: (s: Slot) => string): EventGroup[] {
  const groups = new Map<string, EventGroup>();
  for (const slot of ['a', 'b'] as const) {
    for (const e of events[slot]) {
      const way = wayOfEvent(e, firstWay(slot));
      const key = `${slot}\u0000${e.kind}\u0000${way}`;
      const g = groups.get(key);
      const span = Math.max(0, e.end_s - e.start_s);
      if (!g) groups.set(key, { slot, kind: e.kind, way, count: 1, seconds: span, worst: e });
      else {
        g.count++;
        g.seconds += span;
        if (severity(e) > severity(g.worst)) g.worst = e;
      }
    }
  }
  return [...groups.values()].sort((x, y) => x.slot.localeCompare(y.slot) || y.count - x.count);
}
