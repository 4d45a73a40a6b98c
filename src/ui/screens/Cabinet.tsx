// Cabinet: box type, volume, tuning, ports or radiator, losses, fill; alignment suggestions.
import type { BoxDoc, PortDoc } from '../../engine/design/document.ts';
import { useApp } from '../context.ts';
import { PORT_SPEED_LIMIT, suggestionsFor } from '../engine.ts';
import { num, peakOf, TO_DISPLAY as K } from '../format.ts';
import { boxOfType, portOfShape, portShape, type BoxType, type PortShape } from '../boxes.ts';
import { Choice, Group, Num, Out, Row, Sheet, useModel } from '../components/Sheet.tsx';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';

const BOX_TYPES: { value: BoxType; label: string }[] = [
  { value: 'sealed', label: 'Sealed' },
  { value: 'vented', label: 'Vented (port)' },
  { value: 'passive-radiator', label: 'Passive radiator' },
];

function useBox(slot: Slot) {
  const { state } = useApp();
  return state.designs[slot].box;
}

function Lossless(p: { slot: Slot }) {
  const { dispatch } = useApp();
  const box = useBox(p.slot);
  const lossless = box.ql === null;
  return (
    <label class="check">
      <input
        type="checkbox"
        checked={lossless}
        onChange={(e) =>
          dispatch({ type: 'edit', slot: p.slot, path: 'box.ql', value: (e.currentTarget as HTMLInputElement).checked ? null : undefined })
        }
      />{' '}
      lossless
    </label>
  );
}

function PortSpeed(p: { slot: Slot }) {
  const m = useModel(p.slot);
  const c = m.analysis?.curves;
  if (!c || !c.plannedPortAirSpeed) return <span class="na">no port</span>;
  const peak = peakOf(c.plannedPortAirSpeed);
  if (!peak) return <span class="na">—</span>;
  const over = peak.value > PORT_SPEED_LIMIT;
  return (
    <output class={`out${m.stale ? ' stale' : ''}${over ? ' over' : ''}`}>
      {num(peak.value, 3)} m/s{' '}
      <span class="out-note">
        at {num(c.freqHz[peak.index], 3)} Hz · limit {PORT_SPEED_LIMIT} m/s{over ? ' — likely audible port noise' : ''}
      </span>
    </output>
  );
}

function Suggestions(p: { slot: Slot }) {
  const { dispatch, store } = useApp();
  const m = useModel(p.slot);
  const box = useBox(p.slot);
  if (!m.system || m.stale) return <p class="na">Suggestions appear when the driver and the rest of the design are valid.</p>;
  const list = suggestionsFor(m.system);
  if (list.length === 0) return <p class="na">No published alignment fits this driver.</p>;
  return (
    <table class="suggest">
      <caption class="visually-hidden">Alignment suggestions for design {SLOT_LABEL[p.slot]}</caption>
      <thead>
        <tr>
          <th scope="col">Alignment</th>
          <th scope="col" class="n">
            Vb
          </th>
          <th scope="col" class="n">
            fb / fc
          </th>
          <th scope="col" class="n">
            f3
          </th>
          <th scope="col">
            <span class="visually-hidden">Apply</span>
          </th>
        </tr>
      </thead>
      <tbody>
        {list.map((s) => {
          const current = JSON.stringify(s.box) === JSON.stringify(box);
          return (
            <tr class={current ? 'current' : ''}>
              <th scope="row">
                <span class="sg-label">{s.label}</span>
                {s.note ? <span class="sg-note">{s.note}</span> : null}
              </th>
              <td class="n">{num(s.vbL, 3)} L</td>
              <td class="n">{s.fbHz !== undefined ? `${num(s.fbHz, 3)} Hz` : s.fcHz !== undefined ? `${num(s.fcHz, 3)} Hz` : '—'}</td>
              <td class="n">{num(s.f3Hz, 3)} Hz</td>
              <td>
                {current ? (
                  <span class="applied">in use</span>
                ) : (
                  <button
                    type="button"
                    class="small"
                    aria-label={`Apply ${s.label} to design ${SLOT_LABEL[p.slot]}`}
                    onClick={() =>
                      dispatch({
                        type: 'replace',
                        slot: p.slot,
                        design: { ...store.get().designs[p.slot], box: structuredClone(s.box) },
                        reason: `apply ${s.label} to ${SLOT_LABEL[p.slot]}`,
                      })
                    }
                  >
                    Apply
                  </button>
                )}
              </td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

export function Cabinet() {
  const app = useApp();
  const { state, dispatch } = app;
  const types = new Set(SLOTS.map((s) => state.designs[s].box.type));
  const anyVented = types.has('vented');
  const anyRadiator = types.has('passive-radiator');
  const anySealed = types.has('sealed');
  const setType = (slot: Slot, t: BoxType) => {
    const d = app.store.get().designs[slot];
    const m = app.derived[slot];
    const sys = m.parse.ok ? m.parse.system : null;
    const next = boxOfType(d.box, t, sys ? suggestionsFor(sys) : [], d.driver.sd_cm2, d.driver.xmax_mm);
    dispatch({ type: 'replace', slot, design: { ...d, box: next }, reason: `make ${SLOT_LABEL[slot]} ${t}` });
  };
  const ventedOnly = (slot: Slot, f: (box: Extract<BoxDoc, { type: 'vented' }>, port: PortDoc) => preact.VNode | null) => {
    const box = state.designs[slot].box;
    return box.type === 'vented' ? f(box, box.ports[0] ?? {}) : null;
  };
  const radiatorOnly = (slot: Slot, f: () => preact.VNode) => (state.designs[slot].box.type === 'passive-radiator' ? f() : null);
  return (
    <>
      <Sheet
        id="cabinet"
        title="Cabinet"
        intro="The enclosure of each design. Volumes are net internal volumes; the port length shown is the physical length of one port for the tuning asked."
      >
        <Group title="Enclosure">
          <Row
            label="Type"
            cell={(s) => (
              <Choice<BoxType>
                slot={s}
                path="box.type"
                label="Enclosure type"
                value={state.designs[s].box.type}
                options={BOX_TYPES}
                onChange={(t) => setType(s, t)}
              />
            )}
          />
          <Row
            label="Net volume"
            symbol="Vb"
            cell={(s) => (
              <Num
                slot={s}
                path="box.vb_l"
                label="Net volume Vb"
                unit="L"
                step={0.5}
                model={(y) => y.box.vbNet * K.litres}
                slider={{ min: 2, max: 200, log: true }}
              />
            )}
          />
          <Row
            label="Acoustic volume"
            hint="with fill"
            cell={(s) => <DerivedOut slot={s} pick={(m) => m.system!.box.vb * K.litres} unit="L" />}
          />
          <Row
            label="Box losses"
            symbol="QL"
            hint="empty: vented 7, sealed lossless"
            cell={(s) => (
              <div class="inline">
                {state.designs[s].box.ql === null ? (
                  <span class="out">lossless</span>
                ) : (
                  <Num
                    slot={s}
                    path="box.ql"
                    label="Box losses QL"
                    step={0.5}
                    model={(y) => y.box.ql}
                    emptyTag="default"
                    placeholder={state.designs[s].box.type === 'sealed' && state.designs[s].box.ql === undefined ? 'none' : undefined}
                  />
                )}
                <Lossless slot={s} />
              </div>
            )}
          />
          {anySealed ? (
            <Row
              label="Fill"
              hint="0 none … 1 densely filled"
              cell={(s) =>
                state.designs[s].box.type === 'sealed' ? <Num slot={s} path="box.fill" label="Fill" step={0.05} min={0} max={1} /> : null
              }
            />
          ) : null}
        </Group>
        {anySealed ? (
          <Group title="Closed-box result">
            <Row
              label="System resonance"
              symbol="fc"
              cell={(s) =>
                state.designs[s].box.type === 'sealed' ? <DerivedOut slot={s} pick={(m) => m.analysis?.figures.fcHz} unit="Hz" /> : null
              }
            />
            <Row
              label="System Q"
              symbol="Qtc"
              cell={(s) => (state.designs[s].box.type === 'sealed' ? <DerivedOut slot={s} pick={(m) => m.analysis?.figures.qtc} /> : null)}
            />
          </Group>
        ) : null}
        {anyVented ? (
          <Group title="Port">
            <Row
              label="Tuning"
              symbol="fb"
              cell={(s) =>
                ventedOnly(s, () => (
                  <Num
                    slot={s}
                    path="box.fb_hz"
                    label="Tuning fb"
                    unit="Hz"
                    step={0.5}
                    model={(y) => ('fb' in y.box ? y.box.fb : null)}
                    slider={{ min: 15, max: 120, log: true }}
                  />
                ))
              }
            />
            <Row
              label="Port shape"
              cell={(s) =>
                ventedOnly(s, (_b, port) => (
                  <Choice<PortShape>
                    slot={s}
                    path="box.ports.0.shape"
                    label="Port shape"
                    value={portShape(port)}
                    options={[
                      { value: 'round', label: 'Round tube' },
                      { value: 'slot', label: 'Slot' },
                    ]}
                    onChange={(shape) => dispatch({ type: 'edit', slot: s, path: 'box.ports.0', value: portOfShape(port, shape) })}
                  />
                ))
              }
            />
            <Row
              label="Port count"
              cell={(s) =>
                ventedOnly(s, () => <Num slot={s} path="box.ports.0.count" label="Port count" step={1} min={1} placeholder="1" />)
              }
            />
            <Row
              label="Port size"
              hint="inner"
              cell={(s) =>
                ventedOnly(s, (_b, port) =>
                  portShape(port) === 'round' ? (
                    <Num
                      slot={s}
                      path="box.ports.0.diameter_cm"
                      label="Port diameter"
                      unit="cm ⌀"
                      step={0.1}
                      alsoPaths={['box.ports', 'box.ports.0']}
                    />
                  ) : (
                    <div class="pair">
                      <Num
                        slot={s}
                        path="box.ports.0.width_cm"
                        label="Slot width"
                        unit="cm wide"
                        step={0.1}
                        alsoPaths={['box.ports', 'box.ports.0']}
                      />
                      <Num slot={s} path="box.ports.0.height_cm" label="Slot height" unit="cm high" step={0.1} />
                    </div>
                  ),
                )
              }
            />
            <Row
              label="Outer end"
              cell={(s) =>
                ventedOnly(s, (_b, port) => (
                  <Choice<'flanged' | 'free'>
                    slot={s}
                    path="box.ports.0.outer_end"
                    label="Port outer end"
                    value={port.outer_end ?? 'flanged'}
                    options={[
                      { value: 'flanged', label: 'Flush with the baffle' },
                      { value: 'free', label: 'Protruding (free end)' },
                    ]}
                    onChange={(v) => dispatch({ type: 'edit', slot: s, path: 'box.ports.0.outer_end', value: v })}
                  />
                ))
              }
            />
            <Row
              label="Port length"
              hint="physical, one port"
              cell={(s) => ventedOnly(s, () => <DerivedOut slot={s} pick={(m) => m.analysis?.figures.portLengthCm} unit="cm" />)}
            />
            <Row label="Port air speed" hint="peak, at the planned level" cell={(s) => ventedOnly(s, () => <PortSpeed slot={s} />)} />
          </Group>
        ) : null}
        {anyRadiator ? (
          <Group title="Passive radiator">
            <Row
              label="Radiator area"
              symbol="Sp"
              cell={(s) =>
                radiatorOnly(s, () => (
                  <Num slot={s} path="box.radiator.sd_cm2" label="Radiator area" unit="cm²" step={1} alsoPaths={['box.radiator']} />
                ))
              }
            />
            <Row
              label="Moving mass"
              symbol="Mmp"
              hint="with added mass"
              cell={(s) => radiatorOnly(s, () => <Num slot={s} path="box.radiator.mmp_g" label="Radiator moving mass" unit="g" step={1} />)}
            />
            <Row
              label="Compliance"
              symbol="Cmp"
              cell={(s) =>
                radiatorOnly(s, () => <Num slot={s} path="box.radiator.cmp_mm_per_n" label="Radiator compliance" unit="mm/N" step={0.01} />)
              }
            />
            <Row
              label="Mechanical Q"
              symbol="Qmp"
              cell={(s) => radiatorOnly(s, () => <Num slot={s} path="box.radiator.qmp" label="Radiator mechanical Q" step={0.5} />)}
            />
            <Row
              label="Linear excursion"
              symbol="Xmax"
              cell={(s) => radiatorOnly(s, () => <Num slot={s} path="box.radiator.xmax_mm" label="Radiator Xmax" unit="mm" step={0.1} />)}
            />
            <Row
              label="Radiator count"
              cell={(s) =>
                radiatorOnly(s, () => <Num slot={s} path="box.radiator.count" label="Radiator count" step={1} min={1} placeholder="1" />)
              }
            />
            <Row
              label="Tuning"
              symbol="fb"
              hint="derived"
              cell={(s) => radiatorOnly(s, () => <DerivedOut slot={s} pick={(m) => m.analysis?.figures.fbHz} unit="Hz" />)}
            />
            <Row
              label="Free-air resonance"
              symbol="fp"
              hint="the notch"
              cell={(s) => radiatorOnly(s, () => <DerivedOut slot={s} pick={(m) => m.analysis?.figures.fpHz} unit="Hz" />)}
            />
          </Group>
        ) : null}
        <Group title="Result">
          <Row
            label="Low-frequency limit"
            symbol="f3"
            hint="−3 dB"
            cell={(s) => <DerivedOut slot={s} pick={(m) => m.analysis?.figures.f3Hz} unit="Hz" testId={`f3-${s}`} />}
          />
        </Group>
      </Sheet>
      <section class="sheet" aria-labelledby="suggest-h">
        <h2 id="suggest-h">Alignment suggestions</h2>
        <p class="sheet-intro">
          Published alignments for each design's driver, with a port sized for the air-speed limit. Apply replaces that design's enclosure;
          Undo brings it back.
        </p>
        <div class="two-col">
          {SLOTS.map((s) => (
            <div class={`col col-${s}`}>
              <h3>
                <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span> {state.designs[s].name}
              </h3>
              <Suggestions slot={s} />
            </div>
          ))}
        </div>
      </section>
    </>
  );
}

function DerivedOut(p: {
  slot: Slot;
  pick: (m: ReturnType<typeof useModel>) => number | null | undefined;
  unit?: string;
  digits?: number;
  testId?: string;
}) {
  const m = useModel(p.slot);
  return (
    <span data-testid={p.testId}>
      <Out value={m.system ? p.pick(m) : null} unit={p.unit} digits={p.digits} stale={m.stale} />
    </span>
  );
}
