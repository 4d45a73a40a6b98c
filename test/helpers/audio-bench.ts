// The demo pair of examples as engine systems, for the listening-bench tests and benchmark.
import { readFileSync } from 'node:fs';
import { join, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseDesign } from '../../src/engine/design/validate.ts';
import type { SpeakerSystem } from '../../src/engine/system.ts';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

export function exampleSystem(kind: 'sealed' | 'vented'): SpeakerSystem {
  const r = parseDesign(JSON.parse(readFileSync(join(ROOT, 'public', 'examples', `living-room-${kind}.json`), 'utf8')));
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('\n'));
  return r.system;
}
