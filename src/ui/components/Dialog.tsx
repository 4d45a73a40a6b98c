// A small modal dialog: focus moves in on open and back on close; Escape closes.
import type { ComponentChildren } from 'preact';
import { useEffect, useRef } from 'preact/hooks';

export function Dialog(p: {
  title: string;
  onClose: () => void;
  children: ComponentChildren;
  actions?: ComponentChildren;
  tone?: 'error' | 'plain';
  id: string;
}) {
  const box = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const before = document.activeElement as HTMLElement | null;
    const first = box.current?.querySelector<HTMLElement>('[data-autofocus], button, input, [href], select, textarea');
    first?.focus();
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') {
        e.preventDefault();
        p.onClose();
      }
      if (e.key === 'Tab' && box.current) {
        const items = [...box.current.querySelectorAll<HTMLElement>('button, input, [href], select, textarea, summary')].filter(
          (x) => !x.hasAttribute('disabled'),
        );
        if (items.length === 0) return;
        const i = items.indexOf(document.activeElement as HTMLElement);
        if (e.shiftKey && i <= 0) {
          e.preventDefault();
          items[items.length - 1].focus();
        } else if (!e.shiftKey && i === items.length - 1) {
          e.preventDefault();
          items[0].focus();
        }
      }
    };
    document.addEventListener('keydown', onKey);
    return () => {
      document.removeEventListener('keydown', onKey);
      before?.focus?.();
    };
  }, []);
  return (
    <div class="scrim" onClick={(e) => e.target === e.currentTarget && p.onClose()}>
      <div
        class={`dialog${p.tone === 'error' ? ' dialog-error' : ''}`}
        role="dialog"
        aria-modal="true"
        aria-labelledby={`${p.id}-title`}
        ref={box}
        id={p.id}
      >
        <h2 id={`${p.id}-title`}>{p.title}</h2>
        <div class="dialog-body">{p.children}</div>
        <div class="dialog-actions">
          {p.actions ?? (
            <button type="button" onClick={p.onClose}>
              Close
            </button>
          )}
        </div>
      </div>
    </div>
  );
}
