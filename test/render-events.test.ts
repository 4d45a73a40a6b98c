// The stress event log: marks merge within MERGE_GAP_S, a span of frames with one value is one
// mark at each end, and limits and open records are kept per source and kind (expected values
// worked out by hand from the merge rule, common practice, no source).
import { describe, expect, it } from 'vitest';
import { EV_COIL, EV_COMPRESSION, EV_EXCURSION, EventLog, MERGE_GAP_S, OUTPUT_SOURCE } from '../src/engine/render/events.ts';

describe('EventLog', () => {
  it('merges marks closer than the gap and opens a new event after it', () => {
    const ev = new EventLog();
    const s = ev.sourceOf('woofer');
    ev.setLimit(s, EV_EXCURSION, 5);
    ev.mark(s, EV_EXCURSION, 1.0, 6);
    ev.mark(s, EV_EXCURSION, 1.04, 7.5);
    ev.mark(s, EV_EXCURSION, 1.04 + MERGE_GAP_S + 0.001, 6.2);
    expect(ev.list(0, false)).toEqual([
      { kind: 'excursion', way: 'woofer', start_s: 1.0, end_s: 1.04, peak: 7.5, unit: 'mm', limit: 5 },
      {
        kind: 'excursion',
        way: 'woofer',
        start_s: 1.04 + MERGE_GAP_S + 0.001,
        end_s: 1.04 + MERGE_GAP_S + 0.001,
        peak: 6.2,
        unit: 'mm',
        limit: 5,
      },
    ]);
  });

  it('a span of frames with one value extends the open event to its last frame', () => {
    const ev = new EventLog();
    const s = ev.sourceOf('woofer');
    ev.setLimit(s, EV_COIL, 120);
    ev.mark(s, EV_COIL, 2.0, 121);
    ev.markSpan(s, EV_COIL, 2.01, 2.015, 123);
    ev.markSpan(s, EV_COIL, 2.2, 2.25, 122);
    expect(ev.count).toBe(2);
    const [a, b] = ev.list(0, false);
    expect([a.start_s, a.end_s, a.peak, a.limit]).toEqual([2.0, 2.015, 123, 120]);
    expect([b.start_s, b.end_s, b.peak]).toEqual([2.2, 2.25, 122]);
  });

  it('keeps limits and open events apart per source and kind, for ways added later', () => {
    const ev = new EventLog();
    ev.setLimit(OUTPUT_SOURCE, EV_COMPRESSION, 3);
    const names = ['a', 'b', 'c', 'd', 'e', 'f', 'g', 'h', 'i', 'j'];
    for (const [k, name] of names.entries()) ev.setLimit(ev.sourceOf(name), EV_COIL, 100 + k);
    ev.mark(ev.sourceOf('j'), EV_COIL, 0.5, 150);
    ev.mark(OUTPUT_SOURCE, EV_COMPRESSION, 0.5, 4);
    ev.mark(ev.sourceOf('a'), EV_COIL, 0.52, 140);
    // A kind without a limit reports 0.
    ev.mark(ev.sourceOf('a'), EV_EXCURSION, 0.6, 9);
    expect(ev.list(0, false).map((e) => [e.way ?? 'output', e.kind, e.limit, e.peak])).toEqual([
      ['j', 'coil-temperature', 109, 150],
      ['output', 'compression', 3, 4],
      ['a', 'coil-temperature', 100, 140],
      ['a', 'excursion', 0, 9],
    ]);
    ev.reset();
    ev.mark(ev.sourceOf('a'), EV_COIL, 0.53, 141);
    expect(ev.list(0, false)).toHaveLength(1);
  });
});
