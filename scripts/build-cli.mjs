// Bundles the CLI into plain JavaScript for Node 20: build/cli/preheard.mjs (the package's bin) and
// build/cli/sweep-worker.mjs, compare-worker.mjs and lane-worker.mjs (worker threads, found beside it). Run by `npm ci` through
// the `prepare` script, by the unit tests' global setup, and by `npm run build:cli`.
import { build } from 'esbuild';
import { chmodSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
export const CLI_BUNDLE = join(root, 'build/cli/preheard.mjs');

export async function buildCli() {
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
