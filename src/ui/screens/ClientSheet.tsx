// Client sheet: one printable document for the client — both designs' key parameters and figures,
// their curves, the plain-language verdict, the designer's title and notes, the date, the cautions.
// The browser prints it (or saves it as PDF) through the print stylesheet.
import type { Analysis } from '../../engine/response/types.ts';
import { CAUTIONS } from '../Cautions.tsx';
import { useApp } from '../context.ts';
import { FigureTable } from '../FigureTable.tsx';
import { num, TO_DISPLAY as K } from '../format.ts';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';
import { useCharts } from './Curves.tsx';
import { PrintChart } from '../sheet/PrintChart.tsx';
import { useVerdict } from '../sheet/hooks.ts';
import '../sheet/sheet.css';

const SHEET_CHARTS = ['spl', 'excursion', 'port-speed', 'max-spl'] as const;
const BOX_NAME = { sealed: 'Sealed', vented: 'Vented (ported)', 'passive-radiator': 'Passive radiator' } as const;
const SPACE = {
  full: 'free space',
  half: 'against a wall (half space)',
  quarter: 'in an edge (quarter space)',
  eighth: 'in a corner (eighth space)',
} as const;
export const DEFAULT_SHEET_TITLE = 'Loudspeaker design comparison';

interface ParamRow {
  label: string;
  value: (a: Analysis) => string | null;
}

const u = (v: number | null | undefined, digits: number, unit: string) =>
  v === null || v === undefined ? null : `${num(v, digits)} ${unit}`;

const PARAMS: ParamRow[] = [
  { label: 'Enclosure', value: (a) => `${BOX_NAME[a.system.box.type]}, ${num(a.system.box.vbNet * K.litres, 3)} l net` },
  { label: 'Tuning fb', value: (a) => (a.system.box.type === 'sealed' ? null : u(a.system.box.fb, 3, 'Hz')) },
  {
    label: 'Port',
    value: (a) =>
      a.system.box.type === 'vented'
        ? `${a.system.box.portCount} × ${num(a.system.box.portRadius * 2 * K.cm, 3)} cm equivalent diameter, ${num(a.figures.portLengthCm, 3)} cm long`
        : null,
  },
  { label: 'Driver fs / Qts', value: (a) => `${num(a.system.driver.fs, 3)} Hz / ${num(a.system.driver.qts, 3)}` },
  { label: 'Vas', value: (a) => u(a.system.driver.vas * K.litres, 3, 'l') },
  { label: 'Sd', value: (a) => u(a.system.driver.sd * K.cm2, 3, 'cm²') },
  { label: 'Xmax / Xlim (one way)', value: (a) => `${num(a.system.driver.xmax * K.mm, 3)} / ${num(a.system.driver.xlim * K.mm, 3)} mm` },
  { label: 'Rated power Pe', value: (a) => u(a.system.driver.pe, 3, 'W') },
  { label: 'Amplifier', value: (a) => `${num(a.system.amplifier.power, 3)} W into ${num(a.system.amplifier.load, 2)} Ω` },
  { label: 'Listening seat', value: (a) => `${num(a.system.listening.distance, 2)} m, ${SPACE[a.system.listening.space]}` },
  {
    label: 'Planned level',
    value: (a) => {
      const lv = a.system.listening.level;
      return lv.mode === 'spl'
        ? `${num(lv.splDb, 3)} dB(C) long-term average at the seat`
        : `${num(lv.voltsFs, 3)} V peak at digital full scale`;
    },
  },
];

function today(): string {
  return new Date().toLocaleDateString(undefined, { year: 'numeric', month: 'long', day: 'numeric' });
}

export function ClientSheet() {
  const { state, derived, dispatch } = useApp();
  const charts = useCharts();
  const v = useVerdict();
  const title = state.settings.sheetTitle ?? '';
  const notes = state.settings.sheetNotes ?? '';
  const an: Record<Slot, Analysis | null> = { a: derived.a.analysis, b: derived.b.analysis };
  const driverName = (s: Slot) => state.designs[s].driver.name ?? null;

  return (
    <section class="client" aria-labelledby="client-h">
      <div class="client-controls no-print">
        <h2 id="client-h">Client sheet</h2>
        <p class="sheet-intro">
          A one-page summary for your client: edit the title and notes here, then print it or save it as PDF from the print dialog. The
          sheet below is what prints.
        </p>
        <div class="client-fields">
          <label class="stack">
            <span>Title</span>
            <input
              type="text"
              value={title}
              placeholder={DEFAULT_SHEET_TITLE}
              maxLength={120}
              data-testid="sheet-title"
              onInput={(e) => dispatch({ type: 'settings', patch: { sheetTitle: (e.currentTarget as HTMLInputElement).value } })}
            />
          </label>
          <label class="stack">
            <span>Your notes for the client</span>
            <textarea
              rows={4}
              maxLength={2000}
              value={notes}
              data-testid="sheet-notes"
              onInput={(e) => dispatch({ type: 'settings', patch: { sheetNotes: (e.currentTarget as HTMLTextAreaElement).value } })}
            />
          </label>
          <div class="client-actions">
            <button type="button" class="primary" onClick={() => window.print()} data-testid="sheet-print">
              Print or save as PDF
            </button>
            <span class="fine">Saved with your designs as you type.</span>
          </div>
        </div>
      </div>

      <article class="paper" data-testid="client-sheet" aria-label="The printable sheet">
        <header class="paper-head">
          <div>
            <h1 data-testid="paper-title">{title.trim() || DEFAULT_SHEET_TITLE}</h1>
            <p class="paper-sub">
              Two designs compared:{' '}
              {SLOTS.map((s, i) => (
                <span>
                  {i ? ' and ' : ''}
                  <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span> {state.designs[s].name}
                </span>
              ))}
            </p>
          </div>
          <p class="paper-date" data-testid="paper-date">
            {today()}
          </p>
        </header>

        {SLOTS.some((s) => derived[s].stale) ? (
          <p class="paper-warn" role="note">
            Design{' '}
            {SLOTS.filter((s) => derived[s].stale)
              .map((s) => SLOT_LABEL[s])
              .join(' and ')}{' '}
            has errors being edited: this sheet shows its last valid version.
          </p>
        ) : null}
        <section class="paper-section">
          <h2>In plain words</h2>
          {v ? (
            <ul class="verdict" data-testid="sheet-verdict">
              {v.lines.map((l) => (
                <li data-line={l.id}>{l.text}</li>
              ))}
            </ul>
          ) : (
            <p>A design has errors, so no comparison is given.</p>
          )}
          <p class="paper-fine">
            {v?.withHeadroom
              ? `The headroom sentence was measured on the track “${v.trackName}”; every other figure is from the small-signal model at the stated drive.`
              : 'Headroom on a music track was not measured for these designs (the Headroom probe measures it); every figure here is from the small-signal model at the stated drive.'}
          </p>
        </section>

        <section class="paper-section paper-params">
          <h2>The two designs</h2>
          <table class="params" data-testid="sheet-params">
            <thead>
              <tr>
                <th scope="col" />
                {SLOTS.map((s) => (
                  <th scope="col">
                    <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span> {state.designs[s].name}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              <tr>
                <th scope="row">Woofer</th>
                {SLOTS.map((s) => (
                  <td>{driverName(s) ?? '—'}</td>
                ))}
              </tr>
              {PARAMS.filter((r) => SLOTS.some((s) => an[s] && r.value(an[s]!) !== null)).map((r) => (
                <tr>
                  <th scope="row">{r.label}</th>
                  {SLOTS.map((s) => (
                    <td>{(an[s] && r.value(an[s]!)) ?? '—'}</td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
          <FigureTable />
        </section>

        <section class="paper-section paper-curves">
          <h2>Curves</h2>
          <p class="paper-fine">
            Model estimates. SPL at the seat for 2.83 V; excursion and port air speed for a sine at each design's planned level. A deep
            teal, B amber, the ideal reference grey dashed, limits red.
          </p>
          <div class="paper-charts">
            {SHEET_CHARTS.map((id) => charts.find((c) => c.id === id)!).map((c) => (
              <figure class="paper-chart">
                <figcaption>
                  {c.title} <span class="unit-tag">({c.unit})</span>
                </figcaption>
                <PrintChart spec={c} />
              </figure>
            ))}
          </div>
        </section>

        {notes.trim() ? (
          <section class="paper-section">
            <h2>Notes from the designer</h2>
            <p class="paper-notes" data-testid="paper-notes">
              {notes}
            </p>
          </section>
        ) : null}

        <section class="paper-section paper-cautions">
          <h2>Please note</h2>
          <ul>
            {CAUTIONS.map((c) => (
              <li>
                <strong>{c.title}.</strong> {c.text}
              </li>
            ))}
          </ul>
        </section>
        <footer class="paper-foot">
          Prepared with preheard {__APP_VERSION__} on {today()}. All figures are estimates from a model of the driver and box, not
          measurements.
        </footer>
      </article>
    </section>
  );
}
