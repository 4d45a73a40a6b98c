// A typed number with its unit. The text typed stays on screen exactly as typed; the design gets the
// number (or loses an optional key when emptied); what the engine says about it is shown beside it.
import { useLayoutEffect, useRef, useState } from 'preact/hooks';
import type { Issue } from '../../engine/issues.ts';

export interface NumberFieldProps {
  id: string;
  label: string;
  value: unknown;
  unit?: string;
  step?: number;
  min?: number;
  max?: number;
  issues: Issue[];
  onCommit: (value: number | undefined) => void;
  placeholder?: string;
}

const asText = (v: unknown) => (typeof v === 'number' && Number.isFinite(v) ? String(v) : v === undefined || v === null ? '' : String(v));

export function NumberField(p: NumberFieldProps) {
  const [text, setText] = useState(asText(p.value));
  const [local, setLocal] = useState<string | null>(null);
  const ref = useRef<HTMLInputElement>(null);

  // The design changed from elsewhere (undo, swap, import): show its value unless it is what we typed.
  // A layout effect, so the field never shows the old text for a frame.
  useLayoutEffect(() => {
    const typed = text.trim() === '' ? undefined : Number(text);
    if (!(typed === p.value || (typed === undefined && (p.value === undefined || p.value === null)))) {
      setText(asText(p.value));
      setLocal(null);
    }
  }, [p.value]);

  const onInput = (e: Event) => {
    const el = e.currentTarget as HTMLInputElement;
    const raw = el.value;
    setText(raw);
    if (el.validity?.badInput) {
      setLocal(`Not a number. The design keeps ${asText(p.value) || 'no value'}.`);
      return;
    }
    const trimmed = raw.trim();
    if (trimmed === '') {
      setLocal(null);
      p.onCommit(undefined);
      return;
    }
    const n = Number(trimmed);
    if (!Number.isFinite(n)) {
      setLocal(`“${trimmed}” is not a number. The design keeps ${asText(p.value) || 'no value'}.`);
      return;
    }
    setLocal(null);
    p.onCommit(n);
  };

  const errs = p.issues.filter((i) => i.severity === 'error');
  const warns = p.issues.filter((i) => i.severity === 'warning');
  const msgId = `${p.id}-msg`;
  const hasMsg = local !== null || p.issues.length > 0;
  return (
    <div class={`numfield${errs.length || local ? ' has-error' : warns.length ? ' has-warning' : ''}`}>
      <div class="numfield-input">
        <input
          ref={ref}
          id={p.id}
          type="number"
          inputMode="decimal"
          value={text}
          step={p.step ?? 'any'}
          min={p.min}
          max={p.max}
          placeholder={p.placeholder}
          aria-label={p.label}
          aria-invalid={errs.length > 0 || local !== null ? 'true' : undefined}
          aria-describedby={hasMsg ? msgId : undefined}
          onInput={onInput}
        />
        {p.unit ? <span class="unit">{p.unit}</span> : null}
      </div>
      {hasMsg ? (
        <div class="msgs" id={msgId} role={errs.length || local ? 'alert' : undefined}>
          {local ? <p class="msg error">{local}</p> : null}
          {errs.map((i) => (
            <p class="msg error">{i.message}</p>
          ))}
          {warns.map((i) => (
            <p class="msg warning">{i.message}</p>
          ))}
        </div>
      ) : null}
    </div>
  );
}
