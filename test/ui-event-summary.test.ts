// Events summarised per design, kind and way: counts, time and the worst event, checked by hand.
import { describe, expect, it } from 'vitest';
import type { StressEvent } from '../src/engine/render/events.ts';
import { summarizeEvents } from '../src/ui/bench/event-summary.ts';

const ev = (kind: StressEvent['kind'], start: number, end: number, peak: number, limit: number, way?: string): StressEvent => ({
  kind,
  start_s: start,
  end_s: end,
  peak,
  limit,
  unit: 'mm',
  ...(way ? { way } : {}),
});

describe('event summary', () => {
  it('counts per design, kind and way, adds the time, and picks the event furthest past its limit', () => {
    const groups = summarizeEvents(
      {
        a: [
          ev('excursion', 1, 1.5, 6, 5),
          ev('excursion', 3, 3.25, 9, 5),
          ev('excursion', 4, 4.1, -7, 5, 'woofer'),
          ev('amplifier-clip', 2, 2.5, 1.2, 1, 'tweeter'),
        ],
        b: [ev('excursion', 1, 2, 5.5, 5)],
      },
      (s) => (s === 'a' ? 'woofer' : 'bass'),
    );
    const aExc = groups.find((g) => g.slot === 'a' && g.kind === 'excursion');
    expect(aExc?.count).toBe(3);
    expect(aExc?.seconds).toBeCloseTo(0.5 + 0.25 + 0.1, 12);
    expect(aExc?.worst.start_s).toBe(3);
    expect(groups.find((g) => g.slot === 'a' && g.kind === 'amplifier-clip')?.way).toBe('tweeter');
    expect(groups.find((g) => g.slot === 'b')?.way).toBe('bass');
    expect(groups).toHaveLength(3);
    // Design A first, its most frequent group first.
    expect(groups.map((g) => `${g.slot}:${g.kind}`)).toEqual(['a:excursion', 'a:amplifier-clip', 'b:excursion']);
  });
});
