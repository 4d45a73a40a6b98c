// A driver way's filter kind (active or a passive network) and the passive network's parts, from
// the amplifier to the drivers: each part in the line or across it, its values, and buttons to add,
// remove and move parts. Edits go through the store as whole ladders (one undo step each).
import type { DriverWayDoc, LadderPartDoc, WayDoc } from '../../engine/design/document.ts';
import { LADDER_PARTS, MAX_LADDER_PARTS } from '../../engine/design/schema.ts';
import { useApp } from '../context.ts';
import type { Slot } from '../store.ts';
import { starterLadder } from '../ways.ts';
import { Choice, Group, Num, Row } from './Sheet.tsx';
import { anyShown, useShownWays } from './WayPicker.tsx';

type Part = LadderPartDoc['part'];
const PART_LABEL: Record<Part, string> = {
  l: 'Inductor',
  c: 'Capacitor',
  r: 'Resistor',
  rc: 'R + C in series',
  rlc: 'R + L + C in series',
  'lc-parallel': 'L parallel C (trap)',
};
/** The values a part of each kind starts with (a typical small part; the user sets the real one). */
const STARTER: Record<Part, { part: Part } & Record<string, number | string>> = {
  l: { part: 'l', mh: 0.5, dcr_ohm: 0.2 },
  c: { part: 'c', uf: 10 },
  r: { part: 'r', ohm: 2 },
  rc: { part: 'rc', ohm: 6.8, uf: 10 },
  rlc: { part: 'rlc', ohm: 4, mh: 1, uf: 20 },
  'lc-parallel': { part: 'lc-parallel', mh: 0.2, uf: 20, ohm: 4 },
};
/** The value fields of each kind, in the order shown. */
const FIELDS: Record<Part, { key: string; label: string; unit: string; step: number; optional?: boolean }[]> = {
  l: [
    { key: 'mh', label: 'L', unit: 'mH', step: 0.01 },
    { key: 'dcr_ohm', label: 'DCR', unit: 'ohm', step: 0.01, optional: true },
  ],
  c: [{ key: 'uf', label: 'C', unit: 'µF', step: 0.1 }],
  r: [
    { key: 'ohm', label: 'R', unit: 'ohm', step: 0.1 },
    { key: 'w', label: 'rating', unit: 'W', step: 1, optional: true },
  ],
  rc: [
    { key: 'ohm', label: 'R', unit: 'ohm', step: 0.1 },
    { key: 'uf', label: 'C', unit: 'µF', step: 0.1 },
  ],
  rlc: [
    { key: 'ohm', label: 'R', unit: 'ohm', step: 0.1 },
    { key: 'mh', label: 'L', unit: 'mH', step: 0.01 },
    { key: 'uf', label: 'C', unit: 'µF', step: 0.1 },
  ],
  'lc-parallel': [
    { key: 'mh', label: 'L', unit: 'mH', step: 0.01 },
    { key: 'uf', label: 'C', unit: 'µF', step: 0.1 },
    { key: 'ohm', label: 'R across', unit: 'ohm', step: 0.1, optional: true },
  ],
};

export const isPassive = (way: WayDoc): boolean => way.kind === 'driver' && way.filter?.type === 'passive';
const ladderOf = (way: WayDoc): LadderPartDoc[] => (way.kind === 'driver' && way.filter?.type === 'passive' ? way.filter.ladder : []);

/** The filter-kind row: an active filter ahead of the amplifier or a passive network after it. */
export function FilterKindRow() {
  const { dispatch } = useApp();
  const shown = useShownWays();
  if (!anyShown(shown, 'driver')) return null;
  return (
    <Row
      label="Filter kind"
      hint="active: ahead of the amplifier; passive: parts between amplifier and drivers"
      cell={(s) => {
        const { way, path } = shown[s];
        if (way.kind !== 'driver') return null;
        return (
          <Choice<'active' | 'passive'>
            slot={s}
            path={`${path}.filter.type`}
            label="Filter kind"
            value={isPassive(way) ? 'passive' : 'active'}
            options={[
              { value: 'active', label: 'Active filter' },
              { value: 'passive', label: 'Passive network' },
            ]}
            onChange={(v) =>
              dispatch({
                type: 'edit',
                slot: s,
                path: `${path}.filter`,
                value: v === 'passive' ? { type: 'passive', ladder: starterLadder(way as DriverWayDoc) } : { type: 'active' },
              })
            }
          />
        );
      }}
    />
  );
}

function LadderEditor({ slot, way, path }: { slot: Slot; way: WayDoc; path: string }) {
  const { dispatch } = useApp();
  const ladder = ladderOf(way);
  const put = (next: LadderPartDoc[]) => dispatch({ type: 'edit', slot, path: `${path}.filter.ladder`, value: next });
  const move = (k: number, by: number) => {
    const next = ladder.slice();
    [next[k], next[k + by]] = [next[k + by], next[k]];
    put(next);
  };
  return (
    <div class="ladder">
      <ol class="ladder-parts">
        {ladder.map((p, k) => {
          const at = `${path}.filter.ladder.${k}`;
          return (
            <li class="ladder-part">
              <Choice<'series' | 'shunt'>
                slot={slot}
                path={`${at}.at`}
                label={`Part ${k + 1} place`}
                value={p.at}
                options={[
                  { value: 'series', label: 'In series' },
                  { value: 'shunt', label: 'Across (shunt)' },
                ]}
                onChange={(v) => dispatch({ type: 'edit', slot, path: `${at}.at`, value: v })}
              />
              <Choice<Part>
                slot={slot}
                path={`${at}.part`}
                label={`Part ${k + 1} kind`}
                value={p.part}
                options={LADDER_PARTS.map((x) => ({ value: x, label: PART_LABEL[x] }))}
                onChange={(v) => put(ladder.map((q, j) => (j === k ? ({ at: q.at, ...STARTER[v] } as LadderPartDoc) : q)))}
              />
              {FIELDS[p.part].map((f) => (
                <Num
                  slot={slot}
                  path={`${at}.${f.key}`}
                  label={`Part ${k + 1} ${f.label}`}
                  unit={f.unit}
                  step={f.step}
                  min={0}
                  placeholder={f.optional ? 'none' : undefined}
                />
              ))}
              <span class="ladder-buttons">
                <button
                  type="button"
                  aria-label={`Move part ${k + 1} up, design ${slot.toUpperCase()}`}
                  disabled={k === 0}
                  onClick={() => move(k, -1)}
                >
                  ↑
                </button>
                <button
                  type="button"
                  aria-label={`Move part ${k + 1} down, design ${slot.toUpperCase()}`}
                  disabled={k === ladder.length - 1}
                  onClick={() => move(k, 1)}
                >
                  ↓
                </button>
                <button
                  type="button"
                  aria-label={`Remove part ${k + 1}, design ${slot.toUpperCase()}`}
                  onClick={() => put(ladder.filter((_, j) => j !== k))}
                >
                  ✕
                </button>
              </span>
            </li>
          );
        })}
      </ol>
      <button
        type="button"
        disabled={ladder.length >= MAX_LADDER_PARTS}
        aria-label={`Add a part, design ${slot.toUpperCase()}`}
        onClick={() => put([...ladder, { at: 'series', ...STARTER.l } as LadderPartDoc])}
      >
        Add a part
      </button>
    </div>
  );
}

/** The passive network's parts, amplifier end first, for the ways shown that have one. */
export function LadderGroup() {
  const shown = useShownWays();
  if (!isPassive(shown.a.way) && !isPassive(shown.b.way)) return null;
  return (
    <Group title="Passive network" note="from the amplifier (top) to the drivers (bottom); parts must be rated for the power">
      <Row
        label="Parts"
        cell={(s) => (isPassive(shown[s].way) ? <LadderEditor slot={s} way={shown[s].way} path={shown[s].path} /> : null)}
      />
    </Group>
  );
}
