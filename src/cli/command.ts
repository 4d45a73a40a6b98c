// Shared pieces of the CLI: exit codes, the command shape, argument parsing, reading designs.
import { parseArgs, type ParseArgsConfig } from 'node:util';

export const EXIT_OK = 0;
export const EXIT_BAD_INPUT = 1;
export const EXIT_USAGE = 2;

export interface Command {
  name: string;
  summary: string;
  run(argv: string[]): Promise<number>;
}

/** A failure the user can fix: printed as a message, exit code 1. */
export class InputError extends Error {}
/** The command line itself is wrong: printed with the command's help, exit code 2. */
export class UsageError extends Error {}

export function parseCommandArgs<T extends ParseArgsConfig['options']>(argv: string[], options: T) {
  try {
    return parseArgs({ args: argv, options, allowPositionals: true, strict: true });
  } catch (e) {
    throw new UsageError((e as Error).message);
  }
}

/** Runs a command body, mapping errors to exit codes and messages on stderr. */
export async function runGuarded(name: string, help: string, body: () => Promise<number>): Promise<number> {
  try {
    return await body();
  } catch (e) {
    if (e instanceof UsageError) {
      process.stderr.write(`preheard ${name}: ${e.message}\n\n${help}`);
      return EXIT_USAGE;
    }
    if (e instanceof InputError) {
      process.stderr.write(`preheard ${name}: ${e.message}\n`);
      return EXIT_BAD_INPUT;
    }
    throw e;
  }
}

export function parseNumberOption(value: string | undefined, option: string, min: number, max: number): number | undefined {
  if (value === undefined) return undefined;
  const n = Number(value);
  if (!Number.isFinite(n) || n < min || n > max) {
    throw new UsageError(`${option} must be a number from ${min} to ${max}, got "${value}"`);
  }
  return n;
}
