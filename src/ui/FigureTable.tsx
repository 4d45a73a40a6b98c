// The figures a designer reads first, for A and B side by side: the system as a whole (the sum of
// its ways at the seat), then the way shown on the Driver sheet and Cabinet.
import type { Analysis, Figures } from '../engine/response/types.ts';
import type { DesignDoc } from '../engine/design/document.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import { useApp } from './context.ts';
import { PORT_SPEED_LIMIT } from './engine.ts';
import { num, peakOf, TO_DISPLAY as K } from './format.ts';
import { SLOTS, SLOT_LABEL, type Slot } from './store.ts';
import { displayUnit, unitSystemOf } from './units.ts';
import { sumOf, wayCurves, wayFigures, type WayCurvesView } from './analysis-view.ts';
import { boxLabel } from './boxes.ts';
import { useWayIndex } from './components/WayPicker.tsx';
import { firstDriverIndex, systemDriverWay } from './ways.ts';

/** What a row reads: the analysis, and the shown way's figures, curves and driver limits. */
interface RowContext {
  analysis: Analysis;
  system: Partial<Figures>;
  way: Partial<Figures> | null;
  curves: WayCurvesView | null;
  /** One driver of the shown way: Xmax in mm. */
  xmaxMm: number | null;
}

interface FigureRow {
  label: string;
  unit: string;
  value: (c: RowContext) => number | null | undefined;
  digits?: number;
  /** Marks a value that passes a limit. */
  over?: (c: RowContext) => boolean;
  id: string;
}

const SYSTEM_ROWS: FigureRow[] = [
  { id: 'f3', label: 'f3 (−3 dB)', unit: 'Hz', value: (c) => c.system.f3Hz },
  { id: 'f10', label: 'f10 (−10 dB)', unit: 'Hz', value: (c) => c.system.f10Hz },
  { id: 'sens', label: 'Sensitivity, 2.83 V at 1 m, no baffle step', unit: 'dB', value: (c) => c.system.sensitivityDb },
  { id: 'volts', label: 'Drive for the planned level', unit: 'V rms', value: (c) => c.analysis.figures.plannedVoltsRms },
];

const peakExcursion = (c: RowContext) => peakOf(c.curves?.plannedExcursionMm)?.value;
const peakPort = (c: RowContext) => peakOf(c.curves?.plannedPortAirSpeed)?.value;

const WAY_ROWS: FigureRow[] = [
  { id: 'fc', label: 'fc', unit: 'Hz', value: (c) => c.way?.fcHz },
  { id: 'qtc', label: 'Qtc', unit: '', value: (c) => c.way?.qtc },
  { id: 'fb', label: 'fb', unit: 'Hz', value: (c) => c.way?.fbHz },
  { id: 'fp', label: 'fp (radiator notch)', unit: 'Hz', value: (c) => c.way?.fpHz },
  { id: 'way-f3', label: 'f3 of this way', unit: 'Hz', value: (c) => c.way?.f3Hz },
  {
    id: 'xpk',
    label: 'Peak excursion, planned level',
    unit: 'mm',
    value: peakExcursion,
    over: (c) => c.xmaxMm !== null && (peakExcursion(c) ?? 0) > c.xmaxMm,
  },
  { id: 'xmax', label: 'Xmax', unit: 'mm', value: (c) => c.xmaxMm },
  { id: 'port', label: 'Port length (one port)', unit: 'cm', value: (c) => c.way?.portLengthCm },
  {
    id: 'vport',
    label: 'Peak port air speed, planned level',
    unit: 'm/s',
    value: peakPort,
    over: (c) => (peakPort(c) ?? 0) > PORT_SPEED_LIMIT,
  },
  { id: 'zmin', label: 'Minimum impedance', unit: 'Ω', value: (c) => c.way?.zMinOhm },
];

const COMPACT = ['f3', 'sens', 'fc', 'qtc', 'fb', 'fp', 'xpk', 'vport', 'port'];
/** Rows the client sheet's parameters table already gives. */
const ON_PAPER_ELSEWHERE = ['xmax', 'way-f3'];

function contextOf(analysis: Analysis, system: SpeakerSystem | null, doc: DesignDoc, index: number): RowContext {
  const unit = system ? systemDriverWay(system, doc, index)?.unit : null;
  return {
    analysis,
    system: { ...analysis.figures, ...sumOf(analysis).figures },
    way: wayFigures(analysis, doc, index),
    curves: wayCurves(analysis, doc, index),
    xmaxMm: unit ? unit.xmax * K.mm : null,
  };
}

/**
 * `compact`: the side panel's few rows. `paper`: the client sheet's, where the parameters table above
 * already gives each way's enclosure and Xmax, and the way is the first driver way (the woofer).
 */
export function FigureTable(p: { compact?: boolean; paper?: boolean }) {
  const { derived, state } = useApp();
  const shown = useWayIndex();
  const idx = p.paper ? { a: firstDriverIndex(state.designs.a), b: firstDriverIndex(state.designs.b) } : shown;
  const ctx: Record<Slot, RowContext | null> = {
    a: derived.a.analysis ? contextOf(derived.a.analysis, derived.a.system, state.designs.a, idx.a) : null,
    b: derived.b.analysis ? contextOf(derived.b.analysis, derived.b.system, state.designs.b, idx.b) : null,
  };
  const has = (r: FigureRow) => SLOTS.some((s) => ctx[s] && r.value(ctx[s]!) !== null && r.value(ctx[s]!) !== undefined);
  const pick = (rows: FigureRow[]) =>
    rows.filter(has).filter((r) => (!p.compact || COMPACT.includes(r.id)) && (!p.paper || !ON_PAPER_ELSEWHERE.includes(r.id)));
  const way = (s: Slot) => state.designs[s].ways[idx[s]];
  const units = unitSystemOf(state.settings);
  const cells = (r: FigureRow) =>
    SLOTS.map((s) => {
      const c = ctx[s];
      const raw = c ? r.value(c) : null;
      const over = c && r.over ? r.over(c) : false;
      // The user's display units (units.ts): the rows are written in metric.
      const unit = displayUnit(r.unit, units);
      const v = raw === null || raw === undefined ? raw : unit.fromFile(raw);
      return (
        <td class={`n${over ? ' over' : ''}${derived[s].stale ? ' stale' : ''}`} data-testid={`fig-${s}-${r.id}`}>
          {num(v, r.digits ?? 3)}
          {v !== null && v !== undefined && unit.label ? <span class="u"> {unit.label}</span> : null}
          {over ? <span class="visually-hidden"> (over the limit)</span> : null}
        </td>
      );
    });
  return (
    <table class={`figures${p.compact ? ' compact' : ''}`} data-testid="figures">
      <caption>Key figures{derived.a.stale || derived.b.stale ? ' (a design with errors shows its last valid version)' : ''}</caption>
      <thead>
        <tr>
          <th scope="col">Figure</th>
          {SLOTS.map((s) => (
            <th scope="col" class={`n slot-${s}`}>
              <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span>
              <span class="visually-hidden"> {state.designs[s].name}</span>
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        <tr class="fig-group">
          <th scope="row">System</th>
          {SLOTS.map((s) => (
            <td class="n" data-testid={`fig-${s}-ways`}>
              {state.designs[s].ways.length} {state.designs[s].ways.length === 1 ? 'way' : 'ways'}
            </td>
          ))}
        </tr>
        {pick(SYSTEM_ROWS).map((r) => (
          <tr>
            <th scope="row">{r.label}</th>
            {cells(r)}
          </tr>
        ))}
        <tr class="fig-group">
          <th scope="row">Way</th>
          {SLOTS.map((s) => (
            <td class="n" data-testid={`fig-${s}-way`}>
              {way(s).name}
            </td>
          ))}
        </tr>
        {p.paper ? null : (
          <tr>
            <th scope="row">Enclosure</th>
            {SLOTS.map((s) => {
              const w = way(s);
              return <td class="n">{w.kind === 'driver' ? boxLabel(w.box.type) : 'flat band'}</td>;
            })}
          </tr>
        )}
        {pick(WAY_ROWS).map((r) => (
          <tr>
            <th scope="row">{r.label}</th>
            {cells(r)}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
