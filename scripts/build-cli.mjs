// Bundles the CLI into plain JavaScript for Node 20: build/cli/preheard.mjs (the package's bin) and
// build/cli/sweep-worker.mjs, compare-worker.mjs and lane-worker.mjs (worker threads, found beside it). Run by `npm ci` through
// the `prepare` script, by the unit tests' global setup, and by `npm run build:cli`.
// Split into chunks (beside the entries, where the workers' URLs find them): each command's module
// is loaded when it runs, so the usage starts without parsing the engine, and the entries share
// the code they have in common instead of a copy each.
import { build } from 'esbuild';
import { chmodSync, rmSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
export const CLI_BUNDLE = join(root, 'build/cli/preheard.mjs');

export async function buildCli() {
  // Chunks are named by their content: clear the last build's, which nothing would load.
  rmSync(join(root, 'build/cli'), { recursive: true, force: true });
  await build({
    absWorkingDir: root,
    entryPoints: [
      { in: 'src/cli/bin.ts', out: 'preheard' },
      { in: 'src/cli/sweep-thread.ts', out: 'sweep-worker' },
      { in: 'src/cli/compare-thread.ts', out: 'compare-worker' },
      { in: 'src/cli/lane-thread.ts', out: 'lane-worker' },
    ],
    outdir: 'build/cli',
    outExtension: { '.js': '.mjs' },
    bundle: true,
    splitting: true,
    chunkNames: 'chunk-[hash]',
    platform: 'node',
    format: 'esm',
    target: 'node20',
    // CommonJS dependencies bundled into an ES module still call require() for Node's own modules.
    banner: { js: "#!/usr/bin/env node\nimport { createRequire as __cliRequire } from 'node:module';\nconst require = __cliRequire(import.meta.url);" },
    legalComments: 'eof',
    logLevel: 'warning',
  });
  chmodSync(CLI_BUNDLE, 0o755);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) await buildCli();
