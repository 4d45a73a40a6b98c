// The figures a designer reads first, for A and B side by side.
import type { Analysis } from '../engine/response/types.ts';
import { useApp } from './context.ts';
import { PORT_SPEED_LIMIT } from './engine.ts';
import { num, peakOf, TO_DISPLAY as K } from './format.ts';
import { SLOTS, SLOT_LABEL, type Slot } from './store.ts';

interface FigureRow {
  label: string;
  unit: string;
  value: (a: Analysis) => number | null | undefined;
  digits?: number;
  /** Marks a value that passes a limit. */
  over?: (a: Analysis) => boolean;
  id: string;
}

const BOX_NAME = { sealed: 'Sealed', vented: 'Vented', 'passive-radiator': 'Passive radiator' } as const;

const ROWS: FigureRow[] = [
  { id: 'f3', label: 'f3 (−3 dB)', unit: 'Hz', value: (a) => a.figures.f3Hz },
  { id: 'f10', label: 'f10 (−10 dB)', unit: 'Hz', value: (a) => a.figures.f10Hz },
  { id: 'fc', label: 'fc', unit: 'Hz', value: (a) => a.figures.fcHz },
  { id: 'qtc', label: 'Qtc', unit: '', value: (a) => a.figures.qtc },
  { id: 'fb', label: 'fb', unit: 'Hz', value: (a) => a.figures.fbHz },
  { id: 'fp', label: 'fp (radiator notch)', unit: 'Hz', value: (a) => a.figures.fpHz },
  { id: 'sens', label: 'Sensitivity, 2.83 V at 1 m', unit: 'dB', value: (a) => a.figures.sensitivityDb },
  { id: 'volts', label: 'Drive for the planned level', unit: 'V rms', value: (a) => a.figures.plannedVoltsRms },
  {
    id: 'xpk',
    label: 'Peak excursion, planned level',
    unit: 'mm',
    value: (a) => peakOf(a.curves.plannedExcursionMm)?.value,
    over: (a) => (peakOf(a.curves.plannedExcursionMm)?.value ?? 0) > a.system.driver.xmax * K.mm,
  },
  { id: 'xmax', label: 'Xmax', unit: 'mm', value: (a) => a.system.driver.xmax * K.mm },
  { id: 'port', label: 'Port length (one port)', unit: 'cm', value: (a) => a.figures.portLengthCm },
  {
    id: 'vport',
    label: 'Peak port air speed, planned level',
    unit: 'm/s',
    value: (a) => peakOf(a.curves.plannedPortAirSpeed)?.value,
    over: (a) => (peakOf(a.curves.plannedPortAirSpeed)?.value ?? 0) > PORT_SPEED_LIMIT,
  },
  { id: 'zmin', label: 'Minimum impedance', unit: 'Ω', value: (a) => a.figures.zMinOhm },
];

export function FigureTable(p: { compact?: boolean }) {
  const { derived, state } = useApp();
  const an: Record<Slot, Analysis | null> = { a: derived.a.analysis, b: derived.b.analysis };
  const rows = ROWS.filter((r) => SLOTS.some((s) => an[s] && r.value(an[s]!) !== null && r.value(an[s]!) !== undefined));
  const shown = p.compact ? rows.filter((r) => ['f3', 'fc', 'qtc', 'fb', 'fp', 'sens', 'xpk', 'vport', 'port'].includes(r.id)) : rows;
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
        <tr>
          <th scope="row">Enclosure</th>
          {SLOTS.map((s) => (
            <td class="n">{BOX_NAME[state.designs[s].box.type]}</td>
          ))}
        </tr>
        {shown.map((r) => (
          <tr>
            <th scope="row">{r.label}</th>
            {SLOTS.map((s) => {
              const a = an[s];
              const v = a ? r.value(a) : null;
              const over = a && r.over ? r.over(a) : false;
              return (
                <td class={`n${over ? ' over' : ''}${derived[s].stale ? ' stale' : ''}`} data-testid={`fig-${s}-${r.id}`}>
                  {num(v, r.digits ?? 3)}
                  {v !== null && v !== undefined && r.unit ? <span class="u"> {r.unit}</span> : null}
                  {over ? <span class="visually-hidden"> (over the limit)</span> : null}
                </td>
              );
            })}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
