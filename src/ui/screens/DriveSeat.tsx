// Drive & seat: amplifier, where the listener sits, how loud it will be played, the air. Each way's
// filters (the first version's crossover) are set with that way on the Driver sheet.
import type { ListeningDoc, PlannedLevelDoc } from '../../engine/design/document.ts';
import { useApp } from '../context.ts';
import { Choice, Group, Num, Out, Row, Sheet, useModel } from '../components/Sheet.tsx';
import type { Slot } from '../store.ts';
import { RoomPairSwitch, RoomSketch } from '../components/RoomSketch.tsx';

const SPACES: { value: ListeningDoc['space']; label: string }[] = [
  { value: 'full', label: 'Free field (full space)' },
  { value: 'half', label: 'Floor or wall (half space)' },
  { value: 'quarter', label: 'Floor and wall (quarter space)' },
  { value: 'eighth', label: 'Corner (eighth space)' },
];

type LevelMode = PlannedLevelDoc['mode'];

function Derived(p: { slot: Slot; pick: (m: ReturnType<typeof useModel>) => number | null | undefined; unit?: string; digits?: number }) {
  const m = useModel(p.slot);
  return <Out value={m.system ? p.pick(m) : null} unit={p.unit} digits={p.digits} stale={m.stale} />;
}

export function DriveSeat() {
  const { state, dispatch } = useApp();
  const level = (s: Slot): PlannedLevelDoc | undefined => state.designs[s].listening.level;
  const setMode = (s: Slot, mode: LevelMode) => {
    const current = level(s);
    if (current?.mode === mode) return;
    const next: PlannedLevelDoc = mode === 'spl' ? { mode: 'spl', spl_db: 85 } : { mode: 'volts', volts_fs: 10 };
    dispatch({ type: 'edit', slot: s, path: 'listening.level', value: next });
  };
  return (
    <Sheet
      id="drive"
      title="Drive & seat"
      intro="What drives each design and where it is heard. The planned level sets the drive used for the excursion and port-speed curves and for listening. One amplifier model drives every way, each from its own channel; each way's filters are set with that way on the Driver sheet."
    >
      <Group title="Amplifier">
        <Row
          label="Rated power"
          hint="into the rated load"
          cell={(s) => (
            <Num slot={s} path="amplifier.power_w" label="Amplifier rated power" unit="W" step={1} model={(y) => y.amplifier.power} />
          )}
        />
        <Row
          label="Rated load"
          cell={(s) => (
            <Num slot={s} path="amplifier.load_ohm" label="Amplifier rated load" unit="Ω" step={1} model={(y) => y.amplifier.load} />
          )}
        />
        <Row
          label="Series resistance"
          hint="output plus cable"
          cell={(s) => (
            <Num
              slot={s}
              path="amplifier.rs_ohm"
              label="Series resistance"
              unit="Ω"
              step={0.01}
              model={(y) => y.amplifier.rs}
              emptyTag="default"
            />
          )}
        />
        <Row label="Peak output" hint="rail, derived" cell={(s) => <Derived slot={s} pick={(m) => m.system!.amplifier.vPeak} unit="V" />} />
        <Row
          label="Clipping"
          cell={(s) => (
            <Choice<'hard' | 'soft'>
              slot={s}
              path="amplifier.clip"
              label="Amplifier clipping"
              value={state.designs[s].amplifier.clip ?? 'hard'}
              options={[
                { value: 'hard', label: 'Hard' },
                { value: 'soft', label: 'Soft' },
              ]}
              onChange={(v) => dispatch({ type: 'edit', slot: s, path: 'amplifier.clip', value: v })}
            />
          )}
        />
      </Group>
      <Group title="Listening seat">
        <Row
          label="Distance"
          hint="speaker to seat"
          cell={(s) => (
            <Num
              slot={s}
              path="listening.distance_m"
              label="Listening distance"
              unit="m"
              step={0.1}
              model={(y) => y.listening.distance}
              slider={{ min: 0.5, max: 20, log: true }}
            />
          )}
        />
        <Row
          label="Placement"
          cell={(s) => (
            <Choice<ListeningDoc['space']>
              slot={s}
              path="listening.space"
              label="Placement"
              value={state.designs[s].listening.space}
              options={SPACES}
              onChange={(v) => dispatch({ type: 'edit', slot: s, path: 'listening.space', value: v })}
            />
          )}
        />
        <Row
          label="Speakers"
          cell={(s) => (
            <Choice<NonNullable<ListeningDoc['channels']>>
              slot={s}
              path="listening.channels"
              label="Speakers"
              value={state.designs[s].listening.channels ?? 'pair'}
              options={[
                { value: 'pair', label: 'A stereo pair' },
                { value: 'mono-sum', label: 'One speaker, mono sum' },
              ]}
              onChange={(v) => dispatch({ type: 'edit', slot: s, path: 'listening.channels', value: v })}
            />
          )}
        />
        <Row
          label="Room gain corner"
          hint="0 = none; small rooms, cars"
          cell={(s) => (
            <Num
              slot={s}
              path="listening.room_gain_hz"
              label="Room gain corner"
              unit="Hz"
              step={1}
              min={0}
              model={(y) => y.listening.roomGainHz}
              emptyTag="default"
            />
          )}
        />
        <Row
          label="Baffle width"
          hint="free-standing cabinet: 6 dB step near 115/width; 0 = none"
          cell={(s) => (
            <Num
              slot={s}
              path="listening.baffle_width_cm"
              label="Baffle width"
              unit="cm"
              step={1}
              min={0}
              model={(y) => (y.listening.baffleWidth ?? 0) * 100}
              emptyTag="default"
            />
          )}
        />
      </Group>
      <Group title="Room" note="a rectangular room's modes at the seat; drag the speakers and the seat">
        <Row label="Both designs" cell={(s) => (s === 'a' ? <RoomPairSwitch /> : null)} />
        <Row label="Seen from above" hint="front wall at the top" cell={(s) => <RoomSketch slot={s} />} />
      </Group>
      <Group
        title="Planned level"
        note={
          state.project.sharedLevel
            ? `Shared by all ${state.project.variants.length} variants of the project: a change here reaches every one (Project… to plan them apart).`
            : undefined
        }
      >
        <Row
          label="Stated as"
          cell={(s) => (
            <Choice<LevelMode>
              slot={s}
              path="listening.level.mode"
              label="Planned level stated as"
              value={level(s)?.mode ?? 'spl'}
              options={[
                { value: 'spl', label: 'SPL at the seat, Leq dB(C)' },
                { value: 'volts', label: 'Volts at digital full scale' },
              ]}
              onChange={(v) => setMode(s, v)}
            />
          )}
        />
        <Row
          label="Level"
          cell={(s) =>
            (level(s)?.mode ?? 'spl') === 'spl' ? (
              <Num
                slot={s}
                path="listening.level.spl_db"
                label="Planned SPL at the seat"
                unit="dB(C)"
                step={1}
                model={(_y, a) => a?.figures.plannedSplDb ?? null}
                slider={{ min: 60, max: 120 }}
              />
            ) : (
              <Num slot={s} path="listening.level.volts_fs" label="Amplifier peak volts at full scale" unit="V peak" step={0.5} />
            )
          }
        />
        <Row
          label="Drive for that level"
          hint="amplifier, rms, derived"
          cell={(s) => <Derived slot={s} pick={(m) => m.analysis?.figures.plannedVoltsRms} unit="V rms" />}
        />
      </Group>
      <Group title="Air">
        <Row
          label="Temperature"
          cell={(s) => (
            <Num
              slot={s}
              path="air.temperature_c"
              label="Air temperature"
              unit="°C"
              step={1}
              model={(y) => y.air.temperatureC}
              emptyTag="default"
            />
          )}
        />
        <Row
          label="Pressure"
          cell={(s) => (
            <Num
              slot={s}
              path="air.pressure_kpa"
              label="Air pressure"
              unit="kPa"
              step={0.1}
              model={(y) => y.air.pressurePa / 1000}
              modelDigits={4}
              emptyTag="default"
            />
          )}
        />
        <Row label="Speed of sound" hint="derived" cell={(s) => <Derived slot={s} pick={(m) => m.system!.air.c} unit="m/s" digits={4} />} />
        <Row
          label="Air density"
          hint="derived"
          cell={(s) => <Derived slot={s} pick={(m) => m.system!.air.rho} unit="kg/m³" digits={4} />}
        />
      </Group>
    </Sheet>
  );
}
