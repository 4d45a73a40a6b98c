#!/usr/bin/env node
// Runs the CLI from its TypeScript source through tsx, without a build: for development. The
// package's bin is the bundle, build/cli/preheard.mjs (see scripts/build-cli.mjs).
import { register } from 'tsx/esm/api';

register();
await import('./bin.ts');
