// Driver sheet, per way: which way, its filter and level, and the Thiele/Small entry of its driver
// with the values the model derives beside them. A flat band has only its filter and level.
import { useState } from 'preact/hooks';
import type { DriverDoc } from '../../engine/design/document.ts';
import type { Driver } from '../../engine/system.ts';
import type { Figures } from '../../engine/response/types.ts';
import { useApp } from '../context.ts';
import { TO_DISPLAY as K } from '../format.ts';
import { Choice, Coefficients, Group, Num, Out, Row, Sheet, TextField, useModel } from '../components/Sheet.tsx';
import { anyShown, useShownWays, WayRows } from '../components/WayPicker.tsx';
import { WayFieldRows } from '../components/WayFields.tsx';
import { wayFigures } from '../analysis-view.ts';
import { systemDriverWay } from '../ways.ts';
import type { Slot } from '../store.ts';
import { ImpedanceFitDialog } from '../components/ImpedanceFitDialog.tsx';
import { DriverShelf } from '../components/DriverShelf.tsx';
import { MeasuredResponseDialog } from '../components/MeasuredResponseDialog.tsx';

/** A numeric driver field: its document key, how it reads, and the model's value of it in display units. */
interface DriverField {
  key: keyof DriverDoc;
  label: string;
  symbol?: string;
  hint?: string;
  unit?: string;
  step: number;
  model?: (d: Driver) => number;
  emptyTag?: 'default' | 'estimated';
  /** The field's accessible name when it is not the label and symbol. */
  aria?: string;
}

const SMALL_SIGNAL: DriverField[] = [
  { key: 'fs_hz', label: 'Resonance', symbol: 'fs', unit: 'Hz', step: 0.1, model: (d) => d.fs },
  { key: 'qes', label: 'Electrical Q', symbol: 'Qes', aria: 'Electrical Q', step: 0.01, model: (d) => d.qes },
  { key: 'qms', label: 'Mechanical Q', symbol: 'Qms', aria: 'Mechanical Q', step: 0.01, model: (d) => d.qms },
  { key: 'vas_l', label: 'Equivalent volume', symbol: 'Vas', unit: 'L', step: 0.1, model: (d) => d.vas * K.litres },
  { key: 're_ohm', label: 'Coil resistance', symbol: 'Re', unit: 'Ω', step: 0.01, model: (d) => d.re },
  { key: 'le_mh', label: 'Coil inductance', symbol: 'Le', unit: 'mH', step: 0.01, model: (d) => d.le * K.mH, emptyTag: 'default' },
  { key: 'sd_cm2', label: 'Cone area', symbol: 'Sd', unit: 'cm²', step: 1, model: (d) => d.sd * K.cm2 },
];
const MECHANICAL: DriverField[] = [
  { key: 'bl_tm', label: 'Force factor', symbol: 'Bl', unit: 'T·m', step: 0.01, model: (d) => d.bl },
  { key: 'mms_g', label: 'Moving mass', symbol: 'Mms', unit: 'g', step: 0.1, model: (d) => d.mms * K.grams },
  { key: 'cms_mm_per_n', label: 'Compliance', symbol: 'Cms', unit: 'mm/N', step: 0.001, model: (d) => d.cms * K.mmPerN },
  { key: 'rms_kg_s', label: 'Mechanical resistance', symbol: 'Rms', unit: 'kg/s', step: 0.01, model: (d) => d.rms },
];
const LIMITS: DriverField[] = [
  { key: 'xmax_mm', label: 'Linear excursion', symbol: 'Xmax', hint: 'one way', unit: 'mm', step: 0.1, model: (d) => d.xmax * K.mm },
  {
    key: 'xlim_mm',
    label: 'Mechanical limit',
    symbol: 'Xlim',
    hint: 'one way',
    unit: 'mm',
    step: 0.1,
    model: (d) => d.xlim * K.mm,
    emptyTag: 'default',
  },
  { key: 'pe_w', label: 'Thermal rating', symbol: 'Pe', unit: 'W', step: 1, model: (d) => d.pe },
];
const THERMAL: DriverField[] = [
  {
    key: 'rtv_k_per_w',
    label: 'Coil to magnet',
    symbol: 'Rtv',
    aria: 'Thermal resistance coil to magnet',
    unit: 'K/W',
    step: 0.1,
    model: (d) => d.thermal.rtv,
    emptyTag: 'estimated',
  },
  {
    key: 'ctv_j_per_k',
    label: 'Coil heat capacity',
    symbol: 'Ctv',
    aria: 'Coil heat capacity',
    unit: 'J/K',
    step: 0.1,
    model: (d) => d.thermal.ctv,
    emptyTag: 'estimated',
  },
  {
    key: 'rtm_k_per_w',
    label: 'Magnet to air',
    symbol: 'Rtm',
    aria: 'Thermal resistance magnet to air',
    unit: 'K/W',
    step: 0.1,
    model: (d) => d.thermal.rtm,
    emptyTag: 'estimated',
  },
  {
    key: 'ctm_j_per_k',
    label: 'Magnet heat capacity',
    symbol: 'Ctm',
    aria: 'Magnet heat capacity',
    unit: 'J/K',
    step: 1,
    model: (d) => d.thermal.ctm,
    emptyTag: 'estimated',
  },
  { key: 'coil_max_c', label: 'Coil temperature rating', unit: '°C', step: 1, model: (d) => d.thermal.coilMaxC, emptyTag: 'default' },
];
const POLYNOMIALS: { key: keyof DriverDoc; label: string; symbol: string; title: string; hint: string }[] = [
  {
    key: 'bl_rel_per_mm',
    label: 'Force factor',
    symbol: 'Bl(x)',
    title: 'Force factor polynomial',
    hint: 'Bl(x) = Bl·(1 + c1·x + c2·x² + …)',
  },
  {
    key: 'kms_rel_per_mm',
    label: 'Suspension stiffness',
    symbol: 'Kms(x)',
    title: 'Suspension stiffness polynomial',
    hint: 'Kms(x) = Kms·(1 + c1·x + …)',
  },
  {
    key: 'le_rel_per_mm',
    label: 'Coil inductance',
    symbol: 'Le(x)',
    title: 'Coil inductance polynomial',
    hint: 'Le(x) = Le·(1 + c1·x + …)',
  },
];

export function DriverSheet() {
  const { state, dispatch } = useApp();
  const shown = useShownWays();
  const [folded, setFolded] = useState(true);
  const [fitting, setFitting] = useState<Slot | null>(null);
  const [measuring, setMeasuring] = useState<Slot | null>(null);
  const isDriver = (s: Slot) => shown[s].way.kind === 'driver';
  const path = (s: Slot, key: string) => `${shown[s].path}.driver.${key}`;
  /** One driver as entered, in the model: for display and per-driver limits. */
  const unitOf = (s: Slot, system: Parameters<typeof systemDriverWay>[0]) =>
    systemDriverWay(system, state.designs[s], shown[s].index)?.unit ?? null;
  const fieldRow = (f: DriverField) => (
    <Row
      label={f.label}
      symbol={f.symbol}
      hint={f.hint}
      cell={(s) =>
        isDriver(s) ? (
          <Num
            slot={s}
            path={path(s, f.key)}
            label={f.aria ?? `${f.label}${f.symbol ? ` ${f.symbol}` : ''}`}
            unit={f.unit}
            step={f.step}
            model={f.model ? (y) => (unitOf(s, y) ? f.model!(unitOf(s, y)!) : null) : undefined}
            emptyTag={f.emptyTag}
          />
        ) : null
      }
    />
  );
  const anyDriver = anyShown(shown, 'driver');
  return (
    <Sheet
      id="driver"
      title="Driver sheet"
      intro="Each way of a design has its own driver, filter and level. Pick the way, then type the driver's published parameters. Any sufficient set will do: fs, Qes, Qms and Vas, or Bl, Mms, Cms and Rms. The model's value of each quantity is shown beside what you typed; leave an optional field empty to have it derived."
    >
      <Row label="Design name" cell={(s) => <TextField slot={s} path="name" label="Design name" />} />
      <WayRows />
      <WayFieldRows />
      {anyDriver ? (
        <>
          <Row
            label="Driver"
            hint="make and model, for your notes"
            cell={(s) => (isDriver(s) ? <TextField slot={s} path={path(s, 'name')} label="Driver name" /> : null)}
          />
          <Row
            label="From a measurement"
            hint="fit the fields to an impedance sweep"
            cell={(s) =>
              isDriver(s) ? (
                <button type="button" onClick={() => setFitting(s)}>
                  Fit from impedance…
                </button>
              ) : null
            }
          />
          {fitting && isDriver(fitting) ? (
            <ImpedanceFitDialog slot={fitting} wayIndex={shown[fitting].index} onClose={() => setFitting(null)} />
          ) : null}
          <Row
            label="Measured response"
            hint="the way plays it above a blend frequency"
            cell={(s) => {
              const way = shown[s].way;
              if (way.kind !== 'driver') return null;
              const m = way.measured_response;
              return (
                <>
                  <button type="button" onClick={() => setMeasuring(s)}>
                    Import measured response…
                  </button>
                  {m ? <span class="group-note"> above {m.blend_hz} Hz</span> : null}
                </>
              );
            }}
          />
          {measuring && isDriver(measuring) ? (
            <MeasuredResponseDialog slot={measuring} wayIndex={shown[measuring].index} onClose={() => setMeasuring(null)} />
          ) : null}
          <DriverShelf />
          <Group title="Small-signal parameters">
            {SMALL_SIGNAL.slice(0, 3).map(fieldRow)}
            <Row
              label="Total Q"
              symbol="Qts"
              hint="derived"
              cell={(s) =>
                isDriver(s) ? <ModelOut slot={s} pick={(m) => (m.system ? unitOf(s, m.system)?.qts : null)} digits={3} /> : null
              }
            />
            {SMALL_SIGNAL.slice(3).map(fieldRow)}
          </Group>
          <Group title="Mechanical parameters" note="optional: derived when empty">
            {MECHANICAL.map(fieldRow)}
            <Row
              label="Reference efficiency"
              symbol="η0"
              hint="derived, half space"
              cell={(s) => (isDriver(s) ? <FigureOut slot={s} index={shown[s].index} pick={(f) => f.eta0Pct} unit="%" /> : null)}
            />
            <Row
              label="Sensitivity"
              hint="2.83 V at 1 m, derived"
              cell={(s) => (isDriver(s) ? <FigureOut slot={s} index={shown[s].index} pick={(f) => f.sensitivityDb} unit="dB" /> : null)}
            />
          </Group>
          <Group title="Limits">{LIMITS.map(fieldRow)}</Group>
          <div class="sheet-fold" role="row">
            <span role="cell">
              <button type="button" class="fold" aria-expanded={!folded} aria-controls="driver-large" onClick={() => setFolded(!folded)}>
                <span aria-hidden="true">{folded ? '▸' : '▾'}</span> Large-signal and thermal parameters
              </button>
            </span>
            <span role="cell" class="group-note">
              {folded ? 'folded: defaults fitted from Xmax, Xlim and Pe are used' : ''}
            </span>
          </div>
          {folded ? null : (
            <div id="driver-large" class="sheet-sub">
              <Group title="Large-signal polynomials" note="relative coefficients c1, c2, … in x (mm), outward positive">
                {POLYNOMIALS.map((p) => (
                  <Row
                    label={p.label}
                    symbol={p.symbol}
                    cell={(s) => (isDriver(s) ? <Coefficients slot={s} path={path(s, p.key)} label={p.title} unitHint={p.hint} /> : null)}
                  />
                ))}
                <Row label="Polynomials in use" cell={(s) => (isDriver(s) ? <FittedNote slot={s} index={shown[s].index} /> : null)} />
              </Group>
              <Group title="Thermal" note="optional: estimated from Pe when empty">
                {THERMAL.map(fieldRow)}
                <Row
                  label="Coil conductor"
                  cell={(s) => {
                    const w = shown[s].way;
                    return w.kind === 'driver' ? (
                      <Choice<NonNullable<DriverDoc['coil_material']>>
                        slot={s}
                        path={path(s, 'coil_material')}
                        label="Coil conductor"
                        value={w.driver.coil_material ?? 'copper'}
                        options={[
                          { value: 'copper', label: 'Copper' },
                          { value: 'aluminium', label: 'Aluminium' },
                        ]}
                        onChange={(v) => dispatch({ type: 'edit', slot: s, path: path(s, 'coil_material'), value: v })}
                      />
                    ) : null;
                  }}
                />
              </Group>
            </div>
          )}
        </>
      ) : null}
    </Sheet>
  );
}

function ModelOut(p: { slot: Slot; pick: (m: ReturnType<typeof useModel>) => number | null | undefined; unit?: string; digits?: number }) {
  const m = useModel(p.slot);
  return <Out value={m.system ? p.pick(m) : null} unit={p.unit} digits={p.digits} stale={m.stale} />;
}

/** A figure of the shown way from the analysis. */
export function FigureOut(p: {
  slot: Slot;
  index: number;
  pick: (f: Partial<Figures>) => number | null | undefined;
  unit?: string;
  digits?: number;
  testId?: string;
}) {
  const { state } = useApp();
  const m = useModel(p.slot);
  const f = m.analysis ? wayFigures(m.analysis, state.designs[p.slot], p.index) : null;
  return (
    <span data-testid={p.testId}>
      <Out value={f ? p.pick(f) : null} unit={p.unit} digits={p.digits} stale={m.stale} />
    </span>
  );
}

function FittedNote(p: { slot: Slot; index: number }) {
  const { state } = useApp();
  const m = useModel(p.slot);
  const d = m.system ? systemDriverWay(m.system, state.designs[p.slot], p.index)?.unit : null;
  if (!d) return <span class="na">—</span>;
  return (
    <span class="out-note">
      {d.nonlinearFitted ? 'fitted from Xmax and Xlim' : 'as typed'}
      {d.blRelPerMm.length ? ` · Bl: ${d.blRelPerMm.map((c) => c.toPrecision(3)).join(', ')}` : ''}
    </span>
  );
}
