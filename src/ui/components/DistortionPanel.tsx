// The Curves screen's distortion section: stepped-sine THD, H3 and compression of the sum (and of
// each way on demand) from the large-signal model, computed in a Worker per design on request,
// with progress and cancel. Nothing runs until the user asks: the sweep takes seconds.
import { useEffect, useRef, useState } from 'preact/hooks';
import DistortionWorker from '../../audio/distortion.worker.ts?worker';
import type { DistortionJob, DistortionReply } from '../../audio/distortion.worker.ts';
import type { DistortionCurves, DistortionPoint } from '../../engine/distortion/stepped-sine.ts';
import { useApp } from '../context.ts';
import { ChartCard } from '../screens/Curves.tsx';
import { TITLES, type ChartSpec, type DistortionChartId, type SeriesSpec } from '../charts/specs.ts';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';

/** The part of a Worker the panel uses (so a test can hand in a stand-in). */
export interface DistortionWorkerLike {
  postMessage(job: DistortionJob): void;
  onmessage: ((e: MessageEvent<DistortionReply>) => void) | null;
  terminate(): void;
}

let workerFactory = (): DistortionWorkerLike => new DistortionWorker() as unknown as DistortionWorkerLike;
/** Replaces the Worker the panel starts (tests hand in a stand-in). */
export function setDistortionWorkerFactory(make: () => DistortionWorkerLike): void {
  workerFactory = make;
}

type Run =
  | { kind: 'idle' }
  | { kind: 'running'; done: Record<Slot, number> }
  | { kind: 'done'; curves: Record<Slot, DistortionCurves | null> }
  | { kind: 'error'; message: string };

const FIGURES: { id: DistortionChartId; key: keyof DistortionPoint; unit: string; digits: number }[] = [
  { id: 'thd', key: 'thdPct', unit: '%', digits: 3 },
  { id: 'h3', key: 'h3Db', unit: 'dB', digits: 1 },
  { id: 'compression', key: 'compressionDb', unit: 'dB', digits: 2 },
];

function specs(curves: Record<Slot, DistortionCurves | null>, showWays: boolean): ChartSpec[] {
  const any = curves.a ?? curves.b;
  if (!any) return [];
  const freqHz = Float64Array.from(any.sum.map((p) => p.freqHz));
  return FIGURES.map((fig) => {
    const series: SeriesSpec[] = [];
    for (const s of SLOTS) {
      const c = curves[s];
      if (!c || c.sum.length !== freqHz.length) continue;
      series.push({ label: `${SLOT_LABEL[s]} sum`, role: s, values: c.sum.map((p) => p[fig.key]) });
      if (showWays && c.ways.length > 1)
        for (const w of c.ways)
          series.push({
            label: `${SLOT_LABEL[s]} ${w.name}`,
            role: s === 'a' ? 'a-way' : 'b-way',
            values: w.points.map((p) => p[fig.key]),
          });
    }
    const worst = SLOTS.flatMap((s) =>
      curves[s]
        ? [
            `${SLOT_LABEL[s]}: at most ${Math.max(...curves[s]!.sum.map((p) => p.thdPct)).toPrecision(3)} % THD at ${curves[s]!.levelsVolts.toPrecision(3)} V rms`,
          ]
        : [],
    );
    return {
      id: fig.id,
      title: TITLES[fig.id],
      unit: fig.unit,
      digits: fig.digits,
      freqHz,
      series,
      summary: fig.key === 'thdPct' ? worst : [],
    };
  });
}

export function DistortionPanel(p: { theme: string }) {
  const { state, derived } = useApp();
  const [run, setRun] = useState<Run>({ kind: 'idle' });
  const workers = useRef<DistortionWorkerLike[]>([]);
  const stop = () => {
    for (const w of workers.current) w.terminate();
    workers.current = [];
  };
  useEffect(() => stop, []);
  // A result belongs to the designs it was computed for: an edit makes it stale, so it goes.
  useEffect(() => {
    stop();
    setRun({ kind: 'idle' });
  }, [state.designs]);

  const start = () => {
    stop();
    const done: Record<Slot, number> = { a: 0, b: 0 };
    const curves: Record<Slot, DistortionCurves | null> = { a: null, b: null };
    const pending = new Set<Slot>();
    SLOTS.forEach((s, id) => {
      const system = derived[s].system;
      if (!system || derived[s].stale) return;
      const w = workerFactory();
      workers.current.push(w);
      pending.add(s);
      w.onmessage = (e) => {
        const m = e.data;
        if (m.type === 'progress') {
          done[s] = m.done;
          setRun({ kind: 'running', done: { ...done } });
        } else if (m.type === 'result') {
          curves[s] = m.curves;
          pending.delete(s);
          if (pending.size === 0) {
            stop();
            setRun({ kind: 'done', curves: { ...curves } });
          }
        } else {
          stop();
          setRun({ kind: 'error', message: m.message });
        }
      };
      w.postMessage({ type: 'distortion', id, system });
    });
    setRun(pending.size ? { kind: 'running', done } : { kind: 'error', message: 'neither design is valid: fix the problems listed first' });
  };
  const cancel = () => {
    stop();
    setRun({ kind: 'idle' });
  };
  const share = run.kind === 'running' ? (run.done.a + run.done.b) / 2 : 0;
  return (
    <section class="distortion-panel" aria-labelledby="distortion-h">
      <h3 id="distortion-h">Distortion (large-signal model)</h3>
      <p class="sheet-intro">
        Steady sine tones at each design's planned level, one frequency at a time, through each way's filter: total harmonic distortion (2nd
        to 5th), the third harmonic and the compression of the fundamental at the seat. An estimate from the model, not a measurement.
      </p>
      <div class="distortion-actions">
        {run.kind === 'running' ? (
          <>
            <progress max={1} value={share} aria-label="Distortion sweep progress" />
            <button type="button" onClick={cancel}>
              Cancel
            </button>
          </>
        ) : (
          <button type="button" onClick={start}>
            {run.kind === 'done' ? 'Compute again' : 'Compute distortion'}
          </button>
        )}
        {run.kind === 'error' ? <span role="alert">{run.message}</span> : null}
      </div>
      {run.kind === 'done' ? (
        <div class="chart-grid">
          {specs(run.curves, state.settings.showWays ?? false).map((c) => (
            <ChartCard spec={c} theme={p.theme} />
          ))}
        </div>
      ) : null}
    </section>
  );
}
