// Designs in and out of the page: a design file imported as a new variant (compared in A or B), a
// project file opened or saved, a share link opened or made. Everything read goes through the
// engine's parseDesign (version 1 files and links migrate; a project's every variant); nothing is
// half-loaded, and a refused file leaves the project unchanged.
import { useEffect } from 'preact/hooks';
import type { Issue } from '../../engine/issues.ts';
import { validate, type Derived } from '../engine.ts';
import { designFileName, designFileText, downloadText } from '../files.ts';
import { fileStem, plural } from '../format.ts';
import { projectFileText, projectFromPair, readProject, type Project } from '../project.ts';
import {
  decodeProjectShare,
  decodeShare,
  encodeProjectShare,
  encodeShare,
  hasShare,
  MAX_LINK_CHARS,
  shareKind,
  shareUrl,
} from '../share.ts';
import { SLOTS, SLOT_LABEL, type Slot, type Store } from '../store.ts';
import type { ProblemReport } from './dialogs.tsx';
import type { Notice } from './hooks.ts';

export const PROJECT_FILE_SUFFIX = '.preheard-project.json';

export interface TransferDeps {
  store: Store;
  derived: Record<Slot, Derived>;
  notify: (text: string, tone?: Notice['tone']) => void;
  showProblems: (report: ProblemReport) => void;
  /** Shows a shared pair as a look, saved only when the user keeps it (shared-view.ts). */
  openShared: (project: Project) => void;
  /** Asks before a destructive step; resolves true when the user goes ahead. */
  confirm: (question: { title: string; text: string; action: string }) => Promise<boolean>;
}

/** Reads a shared link in the address, if any, and shows its pair (kept only when the user says so). */
export async function openShareFromLocation(d: TransferDeps): Promise<void> {
  if (!hasShare(location.hash)) return;
  const hash = location.hash;
  history.replaceState(null, '', location.pathname + location.search);
  try {
    if (shareKind(hash) === 'project') {
      openSharedProject(d, await decodeProjectShare(hash));
      return;
    }
    const pair = await decodeShare(hash);
    const ra = validate(pair.a);
    const rb = validate(pair.b);
    if (ra.ok && rb.ok) {
      d.openShared(projectFromPair({ a: ra.design, b: rb.design }, 'Shared designs'));
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

/** A shared project: every variant checked, all or nothing, then shown as a look like a shared pair. */
function openSharedProject(d: TransferDeps, value: unknown): void {
  const r = readProject(value);
  if (r.ok && r.kind === 'project') {
    d.openShared(r.project);
    return;
  }
  d.showProblems({
    title: 'The shared link has problems',
    intro: 'Nothing was loaded; your designs are unchanged.',
    groups: [
      {
        heading: '',
        errors: r.ok ? [{ path: '', message: 'the link does not hold a project', severity: 'error' }] : r.errors,
        warnings: r.warnings,
      },
    ],
  });
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

function parsedText(text: string): { ok: true; value: unknown } | { ok: false; errors: Issue[] } {
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch (e) {
    const detail = e instanceof Error ? e.message : String(e);
    return { ok: false, errors: [{ path: '', message: `not valid JSON: ${detail}`, severity: 'error' }] };
  }
}

/**
 * A file chosen by the user: a design joins the project as a new variant compared in `slot`; a
 * project file (or an A/B pair) replaces the project once the user agrees (undo brings it back).
 */
export async function importFile(d: TransferDeps, file: File, slot: Slot): Promise<void> {
  const json = parsedText(await file.text());
  const r = json.ok ? readProject(json.value) : { ok: false as const, errors: json.errors, warnings: [] };
  if (!r.ok) {
    d.showProblems({
      title: `${file.name} was not imported`,
      intro: `The file has ${plural(r.errors.length, 'problem')}; nothing was loaded and your project is unchanged. Fix the file and import it again.`,
      groups: [{ heading: '', errors: r.errors, warnings: r.warnings }],
    });
    return;
  }
  const warned = r.warnings.length ? ` with ${plural(r.warnings.length, 'warning')}` : '';
  if (r.kind === 'design') {
    const design = r.project.variants[0].design;
    d.store.dispatch({ type: 'add-variant', design, slot, reason: `import ${file.name}` });
    d.notify(`Imported “${design.name}” from ${file.name} as a new variant, compared as ${SLOT_LABEL[slot]}${warned}.`);
    return;
  }
  const current = d.store.get().project;
  const ok = await d.confirm({
    title: 'Open this project?',
    text: `“${r.project.name}” (${plural(r.project.variants.length, 'variant')}) takes the place of “${current.name}” (${plural(current.variants.length, 'variant')}). Undo brings your project back; export it first to keep a copy.`,
    action: 'Open the project',
  });
  if (!ok) return;
  d.store.dispatch({ type: 'replace-project', project: r.project, reason: `open ${file.name}` });
  d.notify(`Opened “${r.project.name}” from ${file.name}${warned}.`);
}

/** Downloads a design as a file of the current version. */
export function exportDesign(d: TransferDeps, slot: Slot): void {
  const doc = d.store.get().designs[slot];
  downloadText(designFileText(doc), designFileName(doc, SLOT_LABEL[slot]));
  if (d.derived[slot].parse.ok === false)
    d.notify(`Design ${SLOT_LABEL[slot]} was exported with its problems; fix them before importing it elsewhere.`, 'warn');
}

/** Downloads the whole project (every variant) as one file. */
export function exportProject(d: TransferDeps): void {
  const project = d.store.get().project;
  downloadText(projectFileText(project), `${fileStem(project.name || 'project')}${PROJECT_FILE_SUFFIX}`);
  const bad = project.variants.filter((v) => !validate(v.design).ok);
  if (bad.length)
    d.notify(
      `The project was saved with problems in ${bad.map((v) => `“${v.design.name}”`).join(', ')}; fix them before opening it elsewhere.`,
      'warn',
    );
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

/**
 * The share link of the whole project, or null (with a notice) while a variant has errors or the
 * project is too large for a link (then its file is the way to share it).
 */
export async function makeProjectShareUrl(d: TransferDeps): Promise<string | null> {
  const project = d.store.get().project;
  const bad = project.variants.filter((v) => !validate(v.design).ok);
  if (bad.length) {
    d.notify(`Fix the problems in ${bad.map((v) => `“${v.design.name}”`).join(', ')} before sharing the project.`, 'warn');
    return null;
  }
  const fragment = await encodeProjectShare(project);
  if (fragment.length > MAX_LINK_CHARS) {
    d.notify(
      `The project makes a link of ${fragment.length.toLocaleString('en')} characters, longer than mail and chat programs pass on (${MAX_LINK_CHARS.toLocaleString('en')}): share the project file instead.`,
      'warn',
    );
    return null;
  }
  return shareUrl(location.href, fragment);
}
