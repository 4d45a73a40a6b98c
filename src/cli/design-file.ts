// Reading a design file for any command: every problem listed, exit 1 on failure.
// The file is read in chunks and reading stops at the size limit, so an endless source
// (/dev/zero, a FIFO, a device) can neither hang the command nor fill the memory.
import { constants } from 'node:fs';
import { open, type FileHandle } from 'node:fs/promises';
import { parseDesign } from '../engine/design/validate.ts';
import type { DesignDoc } from '../engine/design/document.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import type { Issue } from '../engine/issues.ts';
import { InputError } from './command.ts';
import { capLines, count, printable, systemErrorWords } from './user-text.ts';

export const formatIssue = (i: Issue): string => printable(`  ${i.severity}: ${i.path || '(design)'}: ${i.message}`);

/** Largest design file accepted; real designs are a few kB. */
export const MAX_DESIGN_BYTES = 1 << 20;

/**
 * The text of a design file: regular files only, at most MAX_DESIGN_BYTES read, UTF-8 (a leading
 * byte-order mark is dropped, as the app does).
 */
export const readDesignText = (path: string): Promise<string> =>
  readSmallText(path, { noun: 'design file', maxBytes: MAX_DESIGN_BYTES, sizeWords: '1 MiB', typical: 'real ones are a few kB' });

/** A small text input of any kind (a design, a measured table): what it is called and how large it may be. */
export interface SmallTextKind {
  noun: string;
  maxBytes: number;
  sizeWords: string;
  typical: string;
}

/** The text of a small input file: regular files only, at most `maxBytes` read, UTF-8. */
export async function readSmallText(path: string, kind: SmallTextKind): Promise<string> {
  const shown = printable(path);
  let file: FileHandle;
  try {
    // O_NONBLOCK: opening a FIFO with no writer returns at once instead of waiting for one.
    file = await open(path, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (e) {
    throw new InputError(`cannot read the ${kind.noun} ${shown}: ${systemErrorWords(e)}`);
  }
  try {
    const info = await file.stat();
    if (info.isDirectory()) throw new InputError(`${shown} is a folder, not a ${kind.noun}`);
    if (!info.isFile()) throw new InputError(`${shown} is not a regular file (a device, pipe or socket): give a ${kind.noun}`);
    const buf = Buffer.alloc(kind.maxBytes + 1);
    let length = 0;
    while (length < buf.length) {
      const { bytesRead } = await file.read(buf, length, buf.length - length, null);
      if (bytesRead === 0) break;
      length += bytesRead;
    }
    if (length > kind.maxBytes)
      throw new InputError(`${shown} is larger than ${kind.sizeWords}, too large for a ${kind.noun} (${kind.typical})`);
    try {
      return new TextDecoder('utf-8', { fatal: true }).decode(buf.subarray(0, length));
    } catch {
      throw new InputError(`${shown} is not UTF-8 text, so it is not a ${kind.noun}`);
    }
  } catch (e) {
    if (e instanceof InputError) throw e;
    throw new InputError(`cannot read the ${kind.noun} ${shown}: ${systemErrorWords(e)}`);
  } finally {
    await file.close().catch(() => undefined);
  }
}

export async function loadDesignFile(path: string): Promise<{ design: DesignDoc; system: SpeakerSystem; warnings: Issue[] }> {
  const result = parseDesign(await readDesignText(path));
  if (!result.ok) {
    const issues = [...result.errors, ...result.warnings];
    if (issues.length === 1) throw new InputError(`${printable(path)} is not a valid design: ${formatIssue(issues[0]).trim()}`);
    const lines = capLines(issues.map(formatIssue));
    throw new InputError(`${printable(path)} is not a valid design (${count(result.errors.length, 'problem')}):\n${lines.join('\n')}`);
  }
  return result;
}
