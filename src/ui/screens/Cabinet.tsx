// Cabinet, per way: box type, volume, tuning, ports or radiator, losses, fill; alignment suggestions.
// A flat band has no cabinet.
import type { BoxDoc, DriverWayDoc, PortDoc } from '../../engine/design/document.ts';
import type { Figures } from '../../engine/response/types.ts';
import type { SpeakerSystem } from '../../engine/system.ts';
import { useApp } from '../context.ts';
import { boxFigures, PORT_SPEED_LIMIT, suggestionsFor } from '../engine.ts';
import { num, peakOf, TO_DISPLAY as K } from '../format.ts';
import { BOX_CHOICES, boxOfType, portOfShape, portShape, type BoxType, type PortShape } from '../boxes.ts';
import { Choice, Group, Num, Out, Row, Sheet, useModel } from '../components/Sheet.tsx';
import { useShownWays, WayRows } from '../components/WayPicker.tsx';
import { wayCurves } from '../analysis-view.ts';
import { firstDriverIndex, systemDriverWay } from '../ways.ts';
import { setAt } from '../paths.ts';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';
import { FigureOut } from './DriverSheet.tsx';

/** The shown way's box, or null for a flat band. */
function useBox(slot: Slot): { box: BoxDoc; path: string; index: number } | null {
  const shown = useShownWays()[slot];
  return shown.way.kind === 'driver' ? { box: shown.way.box, path: `${shown.path}.box`, index: shown.index } : null;
}

function Lossless(p: { slot: Slot }) {
  const { dispatch } = useApp();
  const b = useBox(p.slot);
  if (!b) return null;
  const lossless = b.box.ql === null;
  return (
    <label class="check">
      <input
        type="checkbox"
        checked={lossless}
        onChange={(e) =>
          dispatch({
            type: 'edit',
            slot: p.slot,
            path: `${b.path}.ql`,
            value: (e.currentTarget as HTMLInputElement).checked ? null : undefined,
          })
        }
      />{' '}
      lossless
    </label>
  );
}

function PortSpeed(p: { slot: Slot; index: number }) {
  const { state } = useApp();
  const m = useModel(p.slot);
  const c = m.analysis ? wayCurves(m.analysis, state.designs[p.slot], p.index) : null;
  if (!m.analysis || !c || !c.plannedPortAirSpeed) return <span class="na">no port</span>;
  const peak = peakOf(c.plannedPortAirSpeed);
  const freqHz = m.analysis.curves.freqHz;
  if (!peak) return <span class="na">—</span>;
  const over = peak.value > PORT_SPEED_LIMIT;
  return (
    <output class={`out${m.stale ? ' stale' : ''}${over ? ' over' : ''}`}>
      {num(peak.value, 3)} m/s{' '}
      <span class="out-note">
        at {num(freqHz[peak.index], 3)} Hz · limit {PORT_SPEED_LIMIT} m/s{over ? ' — likely audible port noise' : ''}
      </span>
    </output>
  );
}

function Suggestions(p: { slot: Slot }) {
  const { dispatch, store, state } = useApp();
  const m = useModel(p.slot);
  const b = useBox(p.slot);
  if (!b) return <p class="na">A flat band has no cabinet.</p>;
  // The engine suggests alignments for the first driver way (the woofer).
  if (b.index !== firstDriverIndex(state.designs[p.slot])) return <p class="na">Suggestions are offered for the first driver way.</p>;
  if (!m.system || m.stale) return <p class="na">Suggestions appear when the driver and the rest of the design are valid.</p>;
  const list = suggestionsFor(m.system);
  const box = b.box;
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
                        design: setAt(store.get().designs[p.slot], b.path, structuredClone(s.box)),
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

type PortedBoxDoc = Extract<BoxDoc, { ports: PortDoc[] }>;

export function Cabinet() {
  const app = useApp();
  const { state, dispatch } = app;
  const shown = useShownWays();
  const boxOf = (s: Slot): BoxDoc | null => (shown[s].way.kind === 'driver' ? (shown[s].way as DriverWayDoc).box : null);
  const bp = (s: Slot, sub: string) => `${shown[s].path}.box.${sub}`;
  const types = new Set(SLOTS.map((s) => boxOf(s)?.type));
  const anyPorted = SLOTS.some((s) => {
    const b = boxOf(s);
    return !!b && 'ports' in b;
  });
  const anyBandpass = types.has('bandpass4');
  const anyRadiator = types.has('passive-radiator');
  const anySealed = types.has('sealed');
  const anyBox = SLOTS.some((s) => boxOf(s) !== null);
  const boxModel = (s: Slot, y: SpeakerSystem) => systemDriverWay(y, state.designs[s], shown[s].index)?.box ?? null;
  const setType = (slot: Slot, t: BoxType) => {
    const d = app.store.get().designs[slot];
    const way = d.ways[shown[slot].index];
    if (!way || way.kind !== 'driver') return;
    const m = app.derived[slot];
    // Suggestions are the first driver way's; another way starts from placeholders.
    const sys = m.parse.ok && shown[slot].index === firstDriverIndex(d) ? m.parse.system : null;
    const next = boxOfType(way.box, t, sys ? suggestionsFor(sys) : [], way.driver.sd_cm2, way.driver.xmax_mm);
    dispatch({
      type: 'replace',
      slot,
      design: setAt(d, `${shown[slot].path}.box`, next),
      reason: `make ${SLOT_LABEL[slot]} ${way.name} ${t}`,
    });
  };
  const boxed = (slot: Slot, f: (box: BoxDoc) => preact.VNode | null) => {
    const box = boxOf(slot);
    return box ? f(box) : null;
  };
  const ventedOnly = (slot: Slot, f: (box: PortedBoxDoc, port: PortDoc) => preact.VNode | null) => {
    const box = boxOf(slot);
    return box && 'ports' in box ? f(box, box.ports[0] ?? {}) : null;
  };
  const bandpassOnly = (slot: Slot, f: () => preact.VNode) => (boxOf(slot)?.type === 'bandpass4' ? f() : null);
  const withVolume = (slot: Slot, f: () => preact.VNode) => {
    const box = boxOf(slot);
    return box && 'vb_l' in box ? f() : null;
  };
  const radiatorOnly = (slot: Slot, f: () => preact.VNode) => (boxOf(slot)?.type === 'passive-radiator' ? f() : null);
  const sealedOnly = (slot: Slot, f: () => preact.VNode) => (boxOf(slot)?.type === 'sealed' ? f() : null);
  const fig = (s: Slot, pick: (f: Partial<Figures>) => number | null | undefined, unit?: string, testId?: string) => (
    <FigureOut slot={s} index={shown[s].index} pick={pick} unit={unit} testId={testId} />
  );
  return (
    <>
      <Sheet
        id="cabinet"
        title="Cabinet"
        intro="The enclosure of each way. Volumes are net internal volumes; the port length shown is the physical length of one port for the tuning asked. A closed-back tweeter or midrange is a small sealed box."
      >
        <WayRows />
        {anyBox ? null : <Row label="Enclosure" cell={() => <span class="na">a flat band has no cabinet</span>} />}
        {anyBox ? (
          <Group title="Enclosure">
            <Row
              label="Type"
              cell={(s) =>
                boxed(s, (box) => (
                  <Choice<BoxType>
                    slot={s}
                    path={bp(s, 'type')}
                    label="Enclosure type"
                    value={box.type}
                    options={BOX_CHOICES}
                    onChange={(t) => setType(s, t)}
                  />
                ))
              }
            />
            <Row
              label="Net volume"
              symbol="Vb"
              cell={(s) =>
                withVolume(s, () => (
                  <Num
                    slot={s}
                    path={bp(s, 'vb_l')}
                    label="Net volume Vb"
                    unit="L"
                    step={0.5}
                    model={(y) => (boxModel(s, y) ? boxModel(s, y)!.vbNet * K.litres : null)}
                    slider={{ min: 0.05, max: 200, log: true }}
                  />
                ))
              }
            />
            {anyBandpass ? (
              <>
                <Row
                  label="Rear chamber"
                  hint="sealed, behind the driver"
                  cell={(s) =>
                    bandpassOnly(s, () => <Num slot={s} path={bp(s, 'vb_rear_l')} label="Rear chamber volume" unit="L" step={0.5} />)
                  }
                />
                <Row
                  label="Front chamber"
                  hint="vented, in front of the driver"
                  cell={(s) =>
                    bandpassOnly(s, () => <Num slot={s} path={bp(s, 'vb_front_l')} label="Front chamber volume" unit="L" step={0.5} />)
                  }
                />
              </>
            ) : null}
            <Row
              label="Acoustic volume"
              hint="with fill"
              cell={(s) => boxed(s, () => <DerivedOut slot={s} pick={(y) => (boxModel(s, y)?.vb ?? NaN) * K.litres} unit="L" />)}
            />
            <Row
              label="Box losses"
              symbol="QL"
              hint="empty: vented 7, sealed lossless"
              cell={(s) =>
                boxed(s, (box) => (
                  <div class="inline">
                    {box.ql === null ? (
                      <span class="out">lossless</span>
                    ) : (
                      <Num
                        slot={s}
                        path={bp(s, 'ql')}
                        label="Box losses QL"
                        step={0.5}
                        model={(y) => boxModel(s, y)?.ql ?? null}
                        emptyTag="default"
                        placeholder={box.type === 'sealed' && box.ql === undefined ? 'none' : undefined}
                      />
                    )}
                    <Lossless slot={s} />
                  </div>
                ))
              }
            />
            {anySealed ? (
              <Row
                label="Fill"
                hint="0 none … 1 densely filled"
                cell={(s) => sealedOnly(s, () => <Num slot={s} path={bp(s, 'fill')} label="Fill" step={0.05} min={0} max={1} />)}
              />
            ) : null}
          </Group>
        ) : null}
        {anySealed ? (
          <Group title="Closed-box result">
            <Row label="System resonance" symbol="fc" cell={(s) => sealedOnly(s, () => fig(s, (f) => f.fcHz, 'Hz'))} />
            <Row label="System Q" symbol="Qtc" cell={(s) => sealedOnly(s, () => fig(s, (f) => f.qtc))} />
          </Group>
        ) : null}
        {anyPorted ? (
          <Group title="Port">
            <Row
              label="Tuning"
              symbol="fb"
              cell={(s) =>
                ventedOnly(s, () => (
                  <Num
                    slot={s}
                    path={bp(s, 'fb_hz')}
                    label="Tuning fb"
                    unit="Hz"
                    step={0.5}
                    model={(y) => {
                      const b = boxModel(s, y);
                      return b && 'fb' in b ? b.fb : null;
                    }}
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
                    path={bp(s, 'ports.0.shape')}
                    label="Port shape"
                    value={portShape(port)}
                    options={[
                      { value: 'round', label: 'Round tube' },
                      { value: 'slot', label: 'Slot' },
                    ]}
                    onChange={(shape) => dispatch({ type: 'edit', slot: s, path: bp(s, 'ports.0'), value: portOfShape(port, shape) })}
                  />
                ))
              }
            />
            <Row
              label="Port count"
              cell={(s) =>
                ventedOnly(s, () => <Num slot={s} path={bp(s, 'ports.0.count')} label="Port count" step={1} min={1} placeholder="1" />)
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
                      path={bp(s, 'ports.0.diameter_cm')}
                      label="Port diameter"
                      unit="cm ⌀"
                      step={0.1}
                      alsoPaths={[bp(s, 'ports'), bp(s, 'ports.0')]}
                    />
                  ) : (
                    <div class="pair">
                      <Num
                        slot={s}
                        path={bp(s, 'ports.0.width_cm')}
                        label="Slot width"
                        unit="cm wide"
                        step={0.1}
                        alsoPaths={[bp(s, 'ports'), bp(s, 'ports.0')]}
                      />
                      <Num slot={s} path={bp(s, 'ports.0.height_cm')} label="Slot height" unit="cm high" step={0.1} />
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
                    path={bp(s, 'ports.0.outer_end')}
                    label="Port outer end"
                    value={port.outer_end ?? 'flanged'}
                    options={[
                      { value: 'flanged', label: 'Flush with the baffle' },
                      { value: 'free', label: 'Protruding (free end)' },
                    ]}
                    onChange={(v) => dispatch({ type: 'edit', slot: s, path: bp(s, 'ports.0.outer_end'), value: v })}
                  />
                ))
              }
            />
            <Row label="Port length" hint="physical, one port" cell={(s) => ventedOnly(s, () => fig(s, (f) => f.portLengthCm, 'cm'))} />
            <Row
              label="Port air speed"
              hint="peak, at the planned level"
              cell={(s) => ventedOnly(s, () => <PortSpeed slot={s} index={shown[s].index} />)}
            />
          </Group>
        ) : null}
        {anyRadiator ? (
          <Group title="Passive radiator">
            <Row
              label="Radiator area"
              symbol="Sp"
              cell={(s) =>
                radiatorOnly(s, () => (
                  <Num slot={s} path={bp(s, 'radiator.sd_cm2')} label="Radiator area" unit="cm²" step={1} alsoPaths={[bp(s, 'radiator')]} />
                ))
              }
            />
            <Row
              label="Moving mass"
              symbol="Mmp"
              hint="with added mass"
              cell={(s) =>
                radiatorOnly(s, () => <Num slot={s} path={bp(s, 'radiator.mmp_g')} label="Radiator moving mass" unit="g" step={1} />)
              }
            />
            <Row
              label="Compliance"
              symbol="Cmp"
              cell={(s) =>
                radiatorOnly(s, () => (
                  <Num slot={s} path={bp(s, 'radiator.cmp_mm_per_n')} label="Radiator compliance" unit="mm/N" step={0.01} />
                ))
              }
            />
            <Row
              label="Mechanical Q"
              symbol="Qmp"
              cell={(s) => radiatorOnly(s, () => <Num slot={s} path={bp(s, 'radiator.qmp')} label="Radiator mechanical Q" step={0.5} />)}
            />
            <Row
              label="Linear excursion"
              symbol="Xmax"
              cell={(s) =>
                radiatorOnly(s, () => <Num slot={s} path={bp(s, 'radiator.xmax_mm')} label="Radiator Xmax" unit="mm" step={0.1} />)
              }
            />
            <Row
              label="Radiator count"
              cell={(s) =>
                radiatorOnly(s, () => (
                  <Num slot={s} path={bp(s, 'radiator.count')} label="Radiator count" step={1} min={1} placeholder="1" />
                ))
              }
            />
            <Row label="Tuning" symbol="fb" hint="derived" cell={(s) => radiatorOnly(s, () => fig(s, (f) => f.fbHz, 'Hz'))} />
            <Row label="Free-air resonance" symbol="fp" hint="the notch" cell={(s) => radiatorOnly(s, () => fig(s, (f) => f.fpHz, 'Hz'))} />
          </Group>
        ) : null}
        {anyBox ? (
          <Group title="Result">
            <Row
              label="Low-frequency limit"
              symbol="f3"
              hint="−3 dB, this way"
              cell={(s) => boxed(s, () => fig(s, (f) => f.f3Hz, 'Hz', `f3-${s}`))}
            />
            <Row
              label="Box figures"
              hint="as the box kind gives them"
              cell={(s) => boxed(s, () => <KindFigures slot={s} index={shown[s].index} />)}
            />
          </Group>
        ) : null}
      </Sheet>
      <section class="sheet" aria-labelledby="suggest-h">
        <h2 id="suggest-h">Alignment suggestions</h2>
        <p class="sheet-intro">
          Published alignments for each design's driver, with a port sized for the air-speed limit. Apply replaces that way's enclosure;
          Undo brings it back.
        </p>
        <div class="two-col">
          {SLOTS.map((s) => (
            <div class={`col col-${s}`}>
              <h3>
                <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span> {state.designs[s].name} · {shown[s].way.name}
              </h3>
              <Suggestions slot={s} />
            </div>
          ))}
        </div>
      </section>
    </>
  );
}

function DerivedOut(p: { slot: Slot; pick: (system: SpeakerSystem) => number | null | undefined; unit?: string; digits?: number }) {
  const m = useModel(p.slot);
  return <Out value={m.system ? p.pick(m.system) : null} unit={p.unit} digits={p.digits} stale={m.stale} />;
}

/** The figures the way's box kind gives of itself (tuning, port length, pipe resonance, chambers...). */
function KindFigures(p: { slot: Slot; index: number }) {
  const { state } = useApp();
  const m = useModel(p.slot);
  const way = m.system ? systemDriverWay(m.system, state.designs[p.slot], p.index) : null;
  if (!m.system || !way) return <span class="na">—</span>;
  const figures = boxFigures(m.system, way);
  if (!figures.length) return <span class="na">none</span>;
  return (
    <ul class={`kind-figures${m.stale ? ' stale' : ''}`} data-testid={`box-figures-${p.slot}`}>
      {figures.map((f) => (
        <li>
          {f.label}: {num(f.value, 3)} {f.unit}
        </li>
      ))}
    </ul>
  );
}
