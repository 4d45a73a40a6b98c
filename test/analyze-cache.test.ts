// The analysis keeps each way's results by content (response/by-content.ts) and solves a way at one
// frequency with its filter, network and box kept from the call before (response/frequency.ts): an
// edit recomputes only what it touched. These tests hold the kept results to fresh ones, exactly.
import { describe, expect, it, vi } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { analyze, maxSine } from '../src/engine/response/analyze.ts';
import { respond, systemPressure } from '../src/engine/response/frequency.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { abs, arg } from '../src/engine/complex.ts';
import { splDb } from '../src/engine/units.ts';
import type { DesignDoc } from '../src/engine/design/document.ts';
import type { Analysis } from '../src/engine/response/types.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';

const EXAMPLES = join(import.meta.dirname, '..', 'public', 'examples');
const examples = readdirSync(EXAMPLES)
  .filter((f) => f.endsWith('.json'))
  .map((f) => {
    const r = parseDesign(JSON.parse(readFileSync(join(EXAMPLES, f), 'utf8')));
    if (!r.ok) throw new Error(`example ${f} is invalid`);
    return r.design;
  });

/** A small deterministic generator (xorshift32), so a failure can be replayed. */
function random(seed: number): () => number {
  let x = seed;
  return () => {
    x ^= x << 13;
    x ^= x >>> 17;
    x ^= x << 5;
    return (x >>> 0) / 2 ** 32;
  };
}

/** Every numeric field of a design, as a path. */
function numericPaths(x: unknown, path: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  if (typeof x === 'number') out.push(path);
  else if (x && typeof x === 'object') for (const [k, v] of Object.entries(x)) numericPaths(v, [...path, k], out);
  return out;
}

/** The design with one numeric field scaled by 0.8 to 1.25, or null when that edit is not a valid design. */
function edited(design: DesignDoc, rnd: () => number): { design: DesignDoc; system: SpeakerSystem } | null {
  const copy = structuredClone(design) as unknown as Record<string, unknown>;
  const paths = numericPaths(copy).filter((p) => p[0] !== 'version');
  const path = paths[Math.floor(rnd() * paths.length)];
  let at = copy as Record<string | number, unknown>;
  for (const k of path.slice(0, -1)) at = at[k] as Record<string | number, unknown>;
  const last = path[path.length - 1];
  at[last] = (at[last] as number) * (0.8 + 0.45 * rnd());
  const r = parseDesign(copy);
  return r.ok ? { design: r.design, system: r.system } : null;
}

/** The analysis as plain data: every curve and figure, the systems it quotes left out. */
const plain = (a: Analysis) =>
  JSON.parse(
    JSON.stringify(a, (k, v) =>
      v instanceof Float64Array ? Array.from(v, (x) => (Number.isNaN(x) ? 'NaN' : x)) : k === 'system' ? undefined : v,
    ),
  );

describe('the analysis after an edit', () => {
  it('is exactly the analysis of a fresh engine, on random edits of every example (some designs revisited)', async () => {
    const rnd = random(20261203);
    const edits: DesignDoc[] = [];
    let compared = 0;
    for (let i = 0; i < 30; i++) {
      let system: SpeakerSystem | null = null;
      if (i % 3 === 2 && edits.length > 0) {
        // Back to a design analysed before, read again (a new object, the same content): its ways are kept.
        const r = parseDesign(structuredClone(edits[Math.floor(rnd() * edits.length)]));
        if (r.ok) system = r.system;
      } else {
        const e = edited(examples[i % examples.length], rnd);
        if (e) {
          edits.push(e.design);
          system = e.system;
        }
      }
      if (!system) continue;
      const warm = analyze(system);
      vi.resetModules();
      const fresh = await import('../src/engine/response/analyze.ts');
      expect(plain(warm)).toEqual(plain(fresh.analyze(system)));
      compared++;
    }
    expect(compared).toBeGreaterThan(20);
  });

  it("holds each way's curves to the way solved directly at every grid frequency, after edits to other ways", () => {
    const passive = examples.find((d) => d.ways.length > 1 && d.ways.every((w) => w.kind === 'driver'));
    if (!passive) throw new Error('an example with two driver ways');
    const rnd = random(7);
    for (let i = 0; i < 4; i++) {
      const doc = structuredClone(passive);
      const tweeter = doc.ways[1] as unknown as { driver: { re_ohm: number } };
      tweeter.driver.re_ohm *= 0.9 + 0.2 * rnd();
      const r = parseDesign(doc);
      if (!r.ok) throw new Error('edited design');
      const a = analyze(r.system);
      for (const wa of a.ways) {
        const { freqHz } = wa.curves;
        for (let k = 0; k < freqHz.length; k += 7) {
          const direct = respond(r.system, wa.way, freqHz[k], a.driveV);
          expect(wa.curves.splDb[k]).toBe(splDb(abs(direct.pressure)));
          expect(wa.curves.excursionMm[k]).toBe(Math.SQRT2 * abs(direct.excursion) * 1000);
          expect(wa.curves.maxSplDb[k]).toBe(splDb(maxSine(r.system, wa.way, freqHz[k]).pa));
        }
      }
      const { freqHz } = a.sum.curves;
      for (let k = 0; k < freqHz.length; k += 7) {
        const p = systemPressure(r.system, freqHz[k], a.driveV);
        expect(a.sum.curves.splDb[k]).toBe(splDb(abs(p)));
        expect(a.sum.curves.phaseDeg[k]).toBe((arg(p) * 180) / Math.PI);
      }
    }
  });
});
