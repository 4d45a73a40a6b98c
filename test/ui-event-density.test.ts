// The Stress strip's density lanes: the share of each second spent in each kind of stress event.
// Expected shares are worked out by hand from the event times below.
import { describe, expect, it } from 'vitest';
import type { StressEvent } from '../src/engine/render/index.ts';
import { binWidth, densityLane, sharesAt } from '../src/ui/bench/event-density.ts';

const ev = (kind: StressEvent['kind'], start_s: number, end_s: number, way?: string): StressEvent =>
  ({ kind, start_s, end_s, peak: 6, unit: 'mm', limit: 5, ...(way ? { way } : {}) }) as StressEvent;

describe('event density', () => {
  it('adds each event’s overlap with each second, per kind', () => {
    const lane = densityLane('a', [ev('excursion', 0.5, 1.25), ev('excursion', 2.9, 3.0), ev('port-speed', 1.0, 1.1)], 4, 1);
    expect(lane.bins).toBe(4);
    expect([...lane.share.get('excursion')!]).toEqual([0.5, 0.25, expect.closeTo(0.1, 6), 0]);
    expect([...lane.share.get('port-speed')!].map((x) => Number(x.toFixed(6)))).toEqual([0, 0.1, 0, 0]);
    expect(lane.share.has('xlim')).toBe(false);
  });

  it('counts overlapping events of one kind once (two ways at once), and never past the whole second', () => {
    const lane = densityLane('b', [ev('excursion', 0, 0.8, 'woofer'), ev('excursion', 0.4, 1.0, 'tweeter'), ev('excursion', 0, 3)], 3, 1);
    expect([...lane.share.get('excursion')!]).toEqual([1, 1, 1]);
    const apart = densityLane('b', [ev('excursion', 0, 0.3, 'woofer'), ev('excursion', 0.5, 0.7, 'tweeter')], 1, 1);
    expect(apart.share.get('excursion')![0]).toBeCloseTo(0.5, 6);
  });

  it('shares a last partial second by its own length, and clips events to the track', () => {
    const lane = densityLane('a', [ev('amplifier-clip', 2.0, 2.25), ev('amplifier-clip', -1, 0.1), ev('amplifier-clip', 2.4, 9)], 2.5, 1);
    expect(lane.bins).toBe(3);
    expect(lane.share.get('amplifier-clip')![0]).toBeCloseTo(0.1, 6);
    expect(lane.share.get('amplifier-clip')![2]).toBeCloseTo((0.25 + 0.1) / 0.5, 6);
  });

  it('widens the bins to whole seconds on a long track and orders a bin’s kinds by share', () => {
    expect(binWidth(290, 600)).toBe(1);
    expect(binWidth(1800, 600)).toBe(3);
    const lane = densityLane('a', [ev('excursion', 0, 1), ev('port-speed', 0, 2.4), ev('distortion', 5, 6)], 6, 3);
    expect(lane.bins).toBe(2);
    expect(sharesAt(lane, 0)).toEqual([
      { kind: 'port-speed', share: expect.closeTo(0.8, 6) },
      { kind: 'excursion', share: expect.closeTo(1 / 3, 6) },
    ]);
    expect(sharesAt(lane, 1)).toEqual([{ kind: 'distortion', share: expect.closeTo(1 / 3, 6) }]);
    expect(sharesAt(lane, 7)).toEqual([]);
  });

  it('stays finite on empty or degenerate input', () => {
    const lane = densityLane('a', [ev('excursion', 1, 1), ev('excursion', Number.NaN, 2)], 0.2, 1);
    expect(lane.bins).toBe(1);
    expect(lane.share.size).toBe(0);
  });
});
