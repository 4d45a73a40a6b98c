// The files a command writes, checked before any work and put in place together at the end.
//
// Before anything is read or computed, every output path is checked: its folder must exist and be
// writable, an existing output must be a regular file (never a FIFO, a device or a folder), and no
// output may be, after following links, the same file as an input or as another output of the same
// run (same real path, or same device and inode for hard links). Outputs are then written into a
// private folder beside each final name and renamed onto the final names only when every one is
// complete; on any failure, exception, exit or SIGINT/SIGTERM/SIGHUP the private folders are removed.
import { constants, linkSync, mkdtempSync, renameSync, rmSync, unlinkSync } from 'node:fs';
import { access, lstat, realpath, stat } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';
import { InputError } from './command.ts';
import { printable, systemErrorWords } from './user-text.ts';

/** Prefix of the private folders; a leftover one (after SIGKILL or a power cut) is safe to delete. */
export const STAGING_PREFIX = '.preheard-partial-';

interface Identity {
  real: string;
  dev?: number;
  ino?: number;
}

const same = (x: Identity, y: Identity) => x.real === y.real || (x.ino !== undefined && x.dev === y.dev && x.ino === y.ino);

function kindOf(s: {
  isDirectory(): boolean;
  isFIFO(): boolean;
  isCharacterDevice(): boolean;
  isBlockDevice(): boolean;
  isSocket(): boolean;
}) {
  if (s.isDirectory()) return 'a folder';
  if (s.isFIFO()) return 'a named pipe (FIFO)';
  if (s.isCharacterDevice() || s.isBlockDevice()) return 'a device';
  if (s.isSocket()) return 'a socket';
  return 'not a regular file';
}

async function inputIdentity(path: string): Promise<Identity | null> {
  try {
    const real = await realpath(path);
    const s = await stat(real);
    return { real, dev: s.dev, ino: s.ino };
  } catch {
    // A missing or unreadable input is reported by whoever reads it; it cannot be overwritten here.
    return null;
  }
}

/**
 * An input must exist and be readable before any work; said in words (the readers report what is
 * wrong inside the file).
 */
export async function checkReadable(path: string, what: string): Promise<void> {
  try {
    await access(path, constants.R_OK);
  } catch (e) {
    throw new InputError(`cannot read the ${what} ${printable(path)}: ${systemErrorWords(e)}`);
  }
}

/** Checks one output path; returns where the file will finally live (links followed) and its identity. */
async function checkOutput(path: string): Promise<Identity> {
  const shown = printable(path);
  if (path === '' || path.endsWith('/')) throw new InputError(`cannot write "${shown}": give a file name, not a folder`);
  const abs = resolve(path);
  const folder = dirname(abs);
  let realFolder: string;
  try {
    realFolder = await realpath(folder);
    if (!(await stat(realFolder)).isDirectory()) throw Object.assign(new Error(), { code: 'ENOTDIR' });
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'that folder does not exist' : systemErrorWords(e);
    throw new InputError(`cannot write ${shown}: ${why} (${printable(dirname(path))}); nothing was done`);
  }
  let link: Awaited<ReturnType<typeof lstat>> | null = null;
  try {
    link = await lstat(abs);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'ENOENT') throw new InputError(`cannot write ${shown}: ${systemErrorWords(e)}`);
  }
  let identity: Identity = { real: join(realFolder, basename(abs)) };
  if (link) {
    let target: Awaited<ReturnType<typeof stat>>;
    let real: string;
    try {
      real = await realpath(abs);
      target = await stat(real);
    } catch {
      throw new InputError(`cannot write ${shown}: it is a link to a file that does not exist; give a new name or remove the link`);
    }
    if (!target.isFile())
      throw new InputError(`will not write ${shown}: it is ${kindOf(target)}, not a regular file; give a new file name`);
    identity = { real, dev: target.dev, ino: target.ino };
  }
  try {
    await access(dirname(identity.real), constants.W_OK);
  } catch (e) {
    throw new InputError(`cannot write ${shown}: its folder is not writable (${systemErrorWords(e)}); nothing was done`);
  }
  return identity;
}

/** Outputs of one run, checked; write each to `staging(path)`, then `commit()`. */
export interface OutputPlan {
  /** The name to write `path`'s content to now (inside a private folder beside it). */
  staging(path: string): string;
  /** Renames every staged file onto its final name; if one rename fails, the earlier ones are undone. */
  commit(): void;
  /** Removes everything staged and not committed (safe to call more than once). */
  discard(): void;
}

const live = new Set<OutputPlan>();
const SIGNALS: NodeJS.Signals[] = ['SIGINT', 'SIGTERM', 'SIGHUP'];
let guarding = false;

function onSignal(signal: NodeJS.Signals) {
  discardAllOutputs();
  stopGuard();
  // Die of the same signal, as if we had not caught it (the shell sees 130 for SIGINT, 143 for SIGTERM).
  process.kill(process.pid, signal);
}

function startGuard() {
  if (guarding) return;
  guarding = true;
  for (const s of SIGNALS) process.on(s, onSignal);
  process.on('exit', discardAllOutputs);
}

function stopGuard() {
  if (!guarding || live.size > 0) return;
  guarding = false;
  for (const s of SIGNALS) process.off(s, onSignal);
  process.off('exit', discardAllOutputs);
}

/** Removes every private folder of every plan not yet committed (on error paths and on exit). */
export function discardAllOutputs(): void {
  for (const plan of [...live]) plan.discard();
}

/**
 * Checks `outputs` (undefined entries are skipped) against each other and against `inputs`, before
 * any work. Throws InputError naming the first problem.
 */
export async function planOutputs(inputs: string[], outputs: (string | undefined)[]): Promise<OutputPlan> {
  const wanted = outputs.filter((o): o is string => o !== undefined);
  const ins = await Promise.all(inputs.map(async (p) => ({ path: p, id: await inputIdentity(p) })));
  const finals = new Map<string, Identity>();
  const seen: { path: string; id: Identity }[] = [];
  for (const path of wanted) {
    const id = await checkOutput(path);
    const input = ins.find((i) => i.id && same(i.id, id));
    if (input) {
      throw new InputError(
        `will not write ${printable(path)}: it is the input ${printable(input.path)}${input.path === path ? '' : ' (the same file)'}, which would be overwritten; choose another output name`,
      );
    }
    const twin = seen.find((o) => same(o.id, id));
    if (twin) throw new InputError(`${printable(path)} and ${printable(twin.path)} are the same file: give each output its own name`);
    seen.push({ path, id });
    finals.set(path, id);
  }

  const folders = new Map<string, string>();
  const staged = new Map<string, string>();
  let open = true;
  const plan: OutputPlan = {
    staging(path) {
      const id = finals.get(path);
      if (!id) throw new Error(`output ${path} was not planned`);
      const parent = dirname(id.real);
      let folder = folders.get(parent);
      if (!folder) {
        live.add(plan);
        startGuard();
        folder = mkdtempSync(join(parent, STAGING_PREFIX));
        folders.set(parent, folder);
      }
      const name = join(folder, `${staged.size}-${basename(id.real)}`);
      staged.set(path, name);
      return name;
    },
    commit() {
      const done: { final: string; backup: string | null }[] = [];
      try {
        for (const [path, temp] of staged) {
          const final = finals.get(path)!.real;
          // A hard link to the file about to be replaced lets a failed later rename put it back.
          let backup: string | null = `${temp}.previous`;
          try {
            linkSync(final, backup);
          } catch {
            backup = null;
          }
          renameSync(temp, final);
          done.push({ final, backup });
        }
      } catch (e) {
        for (const { final, backup } of done.reverse()) {
          try {
            if (backup) renameSync(backup, final);
            else unlinkSync(final);
          } catch {
            // Nothing more can be done; the message below says which outputs to check.
          }
        }
        plan.discard();
        throw new InputError(`cannot put the outputs in place: ${systemErrorWords(e)}; no output was changed`);
      }
      plan.discard();
    },
    discard() {
      if (!open && folders.size === 0) return;
      for (const folder of folders.values()) rmSync(folder, { recursive: true, force: true });
      folders.clear();
      staged.clear();
      open = false;
      live.delete(plan);
      stopGuard();
    },
  };
  return plan;
}
