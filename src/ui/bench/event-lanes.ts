// The Stress strip's lanes: one per way of each design, holding that way's stress events (every
// kind, told apart by colour). Events from a render that names no way belong to the first way.
import type { StressEvent } from '../../engine/render/index.ts';
import type { DesignSlot } from '../../audio/protocol.ts';

export interface EventLane {
  slot: DesignSlot;
  /** The way's name. */
  way: string;
  events: StressEvent[];
}

/** The way an event happened in: its own field when the render gives one. */
export const wayOfEvent = (e: StressEvent, firstWay: string): string => {
  const way = (e as StressEvent & { way?: unknown }).way;
  return typeof way === 'string' ? way : firstWay;
};

/**
 * Lanes in design order: A's ways, then B's. `ways` lists each design's ways that can be stressed
 * (its driver ways, first driver way first); a way named only by events gets a lane after them.
 */
export function eventLanes(events: Record<DesignSlot, StressEvent[]>, ways: Record<DesignSlot, string[]>): EventLane[] {
  const out: EventLane[] = [];
  for (const slot of ['a', 'b'] as const) {
    const names = ways[slot].length ? [...ways[slot]] : [''];
    const bins = new Map<string, StressEvent[]>(names.map((n) => [n, []]));
    for (const e of events[slot]) {
      const w = wayOfEvent(e, names[0]);
      let bin = bins.get(w);
      if (!bin) {
        bin = [];
        bins.set(w, bin);
      }
      bin.push(e);
    }
    for (const [way, list] of bins) out.push({ slot, way, events: list });
  }
  return out;
}
