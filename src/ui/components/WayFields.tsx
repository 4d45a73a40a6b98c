// The fields every way has: its active filter (high-pass, low-pass, gain, delay), polarity and
// acoustic offset; a driver way's count and wiring; a flat band's own level.
import { activeFilterOf, FILTER_SHAPES, type FilterDoc, type FilterShape } from '../../engine/design/document.ts';
import { useApp } from '../context.ts';
import { setAt } from '../paths.ts';
import type { Slot } from '../store.ts';
import { Choice, Group, Num, Row } from './Sheet.tsx';
import { anyShown, useShownWays } from './WayPicker.tsx';
import { FilterKindRow, isPassive, LadderGroup } from './LadderFields.tsx';

const SHAPE_LABEL: Record<FilterShape, string> = {
  lr2: 'Linkwitz-Riley, 12 dB/octave',
  lr4: 'Linkwitz-Riley, 24 dB/octave',
  lr8: 'Linkwitz-Riley, 48 dB/octave',
  bw2: 'Butterworth, 12 dB/octave',
  bw3: 'Butterworth, 18 dB/octave',
  bw4: 'Butterworth, 24 dB/octave',
};
type BandChoice = FilterShape | 'none';
const BAND_OPTIONS: { value: BandChoice; label: string }[] = [
  { value: 'none', label: 'None' },
  ...FILTER_SHAPES.map((s) => ({ value: s, label: SHAPE_LABEL[s] })),
];
/** Corner offered when a band is switched on: the other band's corner keeps the bands apart. */
const DEFAULT_CORNER = { highpass: 2200, lowpass: 2200 } as const;

type Band = 'highpass' | 'lowpass';

export function WayFieldRows() {
  const { dispatch } = useApp();
  const shown = useShownWays();
  const filterOf = (s: Slot): FilterDoc | undefined => activeFilterOf(shown[s].way);
  /** A passive way has no active filter's fields: its network is edited below. */
  const active = (s: Slot) => !isPassive(shown[s].way);
  /** Writes one filter field; a way without a filter gets one (an active filter is the only kind yet). */
  const setFilter = (s: Slot, sub: string, value: unknown) => {
    const base = filterOf(s);
    if (base) dispatch({ type: 'edit', slot: s, path: `${shown[s].path}.filter.${sub}`, value });
    else if (value !== undefined)
      dispatch({ type: 'edit', slot: s, path: `${shown[s].path}.filter`, value: setAt<FilterDoc>({ type: 'active' }, sub, value) });
  };
  const setBand = (s: Slot, band: Band, shape: BandChoice) => {
    const cur = filterOf(s)?.[band];
    if (shape === 'none') return setFilter(s, band, undefined);
    setFilter(s, band, { shape, hz: cur?.hz ?? DEFAULT_CORNER[band] });
  };
  const bandRows = (band: Band, title: string) => (
    <>
      <Row
        label={title}
        cell={(s) =>
          !active(s) ? null : (
            <Choice<BandChoice>
              slot={s}
              path={`${shown[s].path}.filter.${band}.shape`}
              label={`${title} shape`}
              value={filterOf(s)?.[band]?.shape ?? 'none'}
              options={BAND_OPTIONS}
              onChange={(v) => setBand(s, band, v)}
            />
          )
        }
      />
      <Row
        label={`${title} corner`}
        cell={(s) =>
          active(s) && filterOf(s)?.[band] ? (
            <Num slot={s} path={`${shown[s].path}.filter.${band}.hz`} label={`${title} corner`} unit="Hz" step={10} />
          ) : null
        }
      />
    </>
  );
  const anyDriver = anyShown(shown, 'driver');
  const anyFlat = anyShown(shown, 'flat');
  return (
    <>
      <Group title="Filter and level" note="an active filter ahead of this way's amplifier channel, or a passive network after it">
        <FilterKindRow />
        {bandRows('highpass', 'High-pass')}
        {bandRows('lowpass', 'Low-pass')}
        <Row
          label="Gain"
          hint="negative pads a louder way down"
          cell={(s) =>
            !active(s) ? null : (
              <Num
                slot={s}
                path={`${shown[s].path}.filter.gain_db`}
                label="Way gain"
                unit="dB"
                step={0.5}
                placeholder="0"
                commit={(v) => setFilter(s, 'gain_db', v)}
              />
            )
          }
        />
        <Row
          label="Delay"
          cell={(s) =>
            !active(s) ? null : (
              <Num
                slot={s}
                path={`${shown[s].path}.filter.delay_ms`}
                label="Way delay"
                unit="ms"
                step={0.01}
                min={0}
                placeholder="0"
                commit={(v) => setFilter(s, 'delay_ms', v)}
              />
            )
          }
        />
        <Row
          label="Polarity"
          cell={(s) => (
            <Choice<'1' | '-1'>
              slot={s}
              path={`${shown[s].path}.polarity`}
              label="Way polarity"
              value={shown[s].way.polarity === -1 ? '-1' : '1'}
              options={[
                { value: '1', label: 'Normal' },
                { value: '-1', label: 'Inverted' },
              ]}
              onChange={(v) => dispatch({ type: 'edit', slot: s, path: `${shown[s].path}.polarity`, value: Number(v) })}
            />
          )}
        />
        <Row
          label="Acoustic offset"
          hint="acoustic centre behind the baffle reference"
          cell={(s) => <Num slot={s} path={`${shown[s].path}.offset_mm`} label="Acoustic offset" unit="mm" step={1} placeholder="0" />}
        />
        {anyFlat ? (
          <Row
            label="Band level"
            hint="2.83 V at 1 m; empty: as the first driver way"
            cell={(s) =>
              shown[s].way.kind === 'flat' ? (
                <Num slot={s} path={`${shown[s].path}.sensitivity_db`} label="Flat band level" unit="dB" step={0.5} emptyTag="default" />
              ) : null
            }
          />
        ) : null}
      </Group>
      <LadderGroup />
      {anyDriver ? (
        <Group title="Drivers in this way">
          <Row
            label="Count"
            hint="identical drivers"
            cell={(s) =>
              shown[s].way.kind === 'driver' ? (
                <Num slot={s} path={`${shown[s].path}.count`} label="Driver count" step={1} min={1} placeholder="1" />
              ) : null
            }
          />
          <Row
            label="Wiring"
            cell={(s) => {
              const w = shown[s].way;
              return w.kind === 'driver' ? (
                <Choice<'parallel' | 'series'>
                  slot={s}
                  path={`${shown[s].path}.wiring`}
                  label="Driver wiring"
                  value={w.wiring ?? 'parallel'}
                  options={[
                    { value: 'parallel', label: 'Parallel' },
                    { value: 'series', label: 'Series' },
                  ]}
                  onChange={(v) => dispatch({ type: 'edit', slot: s, path: `${shown[s].path}.wiring`, value: v })}
                />
              ) : null;
            }}
          />
        </Group>
      ) : null}
    </>
  );
}
