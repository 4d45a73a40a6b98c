import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { parseDesign } from '../src/engine/design/validate.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { FUZZ_SEED, runs } from './helpers/fuzz.ts';

const example = JSON.parse(readFileSync('public/examples/living-room-vented.json', 'utf8'));

/** Every path to a leaf of a JSON value. */
function leaves(value: unknown, prefix: (string | number)[] = []): (string | number)[][] {
  if (value && typeof value === 'object') {
    return Object.entries(value).flatMap(([k, v]) => leaves(v, [...prefix, Array.isArray(value) ? Number(k) : k]));
  }
  return [prefix];
}
const allLeaves = leaves(example);

function mutate(base: unknown, path: (string | number)[], replacement: unknown, remove: boolean): unknown {
  const copy = structuredClone(base) as Record<string | number, unknown>;
  let node = copy;
  for (const key of path.slice(0, -1)) node = node[key] as Record<string | number, unknown>;
  const last = path[path.length - 1];
  if (remove) delete node[last];
  else node[last] = replacement;
  return copy;
}

const weird = fc.oneof(
  fc.double(),
  fc.constantFrom(Number.NaN, Infinity, -Infinity, 0, -0, 1e308, -1e308, 5e-324),
  fc.integer(),
  fc.string(),
  fc.boolean(),
  fc.constant(null),
  fc.array(fc.double(), { maxLength: 3 }),
  fc.object({ maxDepth: 1 }),
);

/** The loader's promise: a system, or messages that name a field; never a throw. */
function checkOutcome(input: unknown) {
  const r = parseDesign(input);
  if (r.ok) {
    const a = analyze(r.system);
    for (const v of a.curves.splDb) expect(Number.isFinite(v)).toBe(true);
    expect(Number.isFinite(a.figures.f3Hz)).toBe(true);
  } else {
    expect(r.errors.length).toBeGreaterThan(0);
    for (const e of r.errors) {
      expect(typeof e.path).toBe('string');
      expect(e.message.length).toBeGreaterThan(3);
    }
  }
}

describe('design loader fuzz (fast-check, seeded)', () => {
  it('survives one field replaced by any JSON value or removed', () => {
    fc.assert(
      fc.property(fc.constantFrom(...allLeaves), weird, fc.boolean(), (path, replacement, remove) => {
        checkOutcome(mutate(example, path, replacement, remove));
      }),
      { seed: FUZZ_SEED, numRuns: runs(400) },
    );
  });

  it('survives numbers scaled far out of range in several fields at once', () => {
    const numeric = allLeaves.filter(
      (p) => typeof p.reduce<unknown>((n, k) => (n as Record<string | number, unknown>)[k], example) === 'number',
    );
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.constantFrom(...numeric), fc.double({ min: 1e-3, max: 1e3, noNaN: true })), { minLength: 1, maxLength: 5 }),
        (edits) => {
          let d: unknown = example;
          for (const [path, factor] of edits) {
            const current = path.reduce<unknown>((n, k) => (n as Record<string | number, unknown>)[k], d) as number;
            d = mutate(d, path, current * factor, false);
          }
          checkOutcome(d);
        },
      ),
      { seed: FUZZ_SEED, numRuns: runs(300) },
    );
  });

  it('survives arbitrary JSON and arbitrary text', () => {
    fc.assert(
      fc.property(fc.jsonValue(), (v) => checkOutcome(v)),
      { seed: FUZZ_SEED, numRuns: runs(300) },
    );
    fc.assert(
      fc.property(fc.string({ maxLength: 200 }), (s) => checkOutcome(s)),
      { seed: FUZZ_SEED, numRuns: runs(300) },
    );
  });

  it('survives truncated design text', () => {
    const text = JSON.stringify(example);
    fc.assert(
      fc.property(fc.integer({ min: 0, max: text.length - 1 }), (n) => checkOutcome(text.slice(0, n))),
      { seed: FUZZ_SEED, numRuns: runs(200) },
    );
  });
});
