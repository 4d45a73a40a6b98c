// Worker thread for `preheard compare` run from source: loads the TypeScript body through tsx. The
// bundle has its own build/cli/compare-worker.mjs, built from compare-thread.ts, beside preheard.mjs.
import { register } from 'tsx/esm/api';

register();
await import('./compare-thread.ts');
