// The page's own dialogs: a list of problems (an import or a shared link refused) and the share link.
import { useRef, useState } from 'preact/hooks';
import type { Issue } from '../../engine/issues.ts';
import { Dialog } from '../components/Dialog.tsx';

export interface ProblemReport {
  title: string;
  intro: string;
  groups: { heading: string; errors: Issue[]; warnings: Issue[] }[];
}

export function ProblemsDialog(p: { report: ProblemReport; onClose: () => void }) {
  return (
    <Dialog id="problems" title={p.report.title} tone="error" onClose={p.onClose}>
      <p>{p.report.intro}</p>
      {p.report.groups.map((g) => (
        <div class="problem-group">
          {g.heading ? <h3>{g.heading}</h3> : null}
          <ul class="problems" data-testid="problem-list">
            {g.errors.map((e) => (
              <li class="error">
                <code>{e.path || '(whole file)'}</code> {e.message}
              </li>
            ))}
            {g.warnings.map((e) => (
              <li class="warning">
                <code>{e.path || '(whole file)'}</code> {e.message} <span class="tag">warning</span>
              </li>
            ))}
          </ul>
        </div>
      ))}
    </Dialog>
  );
}

export function ShareDialog(p: { url: string; what?: 'pair' | 'project'; onClose: () => void }) {
  const [copied, setCopied] = useState<string | null>(null);
  const input = useRef<HTMLInputElement>(null);
  return (
    <Dialog
      id="share"
      title="Share link"
      onClose={p.onClose}
      actions={
        <>
          <button
            type="button"
            class="primary"
            onClick={async () => {
              try {
                await navigator.clipboard.writeText(p.url);
                setCopied('Copied to the clipboard.');
              } catch {
                input.current?.select();
                setCopied('Select the link and copy it (the clipboard is not available here).');
              }
            }}
          >
            Copy link
          </button>
          <button type="button" onClick={p.onClose}>
            Close
          </button>
        </>
      }
    >
      <p>
        {p.what === 'project' ? 'This link holds the whole project, every variant. ' : 'This link holds both designs, A and B. '}
        They travel in the part after “#”, which browsers never send to any server; whoever opens it sees them in a tab of their own and
        keeps them only if they choose to, next to their own work.
      </p>
      <label class="stack">
        <span>Link</span>
        <input
          ref={input}
          type="text"
          readOnly
          value={p.url}
          data-testid="share-url"
          onFocus={(e) => (e.currentTarget as HTMLInputElement).select()}
        />
      </label>
      <p class="fine" aria-live="polite">
        {copied ?? `${p.url.length} characters.`}
      </p>
    </Dialog>
  );
}

export interface ConfirmQuestion {
  title: string;
  text: string;
  /** The button that goes ahead, named for what it does. */
  action: string;
}

/** Asks before a destructive step; Escape, the backdrop and Cancel all keep things as they are. */
export function ConfirmDialog(p: { question: ConfirmQuestion; onAnswer: (yes: boolean) => void }) {
  return (
    <Dialog
      id="confirm"
      title={p.question.title}
      onClose={() => p.onAnswer(false)}
      actions={
        <>
          <button type="button" data-autofocus onClick={() => p.onAnswer(false)}>
            Cancel
          </button>
          <button type="button" class="danger" data-testid="confirm-yes" onClick={() => p.onAnswer(true)}>
            {p.question.action}
          </button>
        </>
      }
    >
      <p>{p.question.text}</p>
    </Dialog>
  );
}
