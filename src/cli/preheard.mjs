#!/usr/bin/env node
// The package's bin: loads the TypeScript CLI through tsx so it runs right after `npm ci`.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('./main.ts');
process.exitCode = await main(process.argv.slice(2));
