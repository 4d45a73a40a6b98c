// The small-signal analysis gives the very same numbers, bit for bit, as the engine did before it
// was made faster (the solve without intermediate objects, the filter without them): the hashes in
// test/fixtures/analysis-hashes.json were made once from the earlier engine (see the file's note).
import { describe, expect, it } from 'vitest';
import fixture from './fixtures/analysis-hashes.json' with { type: 'json' };
import { analysisCases, analysisHash } from './helpers/analysis-cases.ts';
import { analyze } from '../src/engine/response/analyze.ts';

describe('analysis identity', () => {
  const cases = analysisCases();
  it('covers every case of the fixture', () => {
    expect(cases.map((c) => c.name).sort()).toEqual(Object.keys(fixture.hashes).sort());
  });
  for (const c of cases) {
    it(`${c.name}: every curve and figure as before, bit for bit`, () => {
      expect(analysisHash(analyze(c.system))).toBe((fixture.hashes as Record<string, string>)[c.name]);
    });
  }
});
