// "Fit from impedance": the user picks a measured sweep (and a second one with an added mass or in
// a closed box), sees the fitted parameters with their errors and the curves, and fills the
// driver's fields in one undoable step. The fit runs in a Worker (impedance-fit.worker.ts) with
// progress and cancel.
import { useEffect, useRef, useState } from 'preact/hooks';
import FitWorker from '../impedance-fit.worker.ts?worker';
import type { FitJob, FitReply } from '../impedance-fit.worker.ts';
import { useApp } from '../context.ts';
import { Dialog } from './Dialog.tsx';
import { Chart } from '../charts/Chart.tsx';
import type { ChartSpec } from '../charts/specs.ts';
import { designWithFit, MAX_TABLE_FILE_BYTES, type FitOutcome, type VasMethod } from '../impedance-fit.ts';
import { SLOT_LABEL, type Slot } from '../store.ts';

/** The part of a Worker the dialog uses (so a test can hand in a stand-in). */
export interface FitWorkerLike {
  postMessage(job: FitJob): void;
  onmessage: ((e: MessageEvent<FitReply>) => void) | null;
  terminate(): void;
}

let workerFactory = (): FitWorkerLike => new FitWorker() as unknown as FitWorkerLike;
/** Replaces the Worker the dialog starts (tests hand in a stand-in). */
export function setFitWorkerFactory(make: () => FitWorkerLike): void {
  workerFactory = make;
}

interface Picked {
  name: string;
  text: string;
}

async function readPicked(input: HTMLInputElement): Promise<Picked | string> {
  const file = input.files?.[0];
  if (!file) return 'no file chosen';
  if (file.size > MAX_TABLE_FILE_BYTES) return `${file.name} is larger than 8 MiB, too large for an impedance table`;
  return { name: file.name, text: await file.text() };
}

const pm = (value: number, sigma: number, scale = 1) =>
  `${Number((value * scale).toPrecision(4))}${Number.isFinite(sigma) ? ` ± ${Number((sigma * scale).toPrecision(2))}` : ''}`;

function curveSpecs(outcome: Extract<FitOutcome, { ok: true }>): ChartSpec[] {
  const c = outcome.fit.curve;
  const freqHz = Float64Array.from(c.freq);
  return [
    {
      id: 'impedance',
      title: 'Impedance: measured and fitted',
      unit: 'Ω',
      digits: 2,
      freqHz,
      series: [
        { label: 'measured', role: 'a', values: c.measuredOhm },
        { label: 'fitted', role: 'b', values: c.fittedOhm },
      ],
      summary: [`Fitted to ${c.freq.length} points; residual ${outcome.fit.residualRmsPct.toFixed(2)} % rms.`],
    },
    {
      id: 'impedance',
      title: 'Residual (measured − fitted)',
      unit: '%',
      digits: 2,
      freqHz,
      series: [{ label: 'residual', role: 'a', values: c.residualPct }],
      summary: [`Largest residual ${Math.max(...c.residualPct.map(Math.abs)).toFixed(2)} %.`],
    },
  ];
}

export function ImpedanceFitDialog(p: { slot: Slot; wayIndex: number; onClose: () => void }) {
  const { state, dispatch } = useApp();
  const way = state.designs[p.slot].ways[p.wayIndex];
  const typedSd = way?.kind === 'driver' ? way.driver.sd_cm2 : undefined;
  const [free, setFree] = useState<Picked | null>(null);
  const [second, setSecond] = useState<Picked | null>(null);
  const [method, setMethod] = useState<VasMethod>('typed');
  const [amount, setAmount] = useState('');
  const [sd, setSd] = useState(typedSd !== undefined ? String(typedSd) : '');
  const [outcome, setOutcome] = useState<FitOutcome | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [running, setRunning] = useState<{ done: number; of: number; what: string } | null>(null);
  const worker = useRef<FitWorkerLike | null>(null);
  const stop = () => {
    worker.current?.terminate();
    worker.current = null;
  };
  useEffect(() => stop, []);

  const pick = (set: (x: Picked | null) => void) => async (e: Event) => {
    const r = await readPicked(e.currentTarget as HTMLInputElement);
    if (typeof r === 'string') {
      setProblem(r);
      set(null);
    } else {
      setProblem(null);
      set(r);
    }
    stop();
    setRunning(null);
    setOutcome(null);
  };
  const number = (text: string) => (text.trim() === '' ? null : Number(text.replace(',', '.')));
  const fit = () => {
    if (!free) return setProblem('choose the free-air sweep first');
    const amt = number(amount);
    const sdv = number(sd);
    if ((amt !== null && !Number.isFinite(amt)) || (sdv !== null && !Number.isFinite(sdv)))
      return setProblem('the numbers must be plain decimals');
    stop();
    const w = workerFactory();
    worker.current = w;
    setOutcome(null);
    setProblem(null);
    setRunning({ done: 0, of: method === 'typed' ? 1 : 2, what: 'starting' });
    w.onmessage = (e) => {
      if (worker.current !== w) return;
      const m = e.data;
      if (m.type === 'progress') return setRunning({ done: m.done, of: m.of, what: m.what });
      stop();
      setRunning(null);
      if (m.type === 'result') {
        setOutcome(m.outcome);
        setProblem(m.outcome.ok ? null : m.outcome.message);
      } else setProblem(`the fit failed: ${m.message}`);
    };
    w.postMessage({
      type: 'fit',
      id: 1,
      request: {
        freeText: free.text,
        freeName: free.name,
        method,
        amount: amt,
        secondText: method === 'typed' ? null : (second?.text ?? null),
        secondName: second?.name ?? null,
        sdCm2: sdv,
      },
    });
  };
  const cancel = () => {
    stop();
    setRunning(null);
    setProblem('fit cancelled');
  };
  const fill = () => {
    if (!outcome?.ok) return;
    const design = designWithFit(state.designs[p.slot], p.wayIndex, outcome.fields);
    dispatch({ type: 'replace', slot: p.slot, design, reason: `fill the driver of ${SLOT_LABEL[p.slot]} from an impedance fit` });
    p.onClose();
  };
  const ok = outcome?.ok ? outcome : null;
  const f = ok?.fit.params;
  const s = ok?.fit.sigma;
  return (
    <Dialog
      id="impedance-fit"
      title={`Fit the driver of ${SLOT_LABEL[p.slot]} from measured impedance`}
      onClose={p.onClose}
      actions={
        <>
          {running ? (
            <button type="button" onClick={cancel}>
              Cancel the fit
            </button>
          ) : (
            <button type="button" onClick={fit} disabled={!free}>
              Fit
            </button>
          )}
          <button type="button" onClick={fill} disabled={!ok}>
            Fill the driver fields
          </button>
          <button type="button" onClick={p.onClose}>
            Close
          </button>
        </>
      }
    >
      <p class="group-note">
        A table of frequency (Hz), impedance (Ω) and optionally phase (°), measured in free air at a small drive, from below the resonance
        to well above it. Columns in any order, header and comment lines allowed.
      </p>
      <label class="stack">
        Free-air sweep
        <input type="file" accept=".txt,.csv,.dat,.zma,text/plain,text/csv" onChange={pick(setFree)} />
      </label>
      <fieldset class="stack">
        <legend>Vas from</legend>
        <label>
          <input type="radio" name="vas-method" checked={method === 'typed'} onChange={() => setMethod('typed')} /> a value I know (or keep
          the driver's own)
        </label>
        <label>
          <input type="radio" name="vas-method" checked={method === 'added-mass'} onChange={() => setMethod('added-mass')} /> a second sweep
          with a mass added to the cone
        </label>
        <label>
          <input type="radio" name="vas-method" checked={method === 'closed-box'} onChange={() => setMethod('closed-box')} /> a second sweep
          in a closed box
        </label>
      </fieldset>
      <label class="stack">
        {method === 'typed' ? 'Vas (L), optional' : method === 'added-mass' ? 'Added mass (g)' : 'Box volume (L)'}
        <input type="text" inputMode="decimal" value={amount} onInput={(e) => setAmount(e.currentTarget.value)} />
      </label>
      {method === 'typed' ? null : (
        <label class="stack">
          Second sweep
          <input type="file" accept=".txt,.csv,.dat,.zma,text/plain,text/csv" onChange={pick(setSecond)} />
        </label>
      )}
      <label class="stack">
        Cone area Sd (cm²)
        <input type="text" inputMode="decimal" value={sd} onInput={(e) => setSd(e.currentTarget.value)} />
      </label>
      {running ? (
        <p class="group-note" role="status" data-testid="fit-progress">
          <progress max={running.of} value={running.done} aria-label="Fit progress" /> {running.what}…
        </p>
      ) : null}
      {problem ? (
        <p class="dialog-problem" role="alert">
          {problem}
        </p>
      ) : null}
      {ok && f && s ? (
        <>
          <table class="fit-table" aria-label="Fitted parameters">
            <tbody>
              <tr>
                <th>Re</th>
                <td>{pm(f.re, s.re)} Ω</td>
                <th>fs</th>
                <td>{pm(f.fs, s.fs)} Hz</td>
              </tr>
              <tr>
                <th>Qms</th>
                <td>{pm(f.qms, s.qms)}</td>
                <th>Qes</th>
                <td>{pm(f.qes, s.qes)}</td>
              </tr>
              <tr>
                <th>Le</th>
                <td>{pm(f.le, s.le, 1000)} mH</td>
                <th>{ok.fit.coil === 'semi' ? 'L2, R2' : 'coil'}</th>
                <td>{ok.fit.coil === 'semi' ? `${pm(f.l2, s.l2, 1000)} mH, ${pm(f.r2, s.r2)} Ω` : 'Le alone'}</td>
              </tr>
              <tr>
                <th>Vas</th>
                <td>{ok.mech?.vas != null ? `${pm(ok.mech.vas, ok.mech.vasSigma ?? Number.NaN, 1000)} L` : 'kept as it is'}</td>
                <th>residual</th>
                <td>{ok.fit.residualRmsPct.toFixed(2)} % rms</td>
              </tr>
            </tbody>
          </table>
          {curveSpecs(ok).map((spec) => (
            <Chart key={spec.title} spec={spec} height={160} theme={state.settings.theme} syncKey="impedance-fit" exportable={false} />
          ))}
          <p class="group-note">A fitted model is an estimate: check the residual and the errors before trusting it.</p>
        </>
      ) : null}
    </Dialog>
  );
}
