// The side-by-side sheet: one row per quantity, one column per design (A, B).
import type { ComponentChildren, VNode } from 'preact';
import type { Analysis } from '../../engine/response/types.ts';
import type { SpeakerSystem } from '../../engine/system.ts';
import { useApp } from '../context.ts';
import { getAt, normalizePath, pathMatches } from '../paths.ts';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';
import { num, withUnit } from '../format.ts';
import { distinctNames } from '../pair-names.ts';
import { displayUnit, fieldValue, unitSystemOf } from '../units.ts';
import { NumberField } from './NumberField.tsx';

export function Sheet(p: { title: string; id: string; children: ComponentChildren; intro?: ComponentChildren }) {
  const { state } = useApp();
  const short = distinctNames(SLOTS.map((s) => state.designs[s].name));
  return (
    <section class="sheet" aria-labelledby={`${p.id}-h`}>
      <h2 id={`${p.id}-h`}>{p.title}</h2>
      {p.intro ? <p class="sheet-intro">{p.intro}</p> : null}
      <div class="sheet-grid" role="table" aria-label={p.title}>
        <div class="sheet-head" role="row">
          <span role="columnheader" class="qty">
            Quantity
          </span>
          {SLOTS.map((s, i) => (
            <span role="columnheader" class={`slot-head slot-${s}`} title={state.designs[s].name}>
              <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span> {short[i]}
            </span>
          ))}
        </div>
        {p.children}
      </div>
    </section>
  );
}

export function Group(p: { title: string; children: ComponentChildren; note?: string }) {
  return (
    <>
      <div class="sheet-group" role="row">
        <span role="cell">{p.title}</span>
        {p.note ? (
          <span role="cell" class="group-note">
            {p.note}
          </span>
        ) : null}
      </div>
      {p.children}
    </>
  );
}

export function Row(p: { label: string; symbol?: string; hint?: string; cell: (slot: Slot) => VNode | string | null }) {
  return (
    <div class="sheet-row" role="row">
      <span class="qty" role="rowheader">
        <span class="qty-label">{p.label}</span>
        {p.symbol ? <span class="qty-sym">{p.symbol}</span> : null}
        {p.hint ? <span class="qty-hint">{p.hint}</span> : null}
      </span>
      {SLOTS.map((s) => (
        <div role="cell" class={`cell cell-${s}`}>
          {p.cell(s) ?? (
            <span class="na" title="not used by this design">
              —
            </span>
          )}
        </div>
      ))}
    </div>
  );
}

/** System and analysis behind a slot: the current one, or the last valid one while the edit is rejected. */
export function useModel(slot: Slot): { system: SpeakerSystem | null; analysis: Analysis | null; stale: boolean } {
  const { derived } = useApp();
  const d = derived[slot];
  return { system: d.system, analysis: d.analysis, stale: d.stale };
}

export function fieldId(slot: Slot, path: string) {
  return `f-${slot}-${path.replace(/[^a-z0-9]+/gi, '-')}`;
}

export interface NumProps {
  slot: Slot;
  path: string;
  label: string;
  unit?: string;
  step?: number;
  min?: number;
  max?: number;
  /** The value the model uses, in the display unit (from the engine's SI system). */
  model?: (system: SpeakerSystem, analysis: Analysis | null) => number | null;
  modelDigits?: number;
  placeholder?: string;
  /** What an empty field means: the engine derives it (default), applies a default or estimates it. */
  emptyTag?: 'derived' | 'default' | 'estimated';
  /** Group paths whose messages belong beside this field too (e.g. "box.ports" beside the port size). */
  alsoPaths?: string[];
  /** A slider beside the field, over [min, max]; log spacing for quantities judged in ratios. */
  slider?: { min: number; max: number; log?: boolean };
  /** Writes the value some other way than an edit at `path` (e.g. creating its parent object too). */
  commit?: (value: number | undefined) => void;
}

const SLIDER_STEPS = 1000;

function toSlider(v: number, s: NonNullable<NumProps['slider']>): number {
  const t = s.log ? Math.log(v / s.min) / Math.log(s.max / s.min) : (v - s.min) / (s.max - s.min);
  return Math.round(Math.min(1, Math.max(0, t)) * SLIDER_STEPS);
}

function fromSlider(pos: number, s: NonNullable<NumProps['slider']>): number {
  const t = pos / SLIDER_STEPS;
  const v = s.log ? s.min * (s.max / s.min) ** t : s.min + t * (s.max - s.min);
  return Number(v.toPrecision(3));
}

/** A numeric design field bound to the store, with the engine's messages and the model's value. */
export function Num(p: NumProps) {
  const { state, derived, dispatch } = useApp();
  // The field shows and takes the user's display unit; the design keeps its file unit.
  const unit = displayUnit(p.unit, unitSystemOf(state.settings));
  const value = getAt(state.designs[p.slot], p.path);
  const shownValue = fieldValue(value, unit);
  const also = (p.alsoPaths ?? []).map(normalizePath);
  const issues = derived[p.slot].issues.filter((i) => pathMatches(i.path, p.path) || also.includes(normalizePath(i.path)));
  const m = useModel(p.slot);
  const modelFile = p.model && m.system ? p.model(m.system, m.analysis) : null;
  const modelValue = modelFile === null ? null : unit.fromFile(modelFile);
  const typed = typeof value === 'number';
  // Beside a typed value the model's own value appears only when it differs: that is the news.
  const differs = modelFile !== null && typed && Math.abs(modelFile - (value as number)) > 5e-4 * Math.max(Math.abs(modelFile), 1e-9);
  const showModel = modelValue !== null && (!typed || differs);
  return (
    <div class="num">
      <NumberField
        id={fieldId(p.slot, p.path)}
        label={`${p.label}, design ${SLOT_LABEL[p.slot]}`}
        value={shownValue}
        unit={unit.label}
        step={p.step}
        min={p.min}
        max={p.max}
        issues={issues}
        placeholder={p.placeholder ?? (modelValue !== null && !typed ? num(modelValue, p.modelDigits ?? 3) : undefined)}
        onCommit={(typedValue) => {
          const v = typedValue === undefined ? undefined : unit.toFile(typedValue);
          return p.commit ? p.commit(v) : dispatch({ type: 'edit', slot: p.slot, path: p.path, value: v });
        }}
      />
      {p.slider ? (
        <input
          type="range"
          class="slider"
          min={0}
          max={SLIDER_STEPS}
          step={1}
          value={typeof value === 'number' ? toSlider(value, p.slider) : 0}
          aria-label={`${p.label}, design ${SLOT_LABEL[p.slot]}, slider`}
          aria-valuetext={typeof shownValue === 'number' ? withUnit(num(shownValue, 3), unit.label) : undefined}
          onInput={(e) =>
            dispatch({
              type: 'edit',
              slot: p.slot,
              path: p.path,
              value: fromSlider(Number((e.currentTarget as HTMLInputElement).value), p.slider!),
            })
          }
        />
      ) : null}
      {showModel ? (
        <span
          class={`model${m.stale ? ' stale' : ''}${differs ? ' differs' : ''}`}
          title={m.stale ? 'from the last valid version of this design' : 'value the model uses'}
        >
          {typed ? (
            <>
              <span class="model-tag">model</span> {withUnit(num(modelValue, p.modelDigits ?? 3), unit.label)}
            </>
          ) : (
            <span class="model-tag">{p.emptyTag ?? 'derived'}</span>
          )}
        </span>
      ) : null}
    </div>
  );
}

/** A derived quantity: engine output only. */
export function Out(p: { value: number | null | undefined; unit?: string; digits?: number; stale?: boolean; note?: string }) {
  const { state } = useApp();
  const unit = displayUnit(p.unit, unitSystemOf(state.settings));
  const shown = p.value === null || p.value === undefined ? p.value : unit.fromFile(p.value);
  return (
    <output class={`out${p.stale ? ' stale' : ''}`}>
      {withUnit(num(shown, p.digits ?? 3), unit.label)}
      {p.note ? <span class="out-note"> {p.note}</span> : null}
    </output>
  );
}

export interface ChoiceProps<T extends string> {
  slot: Slot;
  label: string;
  value: T | undefined;
  options: { value: T; label: string }[];
  onChange: (v: T) => void;
  path: string;
}

export function Choice<T extends string>(p: ChoiceProps<T>) {
  const { derived } = useApp();
  const issues = derived[p.slot].issues.filter((i) => pathMatches(i.path, p.path));
  return (
    <div class="choice">
      <select
        id={fieldId(p.slot, p.path)}
        aria-label={`${p.label}, design ${SLOT_LABEL[p.slot]}`}
        value={p.value ?? ''}
        onChange={(e) => p.onChange((e.currentTarget as HTMLSelectElement).value as T)}
      >
        {p.value === undefined ? <option value="">—</option> : null}
        {p.options.map((o) => (
          <option value={o.value}>{o.label}</option>
        ))}
      </select>
      {issues.map((i) => (
        <p class={`msg ${i.severity}`}>{i.message}</p>
      ))}
    </div>
  );
}

export function TextField(p: { slot: Slot; path: string; label: string }) {
  const { state, dispatch, derived } = useApp();
  const value = getAt(state.designs[p.slot], p.path);
  const issues = derived[p.slot].issues.filter((i) => pathMatches(i.path, p.path));
  return (
    <div class="textfield">
      <input
        id={fieldId(p.slot, p.path)}
        type="text"
        aria-label={`${p.label}, design ${SLOT_LABEL[p.slot]}`}
        value={typeof value === 'string' ? value : ''}
        onInput={(e) => dispatch({ type: 'edit', slot: p.slot, path: p.path, value: (e.currentTarget as HTMLInputElement).value })}
      />
      {issues.map((i) => (
        <p class={`msg ${i.severity}`}>{i.message}</p>
      ))}
    </div>
  );
}

/** Comma-separated polynomial coefficients (large-signal fields). */
export function Coefficients(p: { slot: Slot; path: string; label: string; unitHint: string }) {
  const { state, dispatch, derived } = useApp();
  const value = getAt(state.designs[p.slot], p.path);
  const issues = derived[p.slot].issues.filter((i) => pathMatches(i.path, p.path));
  const text = Array.isArray(value) ? value.join(', ') : '';
  let localError: string | null = null;
  return (
    <div class="textfield">
      <input
        id={fieldId(p.slot, p.path)}
        type="text"
        inputMode="decimal"
        placeholder="fitted from Xmax and Xlim"
        aria-label={`${p.label}, design ${SLOT_LABEL[p.slot]}`}
        defaultValue={text}
        key={text}
        onChange={(e) => {
          const raw = (e.currentTarget as HTMLInputElement).value.trim();
          if (raw === '') return dispatch({ type: 'edit', slot: p.slot, path: p.path, value: undefined });
          const parts = raw
            .split(/[,;\s]+/)
            .filter(Boolean)
            .map(Number);
          if (parts.some((x) => !Number.isFinite(x))) {
            localError = 'Enter numbers separated by commas.';
            (e.currentTarget as HTMLInputElement).setCustomValidity(localError);
            (e.currentTarget as HTMLInputElement).reportValidity();
            return;
          }
          (e.currentTarget as HTMLInputElement).setCustomValidity('');
          dispatch({ type: 'edit', slot: p.slot, path: p.path, value: parts });
        }}
      />
      <span class="qty-hint">{p.unitHint}</span>
      {issues.map((i) => (
        <p class={`msg ${i.severity}`}>{i.message}</p>
      ))}
    </div>
  );
}
