// Reading a design file for any command: every problem listed, exit 1 on failure.
import { readFile } from 'node:fs/promises';
import { parseDesign } from '../engine/design/validate.ts';
import type { DesignDoc } from '../engine/design/document.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import type { Issue } from '../engine/issues.ts';
import { InputError } from './command.ts';

export const formatIssue = (i: Issue): string => `  ${i.severity}: ${i.path || '(design)'}: ${i.message}`;

/** Largest design file accepted; real designs are a few kB. */
export const MAX_DESIGN_BYTES = 1 << 20;

export async function loadDesignFile(path: string): Promise<{ design: DesignDoc; system: SpeakerSystem; warnings: Issue[] }> {
  let text: string;
  try {
    const buf = await readFile(path);
    if (buf.length > MAX_DESIGN_BYTES) throw new InputError(`${path}: ${buf.length} bytes is too large for a design file (at most 1 MiB)`);
    text = buf.toString('utf8');
  } catch (e) {
    if (e instanceof InputError) throw e;
    throw new InputError(`cannot read design file ${path}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
  const result = parseDesign(text);
  if (!result.ok) {
    const lines = [...result.errors, ...result.warnings].map(formatIssue);
    throw new InputError(
      `${path} is not a valid design (${result.errors.length} problem${result.errors.length === 1 ? '' : 's'}):\n${lines.join('\n')}`,
    );
  }
  return result;
}
