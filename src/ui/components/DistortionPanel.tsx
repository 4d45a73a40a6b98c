// The Curves screen's distortion section: stepped-sine THD, H3 and compression of the sum (and of
// each way on demand) from the large-signal model at a list of levels, and the two-tone
// intermodulation figure at a chosen pair, computed in a Worker per design on request, with
// progress and cancel. Nothing runs until the user asks: the sweep takes seconds.
import { useEffect, useRef, useState } from 'preact/hooks';
import DistortionWorker from '../../audio/distortion.worker.ts?worker';
import type { DistortionJob, DistortionReply, DistortionResult } from '../../audio/distortion.worker.ts';
import type { DistortionPoint } from '../../engine/distortion/stepped-sine.ts';
import type { IntermodulationFigure } from '../../engine/distortion/two-tone.ts';
import { useApp } from '../context.ts';
import { ChartCard } from '../screens/Curves.tsx';
import { TITLES, type ChartSpec, type DistortionChartId, type Role, type SeriesSpec } from '../charts/specs.ts';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';
import { num } from '../format.ts';
import { parseLevelList, parseTonePair } from '../distortion-input.ts';
import '../charts/curves.css';

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
  | { kind: 'done'; results: Record<Slot, DistortionResult | null> }
  | { kind: 'error'; message: string };

const FIGURES: { id: DistortionChartId; key: keyof DistortionPoint; unit: string; digits: number }[] = [
  { id: 'thd', key: 'thdPct', unit: '%', digits: 3 },
  { id: 'h3', key: 'h3Db', unit: 'dB', digits: 1 },
  { id: 'compression', key: 'compressionDb', unit: 'dB', digits: 2 },
];

const levelText = (db: number) => (db === 0 ? 'planned level' : `${db > 0 ? '+' : '−'}${num(Math.abs(db), 3)} dB`);

function specs(results: Record<Slot, DistortionResult | null>, showWays: boolean): ChartSpec[] {
  const any = results.a ?? results.b;
  if (!any?.levels.length) return [];
  const freqHz = Float64Array.from(any.levels[0].curves.sum.map((p) => p.freqHz));
  const many = any.levels.length > 1;
  return FIGURES.map((fig) => {
    const series: SeriesSpec[] = [];
    for (const s of SLOTS) {
      const r = results[s];
      if (!r) continue;
      r.levels.forEach(({ levelDb, curves: c }, li) => {
        if (c.sum.length !== freqHz.length) return;
        const at = many ? `, ${levelText(levelDb)}` : '';
        // The first level asked is drawn solid, the others dotted in the design's colour.
        series.push({
          label: `${SLOT_LABEL[s]} sum${at}`,
          role: (li === 0 ? s : `${s}-aux`) as Role,
          values: c.sum.map((p) => p[fig.key]),
        });
        if (showWays && li === 0 && c.ways.length > 1)
          for (const w of c.ways)
            series.push({
              label: `${SLOT_LABEL[s]} ${w.name}${at}`,
              role: s === 'a' ? 'a-way' : 'b-way',
              values: w.points.map((p) => p[fig.key]),
            });
      });
    }
    const worst = SLOTS.flatMap((s) =>
      (results[s]?.levels ?? []).map(
        ({ curves: c }) =>
          `${SLOT_LABEL[s]}: at most ${Math.max(...c.sum.map((p) => p.thdPct)).toPrecision(3)} % THD at ${c.levelsVolts.toPrecision(3)} V rms`,
      ),
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

const pctDb = (pct: number, db: number) => `${num(pct, 3)} % (${num(db, 3)} dB)`;

/** The two-tone figure of both designs as a table: IM2, IM3 and their total. */
function ImTable({ results, showWays }: { results: Record<Slot, DistortionResult | null>; showWays: boolean }) {
  const rows: { label: string; f: IntermodulationFigure }[] = [];
  for (const s of SLOTS) {
    const im = results[s]?.intermodulation;
    if (!im) continue;
    rows.push({ label: `${SLOT_LABEL[s]} sum`, f: im.sum });
    if (showWays && im.ways.length > 1) for (const w of im.ways) rows.push({ label: `${SLOT_LABEL[s]} ${w.name}`, f: w.figure });
  }
  if (!rows.length) return null;
  const f = rows[0].f;
  return (
    <table class="im-table" data-testid="im-table">
      <caption>
        Intermodulation: {f.f1Hz} Hz and {f.f2Hz} Hz at 4:1, together at the planned level's peak
      </caption>
      <thead>
        <tr>
          <th scope="col" />
          <th scope="col" class="n">
            2nd order (f2 ± f1)
          </th>
          <th scope="col" class="n">
            3rd order (f2 ± 2·f1)
          </th>
          <th scope="col" class="n">
            Total
          </th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr>
            <th scope="row">{r.label}</th>
            <td class="n">{pctDb(r.f.im2Pct, r.f.im2Db)}</td>
            <td class="n">{pctDb(r.f.im3Pct, r.f.im3Db)}</td>
            <td class="n">{pctDb(r.f.totalPct, r.f.totalDb)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function ToneField(p: { label: string; testId: string; min: number; max: number; value: string; set: (v: string) => void }) {
  return (
    <label class="stack">
      <span>{p.label}</span>
      <input
        type="number"
        min={p.min}
        max={p.max}
        value={p.value}
        data-testid={p.testId}
        onInput={(e) => p.set((e.currentTarget as HTMLInputElement).value)}
      />
    </label>
  );
}

export function DistortionPanel(p: { theme: string }) {
  const { state, derived } = useApp();
  const [run, setRun] = useState<Run>({ kind: 'idle' });
  const [levelsText, setLevelsText] = useState('0');
  const [low, setLow] = useState('40');
  const [high, setHigh] = useState('420');
  const workers = useRef<DistortionWorkerLike[]>([]);
  const stop = () => {
    for (const w of workers.current) w.terminate();
    workers.current = [];
  };
  useEffect(() => stop, []);
  // A result belongs to the designs it was computed for: an edit makes it stale, so it goes.
  useEffect(() => {
    stop();
    // Already idle: keep the same state, so an edit does not render this section again.
    setRun((r) => (r.kind === 'idle' ? r : { kind: 'idle' }));
  }, [state.designs]);

  const start = () => {
    stop();
    const levels = parseLevelList(levelsText);
    const pair = parseTonePair(low, high);
    if (!levels.ok || !pair.ok) {
      setRun({ kind: 'error', message: !levels.ok ? levels.message : (pair as { message: string }).message });
      return;
    }
    const done: Record<Slot, number> = { a: 0, b: 0 };
    const results: Record<Slot, DistortionResult | null> = { a: null, b: null };
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
          results[s] = m.result;
          pending.delete(s);
          if (pending.size === 0) {
            stop();
            setRun({ kind: 'done', results: { ...results } });
          }
        } else {
          stop();
          setRun({ kind: 'error', message: m.message });
        }
      };
      w.postMessage({ type: 'distortion', id, system, levelsDb: levels.value, tonePairHz: pair.value });
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
        Steady sine tones at each design's planned level and at the other levels you list, one frequency at a time, through each way's
        filter: total harmonic distortion (2nd to 5th), the third harmonic and the compression of the fundamental at the seat. Then two
        tones at once, a low one that moves the cone far and a high one it modulates: the sidebands around the high tone. An estimate from
        the model, not a measurement.
      </p>
      <div class="distortion-inputs">
        <label class="stack">
          <span>Levels, dB from the planned level</span>
          <input
            type="text"
            value={levelsText}
            data-testid="distortion-levels"
            onInput={(e) => setLevelsText((e.currentTarget as HTMLInputElement).value)}
          />
        </label>
        <ToneField label="Low tone f1, Hz" testId="im-low" min={10} max={2000} value={low} set={setLow} />
        <ToneField label="High tone f2, Hz" testId="im-high" min={30} max={20000} value={high} set={setHigh} />
      </div>
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
        <>
          <div class="chart-grid">
            {specs(run.results, state.settings.showWays ?? false).map((c) => (
              <ChartCard spec={c} theme={p.theme} />
            ))}
          </div>
          <ImTable results={run.results} showWays={state.settings.showWays ?? false} />
        </>
      ) : null}
    </section>
  );
}
