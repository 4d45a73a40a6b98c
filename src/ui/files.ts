// Design files: export as JSON, import through the engine's validation (all or nothing).
import type { DesignDoc } from '../engine/design/document.ts';
import type { Issue } from '../engine/issues.ts';
import { validate } from './engine.ts';
import { fileStem } from './format.ts';

export const DESIGN_FILE_SUFFIX = '.preheard.json';

export function designFileText(doc: DesignDoc): string {
  return JSON.stringify(doc, null, 2) + '\n';
}

export function designFileName(doc: DesignDoc, slotLabel: string): string {
  return `${fileStem(doc.name || 'design-' + slotLabel)}${DESIGN_FILE_SUFFIX}`;
}

export type ImportResult =
  | { ok: true; design: DesignDoc; warnings: Issue[] }
  | { ok: false; fileName: string; errors: Issue[]; warnings: Issue[] };

/** Validates a design file's text: every problem listed, nothing half-loaded. */
export function readDesignText(text: string, fileName: string): ImportResult {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    const detail = e instanceof Error ? e.message : String(e);
    return { ok: false, fileName, errors: [{ path: '', message: `not valid JSON: ${detail}`, severity: 'error' }], warnings: [] };
  }
  const r = validate(json);
  if (!r.ok) return { ok: false, fileName, errors: r.errors, warnings: r.warnings };
  return { ok: true, design: r.design, warnings: r.warnings };
}

/** Offers a text file for download; works without any storage or network. */
export function downloadText(text: string, fileName: string, type = 'application/json') {
  downloadBlob(new Blob([text], { type }), fileName);
}

export function downloadBlob(blob: Blob, fileName: string) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.rel = 'noopener';
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
