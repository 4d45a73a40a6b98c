// Text the CLI shows to a person: echoed bytes made harmless for a terminal, operating-system
// error codes in words, long problem lists cut short with a count, numbers read as decimals only.
import { UsageError } from './command.ts';
import { counted, significantTrimmed } from '../engine/number-text.ts';

const HEX = (c: string) => c.charCodeAt(0).toString(16).padStart(2, '0');

/**
 * Terminal control characters (C0, DEL, C1) in text that came from a file or the command line are
 * shown as \xNN, so a design name or a file's bytes cannot move the cursor, recolour or retitle the
 * terminal. Line breaks are kept only when `keepNewlines` (our own multi-line messages).
 */
export function printable(text: string, keepNewlines = false): string {
  // biome-ignore lint/suspicious/noControlCharactersInRegex: finding control characters is the point
  const pattern = keepNewlines ? /[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/g : /[\u0000-\u001f\u007f-\u009f]/g;
  return text.replace(pattern, (c) => `\\x${HEX(c)}`);
}

/** Operating-system error codes as a person would say them. */
const ERRNO_WORDS: Record<string, string> = {
  ENOENT: 'there is no such file',
  EACCES: 'permission denied (this user may not open it)',
  EPERM: 'permission denied (this user may not open it)',
  EISDIR: 'it is a folder, not a file',
  ENOTDIR: 'a part of the path is not a folder',
  ELOOP: 'the path goes round in a loop of links',
  ENAMETOOLONG: 'the name is too long',
  EMFILE: 'too many files are open',
  ENFILE: 'too many files are open',
  ENOSPC: 'the disk is full',
  EDQUOT: 'the disk quota is used up',
  EROFS: 'the disk is read-only',
  EIO: 'the disk reported a read or write error',
  EBUSY: 'the file is busy',
  ETXTBSY: 'the file is busy',
  EXDEV: 'the file is on another disk',
  EINVAL: 'the operating system refused the name',
};

/** "permission denied ..." for an error thrown by node:fs; a plain description otherwise. */
export function systemErrorWords(e: unknown): string {
  const code = (e as NodeJS.ErrnoException | null)?.code;
  if (code && ERRNO_WORDS[code]) return ERRNO_WORDS[code];
  if (code) return `the operating system reported ${code}`;
  return e instanceof Error ? e.message : String(e);
}

/** Longest problem list printed; the rest is counted. */
export const MAX_LISTED = 20;

/** The first `max` lines, then one line with how many more there are. */
export function capLines(lines: string[], max = MAX_LISTED, noun = 'problems'): string[] {
  if (lines.length <= max) return lines;
  return [...lines.slice(0, max), `  ... and ${lines.length - max} more ${noun} (${lines.length} in all)`];
}

/** A plain decimal number: digits with an optional sign, point and exponent. No hex, octal, binary or "Infinity". */
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

export function decimalNumber(text: string, option: string): number {
  if (!DECIMAL.test(text)) throw new UsageError(`${option} must be a decimal number, got "${printable(text)}"`);
  return Number(text);
}

/** A whole decimal number, for counts. */
export function wholeNumber(text: string, option: string): number {
  if (!/^\+?\d+$/.test(text)) throw new UsageError(`${option} must be a whole decimal number, got "${printable(text)}"`);
  return Number(text);
}

/**
 * A figure in a table for a person: three significant figures (4.99 V, Qts 0.376, 2.54 Pa, 650 Hz),
 * trailing zeros dropped. Tables only: the JSON outputs keep their full numbers.
 */
export function sig(x: number | null | undefined, digits = 3): string {
  if (x === null || x === undefined || Number.isNaN(x)) return '-';
  if (!Number.isFinite(x)) return x > 0 ? 'unlimited' : '-unlimited';
  return significantTrimmed(x, digits);
}

/**
 * A level or a level difference in dB, to 0.1 dB: significant figures would round 102.4 dB SPL to
 * 102, coarser than the searches that find it (0.25 dB).
 */
export function db(x: number | null | undefined): string {
  if (x === null || x === undefined || Number.isNaN(x)) return '-';
  if (!Number.isFinite(x)) return x > 0 ? 'unlimited' : 'silent';
  const t = x.toFixed(1);
  return t === '-0.0' ? '0.0' : t;
}

/** A length of time: seconds to three significant figures under a minute, else m:ss rounded to the second (3:01). */
export function duration(seconds: number): string {
  if (!(seconds >= 60)) return `${sig(seconds)} s`;
  const t = Math.round(seconds);
  return `${Math.floor(t / 60)}:${String(t % 60).padStart(2, '0')}`;
}

/** "1 warning", "0 errors", "2 arguments". */
export const count = counted;

/** A moment in a track: seconds to three significant figures under a minute, else m:ss.s, never later than it is (2:05.9). */
export function moment(seconds: number): string {
  if (!(seconds >= 60)) return `${sig(seconds)} s`;
  const tenths = Math.floor(seconds * 10);
  const m = Math.floor(tenths / 600);
  return `${m}:${((tenths - m * 600) / 10).toFixed(1).padStart(4, '0')}`;
}
