// The command's entry point: what the bundle (build/cli/preheard.mjs) starts with.
import { main } from './main.ts';

process.exitCode = await main(process.argv.slice(2));
