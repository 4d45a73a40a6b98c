// The Curves bench's traced round (test/bench/edit-trace.ts): an edit's main-thread time is the sum
// of the outermost trace events that start inside it, whatever task it began in.
import { describe, expect, it } from 'vitest';
import { EDIT_MEASURE, editCosts } from './bench/edit-trace.ts';

const main = { name: 'thread_name', ph: 'M', ts: 0, pid: 1, tid: 7, args: { name: 'CrRendererMain' } };
const other = { name: 'thread_name', ph: 'M', ts: 0, pid: 1, tid: 8, args: { name: 'Compositor' } };
const mark = (i: number, ph: 'b' | 'e', ts: number) => ({ name: `${EDIT_MEASURE}-${i}`, cat: 'blink.user_timing', ph, ts, pid: 1, tid: 7 });
const slice = (ts: number, dur: number, tdur: number, tid = 7) => ({ name: 'x', ph: 'X', ts, dur, tdur, pid: 1, tid });

describe('edit costs from a trace', () => {
  it('counts the outermost events that start inside each edit, not the task it began in nor other threads', () => {
    const events = [
      main,
      other,
      // Edit 0 from 100 to 200 µs, begun inside a frame task (50 to 250).
      mark(0, 'b', 100),
      mark(0, 'e', 200),
      slice(50, 200, 190), // the frame's task: started before the edit
      slice(110, 40, 30), // script inside it
      slice(115, 5, 5), // nested in the script: already counted
      slice(150, 30, 20), // layout inside it
      slice(120, 50, 50, 8), // another thread
      slice(190, 20, 15), // a task starting in the edit and running past its end
      // Edit 1 from 300 to 350 µs: one task of its own.
      mark(1, 'b', 300),
      mark(1, 'e', 350),
      slice(305, 40, 12),
    ];
    const costs = editCosts(events as Parameters<typeof editCosts>[0]);
    expect(costs).toHaveLength(2);
    expect(costs[0].wall).toBeCloseTo(0.1, 12);
    expect(costs[0].cpu).toBeCloseTo((30 + 20 + 15) / 1000, 12);
    expect(costs[1].wall).toBeCloseTo(0.05, 12);
    expect(costs[1].cpu).toBeCloseTo(0.012, 12);
  });
});
