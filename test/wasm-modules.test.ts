// The engine's WebAssembly modules as committed (base64 in TypeScript) are the assembly of their
// committed .wat sources (scripts/build-wasm.mjs): neither can be edited without the other.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { assemble, MODULES, moduleSource } from '../scripts/build-wasm.mjs';

describe('WebAssembly modules', () => {
  for (const m of MODULES) {
    it(`${m.ts} is the assembly of ${m.wat}`, async () => {
      const bytes = await assemble(m);
      expect(bytes.length).toBeGreaterThan(100);
      expect(readFileSync(m.tsPath, 'utf8')).toBe(moduleSource(m, bytes));
    });
  }
});
