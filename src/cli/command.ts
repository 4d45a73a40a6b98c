// Shared pieces of the CLI: exit codes, the command shape, argument parsing, reading designs.
import { parseArgs, type ParseArgsConfig } from 'node:util';
import { discardAllOutputs } from './output-files.ts';
import { decimalNumber, printable, systemErrorWords } from './user-text.ts';

export const EXIT_OK = 0;
export const EXIT_BAD_INPUT = 1;
export const EXIT_USAGE = 2;

/** A command: its name and its line in the usage are in main.ts's table. */
export interface Command {
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
    // node:util's wording, minus its hint to use "--" (which no command takes).
    throw new UsageError((e as Error).message.replace(/\. To specify a positional argument.*$/s, ''));
  }
}

/**
 * The one line shown for a failure nobody anticipated: what happened in words, never a stack trace
 * or a name from inside the program.
 */
export function unexpectedMessage(e: unknown): string {
  if (e instanceof RangeError && /call stack/i.test(e.message)) return 'the input is nested too deeply to read';
  if ((e as NodeJS.ErrnoException | null)?.code) return `a file operation failed: ${systemErrorWords(e)}`;
  if (e instanceof RangeError && /array buffer|allocation|invalid array length|buffer/i.test(e.message))
    return 'the input is too large for the memory available';
  return `an unexpected problem stopped the command (${e instanceof Error ? e.message : String(e)})`;
}

/** Runs a command body, mapping errors to exit codes and messages on stderr. */
export async function runGuarded(name: string, help: string, body: () => Promise<number>): Promise<number> {
  try {
    return await body();
  } catch (e) {
    if (e instanceof UsageError) {
      process.stderr.write(`preheard ${name}: ${printable(e.message)}\n\n${help}`);
      return EXIT_USAGE;
    }
    if (e instanceof InputError) {
      process.stderr.write(`preheard ${name}: ${printable(e.message, true)}\n`);
      return EXIT_BAD_INPUT;
    }
    process.stderr.write(`preheard ${name}: ${printable(unexpectedMessage(e))}\n`);
    return EXIT_BAD_INPUT;
  } finally {
    // Whatever happened, no half-written output stays behind.
    discardAllOutputs();
  }
}

export function parseNumberOption(value: string | undefined, option: string, min: number, max: number): number | undefined {
  if (value === undefined) return undefined;
  const n = decimalNumber(value, option);
  if (!Number.isFinite(n) || n < min || n > max) {
    throw new UsageError(`${option} must be a number from ${min} to ${max}, got "${printable(value)}"`);
  }
  return n;
}
