// Driver sheet: Thiele/Small entry with the values the model derives beside them.
import { useState } from 'preact/hooks';
import type { DriverDoc } from '../../engine/design/document.ts';
import { useApp } from '../context.ts';
import { TO_DISPLAY as K } from '../format.ts';
import { Choice, Coefficients, Group, Num, Out, Row, Sheet, TextField, useModel } from '../components/Sheet.tsx';
import type { Slot } from '../store.ts';

function ModelOut(p: { slot: Slot; pick: (m: ReturnType<typeof useModel>) => number | null | undefined; unit?: string; digits?: number }) {
  const m = useModel(p.slot);
  return <Out value={m.system ? p.pick(m) : null} unit={p.unit} digits={p.digits} stale={m.stale} />;
}

export function DriverSheet() {
  const { state, dispatch } = useApp();
  const [folded, setFolded] = useState(true);
  return (
    <Sheet
      id="driver"
      title="Driver sheet"
      intro="Type the driver's published parameters. Any sufficient set will do: fs, Qes, Qms and Vas, or Bl, Mms, Cms and Rms. The model's value of each quantity is shown beside what you typed; leave an optional field empty to have it derived."
    >
      <Row label="Design name" cell={(s) => <TextField slot={s} path="name" label="Design name" />} />
      <Row
        label="Driver"
        hint="make and model, for your notes"
        cell={(s) => <TextField slot={s} path="driver.name" label="Driver name" />}
      />
      <Group title="Small-signal parameters">
        <Row
          label="Resonance"
          symbol="fs"
          cell={(s) => <Num slot={s} path="driver.fs_hz" label="Resonance fs" unit="Hz" step={0.1} model={(y) => y.driver.fs} />}
        />
        <Row
          label="Electrical Q"
          symbol="Qes"
          cell={(s) => <Num slot={s} path="driver.qes" label="Electrical Q" step={0.01} model={(y) => y.driver.qes} />}
        />
        <Row
          label="Mechanical Q"
          symbol="Qms"
          cell={(s) => <Num slot={s} path="driver.qms" label="Mechanical Q" step={0.01} model={(y) => y.driver.qms} />}
        />
        <Row
          label="Total Q"
          symbol="Qts"
          hint="derived"
          cell={(s) => <ModelOut slot={s} pick={(m) => m.system!.driver.qts} digits={3} />}
        />
        <Row
          label="Equivalent volume"
          symbol="Vas"
          cell={(s) => (
            <Num slot={s} path="driver.vas_l" label="Equivalent volume Vas" unit="L" step={0.1} model={(y) => y.driver.vas * K.litres} />
          )}
        />
        <Row
          label="Coil resistance"
          symbol="Re"
          cell={(s) => <Num slot={s} path="driver.re_ohm" label="Coil resistance Re" unit="Ω" step={0.01} model={(y) => y.driver.re} />}
        />
        <Row
          label="Coil inductance"
          symbol="Le"
          cell={(s) => (
            <Num
              slot={s}
              path="driver.le_mh"
              label="Coil inductance Le"
              unit="mH"
              step={0.01}
              model={(y) => y.driver.le * K.mH}
              emptyTag="default"
            />
          )}
        />
        <Row
          label="Cone area"
          symbol="Sd"
          cell={(s) => <Num slot={s} path="driver.sd_cm2" label="Cone area Sd" unit="cm²" step={1} model={(y) => y.driver.sd * K.cm2} />}
        />
      </Group>
      <Group title="Mechanical parameters" note="optional: derived when empty">
        <Row
          label="Force factor"
          symbol="Bl"
          cell={(s) => <Num slot={s} path="driver.bl_tm" label="Force factor Bl" unit="T·m" step={0.01} model={(y) => y.driver.bl} />}
        />
        <Row
          label="Moving mass"
          symbol="Mms"
          cell={(s) => (
            <Num slot={s} path="driver.mms_g" label="Moving mass Mms" unit="g" step={0.1} model={(y) => y.driver.mms * K.grams} />
          )}
        />
        <Row
          label="Compliance"
          symbol="Cms"
          cell={(s) => (
            <Num
              slot={s}
              path="driver.cms_mm_per_n"
              label="Compliance Cms"
              unit="mm/N"
              step={0.001}
              model={(y) => y.driver.cms * K.mmPerN}
            />
          )}
        />
        <Row
          label="Mechanical resistance"
          symbol="Rms"
          cell={(s) => (
            <Num slot={s} path="driver.rms_kg_s" label="Mechanical resistance Rms" unit="kg/s" step={0.01} model={(y) => y.driver.rms} />
          )}
        />
        <Row
          label="Reference efficiency"
          symbol="η0"
          hint="derived, half space"
          cell={(s) => <ModelOut slot={s} pick={(m) => m.analysis?.figures.eta0Pct} unit="%" digits={3} />}
        />
        <Row
          label="Sensitivity"
          hint="2.83 V at 1 m, derived"
          cell={(s) => <ModelOut slot={s} pick={(m) => m.analysis?.figures.sensitivityDb} unit="dB" digits={3} />}
        />
      </Group>
      <Group title="Limits">
        <Row
          label="Linear excursion"
          symbol="Xmax"
          hint="one way"
          cell={(s) => (
            <Num slot={s} path="driver.xmax_mm" label="Linear excursion Xmax" unit="mm" step={0.1} model={(y) => y.driver.xmax * K.mm} />
          )}
        />
        <Row
          label="Mechanical limit"
          symbol="Xlim"
          hint="one way"
          cell={(s) => (
            <Num
              slot={s}
              path="driver.xlim_mm"
              label="Mechanical limit Xlim"
              unit="mm"
              step={0.1}
              model={(y) => y.driver.xlim * K.mm}
              emptyTag="default"
            />
          )}
        />
        <Row
          label="Thermal rating"
          symbol="Pe"
          cell={(s) => <Num slot={s} path="driver.pe_w" label="Thermal rating Pe" unit="W" step={1} model={(y) => y.driver.pe} />}
        />
      </Group>
      <div class="sheet-fold" role="row">
        <button type="button" class="fold" aria-expanded={!folded} aria-controls="driver-large" onClick={() => setFolded(!folded)}>
          <span aria-hidden="true">{folded ? '▸' : '▾'}</span> Large-signal and thermal parameters
        </button>
        <span class="group-note">{folded ? 'folded: defaults fitted from Xmax, Xlim and Pe are used' : ''}</span>
      </div>
      {folded ? null : (
        <div id="driver-large" class="sheet-sub">
          <Group title="Large-signal polynomials" note="relative coefficients c1, c2, … in x (mm), outward positive">
            <Row
              label="Force factor"
              symbol="Bl(x)"
              cell={(s) => (
                <Coefficients
                  slot={s}
                  path="driver.bl_rel_per_mm"
                  label="Force factor polynomial"
                  unitHint="Bl(x) = Bl·(1 + c1·x + c2·x² + …)"
                />
              )}
            />
            <Row
              label="Suspension stiffness"
              symbol="Kms(x)"
              cell={(s) => (
                <Coefficients
                  slot={s}
                  path="driver.kms_rel_per_mm"
                  label="Suspension stiffness polynomial"
                  unitHint="Kms(x) = Kms·(1 + c1·x + …)"
                />
              )}
            />
            <Row
              label="Coil inductance"
              symbol="Le(x)"
              cell={(s) => (
                <Coefficients
                  slot={s}
                  path="driver.le_rel_per_mm"
                  label="Coil inductance polynomial"
                  unitHint="Le(x) = Le·(1 + c1·x + …)"
                />
              )}
            />
            <Row label="Polynomials in use" cell={(s) => <FittedNote slot={s} />} />
          </Group>
          <Group title="Thermal" note="optional: estimated from Pe when empty">
            <Row
              label="Coil to magnet"
              symbol="Rtv"
              cell={(s) => (
                <Num
                  slot={s}
                  path="driver.rtv_k_per_w"
                  label="Thermal resistance coil to magnet"
                  unit="K/W"
                  step={0.1}
                  model={(y) => y.driver.thermal.rtv}
                  emptyTag="estimated"
                />
              )}
            />
            <Row
              label="Coil heat capacity"
              symbol="Ctv"
              cell={(s) => (
                <Num
                  slot={s}
                  path="driver.ctv_j_per_k"
                  label="Coil heat capacity"
                  unit="J/K"
                  step={0.1}
                  model={(y) => y.driver.thermal.ctv}
                  emptyTag="estimated"
                />
              )}
            />
            <Row
              label="Magnet to air"
              symbol="Rtm"
              cell={(s) => (
                <Num
                  slot={s}
                  path="driver.rtm_k_per_w"
                  label="Thermal resistance magnet to air"
                  unit="K/W"
                  step={0.1}
                  model={(y) => y.driver.thermal.rtm}
                  emptyTag="estimated"
                />
              )}
            />
            <Row
              label="Magnet heat capacity"
              symbol="Ctm"
              cell={(s) => (
                <Num
                  slot={s}
                  path="driver.ctm_j_per_k"
                  label="Magnet heat capacity"
                  unit="J/K"
                  step={1}
                  model={(y) => y.driver.thermal.ctm}
                  emptyTag="estimated"
                />
              )}
            />
            <Row
              label="Coil temperature rating"
              cell={(s) => (
                <Num
                  slot={s}
                  path="driver.coil_max_c"
                  label="Coil temperature rating"
                  unit="°C"
                  step={1}
                  model={(y) => y.driver.thermal.coilMaxC}
                  emptyTag="default"
                />
              )}
            />
            <Row
              label="Coil conductor"
              cell={(s) => (
                <Choice<NonNullable<DriverDoc['coil_material']>>
                  slot={s}
                  path="driver.coil_material"
                  label="Coil conductor"
                  value={state.designs[s].driver.coil_material ?? 'copper'}
                  options={[
                    { value: 'copper', label: 'Copper' },
                    { value: 'aluminium', label: 'Aluminium' },
                  ]}
                  onChange={(v) => dispatch({ type: 'edit', slot: s, path: 'driver.coil_material', value: v })}
                />
              )}
            />
          </Group>
        </div>
      )}
    </Sheet>
  );
}

function FittedNote(p: { slot: Slot }) {
  const m = useModel(p.slot);
  if (!m.system) return <span class="na">—</span>;
  const d = m.system.driver;
  return (
    <span class="out-note">
      {d.nonlinearFitted ? 'fitted from Xmax and Xlim' : 'as typed'}
      {d.blRelPerMm.length ? ` · Bl: ${d.blRelPerMm.map((c) => c.toPrecision(3)).join(', ')}` : ''}
    </span>
  );
}
