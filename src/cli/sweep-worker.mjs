// Worker thread for `preheard sweep` run from source: loads the TypeScript body through tsx. The
// bundle has its own build/cli/sweep-worker.mjs, built from sweep-thread.ts, beside preheard.mjs.
import { register } from 'tsx/esm/api';

register();
await import('./sweep-thread.ts');
