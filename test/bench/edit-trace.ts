// The Curves bench's traced round: how much of an edit's time is the page's own work. A Chromium
// trace (DevTools protocol) of a round of edits, each edit marked with `performance.measure`; per
// edit, the thread time of the page's main thread (the top-level tasks' `tdur`) beside the wall
// time. An edit whose wall time is well over its thread time waited for a core (the compositor,
// raster and compiler threads, other processes): the machine's noise, not the page's work.
import type { CDPSession } from 'playwright-core';

/** Name of the measure the page puts around each edit (see ui-redraw.ts MEASURE). */
export const EDIT_MEASURE = 'preheard-edit';

interface TraceEvent {
  name: string;
  ph: string;
  ts: number;
  dur?: number;
  tdur?: number;
  pid: number;
  tid: number;
  cat?: string;
  args?: { name?: string };
}

export interface EditCost {
  /** Wall time of the edit, ms. */
  wall: number;
  /** Thread time of the page's main thread inside the edit, ms. */
  cpu: number;
}

/** Runs `edits` with a trace on and returns each measured edit's wall and main-thread time. */
export async function tracedEdits(cdp: CDPSession, edits: () => Promise<unknown>): Promise<EditCost[]> {
  const events: TraceEvent[] = [];
  cdp.on('Tracing.dataCollected', (e) => {
    events.push(...(e.value as unknown as TraceEvent[]));
  });
  const complete = new Promise<void>((done) => cdp.once('Tracing.tracingComplete', () => done()));
  await cdp.send('Tracing.start', {
    transferMode: 'ReportEvents',
    // The frame's own phases (blink: layout and paint; cc: the commit with the canvases) must be
    // traced too: the edit starts inside the frame's task, so only events inside it are counted.
    traceConfig: {
      includedCategories: [
        'toplevel',
        'blink.user_timing',
        'devtools.timeline',
        'disabled-by-default-devtools.timeline',
        'blink',
        'cc',
        'v8',
      ],
    },
  });
  try {
    await edits();
  } finally {
    await cdp.send('Tracing.end');
    await complete;
  }
  return editCosts(events);
}

/** Each marked edit's wall time and the main thread's thread time inside it. */
export function editCosts(events: TraceEvent[]): EditCost[] {
  const spans = new Map<string, { start?: number; end?: number; pid: number }>();
  for (const e of events) {
    if (!e.cat?.includes('user_timing') || !e.name.startsWith(EDIT_MEASURE)) continue;
    const s = spans.get(e.name) ?? { pid: e.pid };
    if (e.ph === 'b') s.start = e.ts;
    if (e.ph === 'e') s.end = e.ts;
    spans.set(e.name, s);
  }
  const edits = [...spans.values()].filter((s) => s.start !== undefined && s.end !== undefined).sort((a, b) => a.start! - b.start!);
  if (edits.length === 0) return [];
  const pid = edits[0].pid;
  const main = events.find((e) => e.ph === 'M' && e.name === 'thread_name' && e.pid === pid && e.args?.name === 'CrRendererMain');
  if (!main) return [];
  // The main thread's events in time order, the outer one first where two start together.
  const slices = events
    .filter((e) => e.pid === pid && e.tid === main.tid && e.ph === 'X' && e.dur !== undefined)
    .sort((a, b) => a.ts - b.ts || b.dur! - a.dur!);
  const out: EditCost[] = [];
  let k = 0;
  let coveredTo = -Infinity;
  for (const edit of edits) {
    let cpu = 0;
    for (; k < slices.length && slices[k].ts < edit.end!; k++) {
      const t = slices[k];
      // The outermost events that start inside the edit: the edit begins inside a task (the bench
      // edits in an animation-frame callback), so that task's own events count, not the task.
      if (t.ts < edit.start! || t.ts < coveredTo) continue;
      coveredTo = t.ts + t.dur!;
      cpu += (t.tdur ?? 0) / 1000;
    }
    out.push({ wall: (edit.end! - edit.start!) / 1000, cpu });
  }
  return out;
}
