// Lane worker thread run from source: loads the TypeScript body through tsx. The bundle has its
// own build/cli/lane-worker.mjs, built from lane-thread.ts, beside preheard.mjs.
import { register } from 'tsx/esm/api';

register();
await import('./lane-thread.ts');
