// Opening an audio input file for reading by position: one place that turns the system's refusals
// (missing file, no permission, a folder) into a message for the user. Positional reads have no
// whole-file size limit, unlike readFile (which refuses 2 GiB and more), so large files are judged
// by their headers before any audio is read.
import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import { InputError } from './command.ts';

/** Longest input accepted, in samples over all channels: 1 GiB as 32-bit float (46 min of stereo at 48 kHz). */
export const MAX_INPUT_SAMPLES = 2 ** 28;

const REASONS: Record<string, string> = {
  ENOENT: 'there is no such file',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EISDIR: 'it is a folder, not a file',
  ENOTDIR: 'a part of the path is not a folder',
  ELOOP: 'too many symbolic links',
  EMFILE: 'too many files are open',
  EIO: 'the disk reported a read error',
};

export function cannotRead(path: string, e: unknown): InputError {
  const code = (e as NodeJS.ErrnoException).code ?? '';
  return new InputError(`cannot read ${path}: ${REASONS[code] ?? (code || (e as Error).message)}`);
}

export interface InputFile {
  path: string;
  size: number;
  /** Fills `into` from `offset` (stopping at the end of the file); returns the bytes read. */
  readAt(into: Uint8Array, offset: number, length?: number): number;
  close(): void;
}

export function openInput(path: string): InputFile {
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (e) {
    throw cannotRead(path, e);
  }
  try {
    const st = fstatSync(fd);
    if (st.isDirectory()) throw new InputError(`cannot read ${path}: ${REASONS.EISDIR}`);
    if (!st.isFile()) throw new InputError(`cannot read ${path}: not a regular file`);
    return {
      path,
      size: st.size,
      readAt(into, offset, length = into.length) {
        let got = 0;
        try {
          while (got < length) {
            const n = readSync(fd, into, got, length - got, offset + got);
            if (n === 0) break;
            got += n;
          }
        } catch (e) {
          throw cannotRead(path, e);
        }
        return got;
      },
      close: () => closeSync(fd),
    };
  } catch (e) {
    closeSync(fd);
    throw e;
  }
}

/** Refuses an input longer than the limit (MAX_INPUT_SAMPLES), saying how long is allowed at its rate. */
export function checkInputLength(path: string, frames: number, channels: number, sampleRate: number, maxSamples = MAX_INPUT_SAMPLES): void {
  if (frames * channels <= maxSamples) return;
  const span = (f: number) => {
    const s = f / sampleRate;
    return s < 120 ? `${s.toFixed(1)} s` : `${(s / 60).toFixed(1)} minutes`;
  };
  throw new InputError(
    `${path}: ${span(frames)} of ${channels}-channel audio is too long: at most ${span(Math.floor(maxSamples / channels))} at ${sampleRate} Hz`,
  );
}
