// Client sheet: one printable document for the client — both designs' key parameters and figures,
// their curves, the plain-language verdict, the designer's title and notes, the date, the cautions.
// The browser prints it (or saves it as PDF) through the print stylesheet.
import type { Analysis, Figures } from '../../engine/response/types.ts';
import type { ActiveFilter, DriverWay, SpeakerSystem, Way } from '../../engine/system.ts';
import { CAUTIONS } from '../Cautions.tsx';
import { useApp } from '../context.ts';
import { FigureTable } from '../FigureTable.tsx';
import { fixed, num, TO_DISPLAY as K } from '../format.ts';
import { boxLabel } from '../boxes.ts';
import { wayFigures, worstShortfall } from '../analysis-view.ts';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';
import { useCharts } from './Curves.tsx';
import { PrintChart } from '../sheet/PrintChart.tsx';
import { useVerdict } from '../sheet/hooks.ts';
import '../sheet/sheet.css';

const SHEET_CHARTS = ['spl', 'excursion', 'port-speed', 'max-spl'] as const;
const SPACE = {
  full: 'free space',
  half: 'against a wall (half space)',
  quarter: 'in an edge (quarter space)',
  eighth: 'in a corner (eighth space)',
} as const;
export const DEFAULT_SHEET_TITLE = 'Loudspeaker design comparison';

/** A design-wide row: the amplifier, the seat, the level. */
interface ParamRow {
  label: string;
  value: (system: SpeakerSystem, analysis: Analysis | null) => string | null;
}

/** The amplifier's shortfall on the programme stand-in's peaks, as words (null when it reaches the level). */
function shortfallText(analysis: Analysis | null): string | null {
  const worst = worstShortfall(analysis);
  return worst
    ? `beyond the amplifier: needs ${num(worst.needV, 3)} V peaks, it gives ${num(worst.railV, 3)} V (${num(worst.shortDb, 2)} dB short)`
    : null;
}

/** A row of one way of a design (its system way, and the analysis for figures such as the port length). */
interface WayParamRow {
  label: string;
  value: (way: Way, figures: Partial<Figures> | null) => string | null;
}

const u = (v: number | null | undefined, digits: number, unit: string) =>
  v === null || v === undefined ? null : `${num(v, digits)} ${unit}`;

const SHAPE = { lr2: 'LR 12 dB', lr4: 'LR 24 dB', lr8: 'LR 48 dB', bw2: 'BW 12 dB', bw3: 'BW 18 dB', bw4: 'BW 24 dB' } as const;

function filterText(f: ActiveFilter): string {
  const parts: string[] = [];
  if (f.highpass) parts.push(`high-pass ${SHAPE[f.highpass.shape]} at ${num(f.highpass.hz, 3)} Hz`);
  if (f.lowpass) parts.push(`low-pass ${SHAPE[f.lowpass.shape]} at ${num(f.lowpass.hz, 3)} Hz`);
  if (f.gain !== 1) parts.push(`${fixed(20 * Math.log10(f.gain), 1)} dB`);
  if (f.delay > 0) parts.push(`delayed ${num(f.delay * 1000, 3)} ms`);
  return parts.length ? parts.join(', ') : 'full range';
}

const driverOnly = (w: Way, f: (w: DriverWay) => string | null) => (w.kind === 'driver' ? f(w) : null);

// Few rows per way, so a two-way pair still prints on one page.
const WAY_PARAMS: WayParamRow[] = [
  {
    label: 'Filter',
    value: (w) =>
      (w.kind === 'driver' && w.network ? `passive network of ${w.network.length} parts` : filterText(w.filter)) +
      (w.polarity < 0 ? ', inverted' : ''),
  },
  {
    label: 'Enclosure',
    value: (w) =>
      driverOnly(
        w,
        (d) =>
          `${boxLabel(d.box.type)}, ${num(d.box.vbNet * K.litres, 3)} l net${'fb' in d.box ? `, tuned to ${num(d.box.fb, 3)} Hz` : ''}`,
      ),
  },
  {
    label: 'Port',
    value: (w, f) =>
      driverOnly(w, (d) =>
        d.box.type === 'vented'
          ? `${d.box.portCount} × ${num(d.box.portRadius * 2 * K.cm, 3)} cm equivalent diameter${f?.portLengthCm ? `, ${num(f.portLengthCm, 3)} cm long` : ''}`
          : null,
      ),
  },
  { label: 'Driver fs / Qts', value: (w) => driverOnly(w, (d) => `${num(d.unit.fs, 3)} Hz / ${num(d.unit.qts, 3)}`) },
  { label: 'Vas / Sd', value: (w) => driverOnly(w, (d) => `${num(d.unit.vas * K.litres, 3)} l / ${num(d.unit.sd * K.cm2, 3)} cm²`) },
  {
    label: 'Xmax / Xlim (one way)',
    value: (w) => driverOnly(w, (d) => `${num(d.unit.xmax * K.mm, 3)} / ${num(d.unit.xlim * K.mm, 3)} mm`),
  },
  { label: 'Rated power Pe', value: (w) => driverOnly(w, (d) => u(d.unit.pe, 3, 'W')) },
];

/** How a way's drivers are named in its heading row. */
const driversText = (w: Way, name: string | null) =>
  w.kind === 'flat' ? 'an ideal flat band' : `${name ?? 'driver'}${w.count > 1 ? `, ${w.count} in ${w.wiring}` : ''}`;

const PARAMS: ParamRow[] = [
  { label: 'Amplifier', value: (s) => `${num(s.amplifier.power, 3)} W into ${num(s.amplifier.load, 2)} Ω, one channel per way` },
  { label: 'Listening seat', value: (s) => `${num(s.listening.distance, 2)} m, ${SPACE[s.listening.space]}` },
  {
    label: 'Planned level',
    value: (s, an) => {
      const lv = s.listening.level;
      const level =
        lv.mode === 'spl'
          ? `${num(lv.splDb, 3)} dB(C) long-term average at the seat`
          : `${num(lv.voltsFs, 3)} V peak at digital full scale`;
      const short = shortfallText(an);
      return short ? `${level} — ${short}` : level;
    },
  },
];

function today(): string {
  return new Date().toLocaleDateString(undefined, { year: 'numeric', month: 'long', day: 'numeric' });
}

export function ClientSheet() {
  const { state, derived, dispatch } = useApp();
  const charts = useCharts(SHEET_CHARTS);
  const v = useVerdict();
  const title = state.settings.sheetTitle ?? '';
  const notes = state.settings.sheetNotes ?? '';
  const sys: Record<Slot, SpeakerSystem | null> = { a: derived.a.system, b: derived.b.system };
  const wayCount = Math.max(...SLOTS.map((s) => sys[s]?.ways.length ?? 0));
  /** The way at position k of a design, with its name as typed, its driver's name and its figures. */
  const wayAt = (s: Slot, k: number) => {
    const w = sys[s]?.ways[k];
    if (!w) return null;
    const doc = state.designs[s];
    const index = doc.ways.findIndex((d) => d.name === w.name);
    const wd = doc.ways[index];
    const an = derived[s].analysis;
    return {
      way: w,
      driverName: wd?.kind === 'driver' ? (wd.driver.name ?? null) : null,
      figures: an && index >= 0 ? wayFigures(an, doc, index) : null,
    };
  };
  const wayRows = (k: number) => {
    const cells = SLOTS.map((s) => wayAt(s, k));
    return [
      <tr class="way-head" data-testid={`sheet-way-${k}`}>
        <th scope="row">Way {k + 1}</th>
        {cells.map((c) => (
          <td>
            {c ? (
              <>
                <strong>{c.way.name}</strong>: {driversText(c.way, c.driverName)}
              </>
            ) : (
              '—'
            )}
          </td>
        ))}
      </tr>,
      ...WAY_PARAMS.filter((r) => cells.some((c) => c && r.value(c.way, c.figures) !== null)).map((r) => (
        <tr>
          <th scope="row">{r.label}</th>
          {cells.map((c) => (
            <td>{(c && r.value(c.way, c.figures)) ?? '—'}</td>
          ))}
        </tr>
      )),
    ];
  };

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
        {SLOTS.some((s) => shortfallText(derived[s].analysis)) ? (
          <p class="paper-warn" role="note" data-testid="sheet-unreachable">
            {SLOTS.filter((s) => shortfallText(derived[s].analysis))
              .map((s) => `Design ${SLOT_LABEL[s]}'s planned level is ${shortfallText(derived[s].analysis)}.`)
              .join(' ')}{' '}
            Its figures at the planned level describe a level that amplifier cannot play cleanly.
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

        {/* One page: the parameters and notes beside the curves, the cautions across the foot. */}
        <div class="paper-body">
          <div class="paper-main">
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
                  {Array.from({ length: wayCount }, (_, k) => wayRows(k))}
                  {PARAMS.filter((r) => SLOTS.some((s) => sys[s] && r.value(sys[s]!, derived[s].analysis) !== null)).map((r) => (
                    <tr>
                      <th scope="row">{r.label}</th>
                      {SLOTS.map((s) => (
                        <td>{(sys[s] && r.value(sys[s]!, derived[s].analysis)) ?? '—'}</td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
              <FigureTable paper />
            </section>

            {notes.trim() ? (
              <section class="paper-section">
                <h2>Notes from the designer</h2>
                <p class="paper-notes" data-testid="paper-notes">
                  {notes}
                </p>
              </section>
            ) : null}
          </div>
          <div class="paper-side">
            <section class="paper-section paper-curves">
              <h2>Curves</h2>
              <p class="paper-fine">
                Model estimates: SPL for 2.83 V, the rest for a sine at the planned level. A teal, B amber, ideal grey dashed, limits red.
              </p>
              <div class="paper-charts">
                {SHEET_CHARTS.map((id) => charts.find((c) => c.id === id)!).map((c) => (
                  <figure class="paper-chart">
                    <figcaption>
                      {c.title} <span class="unit-tag">({c.unit})</span>
                    </figcaption>
                    <PrintChart spec={c} width={260} height={106} />
                  </figure>
                ))}
              </div>
            </section>
          </div>
        </div>
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
