// Designs in and out of the page: a design file imported into A or B, exported from one, a share
// link opened or made. Everything read goes through the engine's parseDesign (version 1 files and
// links migrate); nothing is half-loaded, and a refused file leaves the design unchanged.
import { useEffect } from 'preact/hooks';
import { validate, type Derived } from '../engine.ts';
import { designFileName, designFileText, downloadText, readDesignText } from '../files.ts';
import { decodeShare, encodeShare, hasShare, shareUrl } from '../share.ts';
import { SLOTS, SLOT_LABEL, type Designs, type Slot, type Store } from '../store.ts';
import type { ProblemReport } from './dialogs.tsx';
import type { Notice } from './hooks.ts';

export interface TransferDeps {
  store: Store;
  derived: Record<Slot, Derived>;
  notify: (text: string, tone?: Notice['tone']) => void;
  showProblems: (report: ProblemReport) => void;
  /** Shows a shared pair as a look, saved only when the user keeps it (shared-view.ts). */
  openShared: (designs: Designs) => void;
}

/** Reads a shared link in the address, if any, and shows its pair (kept only when the user says so). */
export async function openShareFromLocation(d: TransferDeps): Promise<void> {
  if (!hasShare(location.hash)) return;
  const hash = location.hash;
  history.replaceState(null, '', location.pathname + location.search);
  try {
    const pair = await decodeShare(hash);
    const ra = validate(pair.a);
    const rb = validate(pair.b);
    if (ra.ok && rb.ok) {
      d.openShared({ a: ra.design, b: rb.design });
    } else {
      d.showProblems({
        title: 'The shared link has problems',
        intro: 'Nothing was loaded; your designs are unchanged.',
        groups: [
          { heading: 'Design A', errors: ra.ok ? [] : ra.errors, warnings: ra.warnings },
          { heading: 'Design B', errors: rb.ok ? [] : rb.errors, warnings: rb.warnings },
        ],
      });
    }
  } catch (e) {
    d.showProblems({
      title: 'The shared link cannot be read',
      intro: 'Nothing was loaded; your designs are unchanged.',
      groups: [{ heading: '', errors: [{ path: '', message: (e as Error).message, severity: 'error' }], warnings: [] }],
    });
  }
}

/** Opens a shared link on start and whenever the address changes to one. */
export function useShareLinks(d: TransferDeps, onStart: () => void) {
  useEffect(() => {
    const open = () => void openShareFromLocation(d);
    open();
    window.addEventListener('hashchange', open);
    onStart();
    return () => window.removeEventListener('hashchange', open);
  }, []);
}

export async function importFile(d: TransferDeps, file: File, slot: Slot): Promise<void> {
  const r = readDesignText(await file.text(), file.name);
  if (r.ok) {
    d.store.dispatch({ type: 'replace', slot, design: r.design, reason: `import ${file.name} into ${SLOT_LABEL[slot]}` });
    d.notify(
      `Imported “${r.design.name}” from ${file.name} into design ${SLOT_LABEL[slot]}${r.warnings.length ? ` with ${r.warnings.length} warnings` : ''}.`,
    );
  } else {
    d.showProblems({
      title: `${file.name} was not imported`,
      intro: `The file has ${r.errors.length} ${r.errors.length === 1 ? 'problem' : 'problems'}; nothing was loaded and design ${SLOT_LABEL[slot]} is unchanged. Fix the file and import it again.`,
      groups: [{ heading: '', errors: r.errors, warnings: r.warnings }],
    });
  }
}

/** Downloads a design as a file of the current version. */
export function exportDesign(d: TransferDeps, slot: Slot): void {
  const doc = d.store.get().designs[slot];
  downloadText(designFileText(doc), designFileName(doc, SLOT_LABEL[slot]));
  if (d.derived[slot].parse.ok === false)
    d.notify(`Design ${SLOT_LABEL[slot]} was exported with its problems; fix them before importing it elsewhere.`, 'warn');
}

/** The share link of the pair, or null (with a notice) while a design has errors. */
export async function makeShareUrl(d: TransferDeps): Promise<string | null> {
  const bad = SLOTS.filter((s) => !d.derived[s].parse.ok);
  if (bad.length) {
    d.notify(`Fix the problems in design ${bad.map((s) => SLOT_LABEL[s]).join(' and ')} before sharing.`, 'warn');
    return null;
  }
  return shareUrl(location.href, await encodeShare(d.store.get().designs));
}
