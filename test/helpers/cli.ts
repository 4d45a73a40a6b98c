// Running the CLI in tests: in-process through main(argv) with stdout and stderr captured (fast,
// for what a command prints and returns), or as a subprocess of the built bundle (for what only a
// real process shows: the exit status, the bin itself, worker threads from the bundle).
import { spawnSync } from 'node:child_process';
import { main } from '../../src/cli/main.ts';

export const CLI_BUNDLE = 'build/cli/preheard.mjs';

export interface CliResult {
  status: number;
  stdout: string;
  stderr: string;
}

/** main(argv) with process.stdout and process.stderr captured; never run two at once. */
export async function runCli(...args: string[]): Promise<CliResult> {
  const out: string[] = [];
  const err: string[] = [];
  const realOut = process.stdout.write;
  const realErr = process.stderr.write;
  const capture = (into: string[]) =>
    ((chunk: string | Uint8Array) => {
      into.push(typeof chunk === 'string' ? chunk : Buffer.from(chunk).toString('utf8'));
      return true;
    }) as typeof process.stdout.write;
  process.stdout.write = capture(out);
  process.stderr.write = capture(err);
  try {
    const status = await main(args);
    return { status, stdout: out.join(''), stderr: err.join('') };
  } finally {
    process.stdout.write = realOut;
    process.stderr.write = realErr;
  }
}

/** The bundle as a subprocess (built by the tests' global setup). */
export function spawnCli(...args: string[]): CliResult {
  const r = spawnSync(process.execPath, [CLI_BUNDLE, ...args], { encoding: 'utf8', timeout: 120_000 });
  return { status: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}
