// The bench's level message follows the latest levels: set when a design cannot reach the planned
// level on a track, replaced or cleared by the next result, and saying when the track is the problem.
import { describe, expect, it } from 'vitest';
import { levelFailure, levelProblem, SILENT_TRACK } from '../src/audio/level-message.ts';
import { seatLeqCPerVolt } from '../src/engine/level/calibration.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { readFileSync } from 'node:fs';

describe('bench level message', () => {
  it('140 dB needs 14071 V (message), then 90 dB needs 44 V (no message)', () => {
    expect(levelProblem({ a: 14071, b: 9000 })).toMatch(/design A would need 14071 V per full scale, more than the 10000 V/);
    expect(levelProblem({ a: 44.5, b: 28.1 })).toBeNull();
  });
  it('names both designs, the one needing more first, and says the track is too quiet', () => {
    const m = levelProblem({ a: 3e5, b: 2e4 })!;
    expect(m).toMatch(/^This track is too quiet for the planned level: design A would need 3\.00e\+5 V .* and design B would need 20000 V/);
    expect(m).toMatch(/lower planned level for both designs/);
  });
  it('a track silent in the designs band is told so, not asked for another level', () => {
    expect(levelProblem({ a: Number.POSITIVE_INFINITY, b: Number.POSITIVE_INFINITY })).toBe(SILENT_TRACK);
    const design = parseDesign(readFileSync('public/examples/living-room-vented.json', 'utf8'));
    if (!design.ok) throw new Error('example design invalid');
    let err: unknown;
    try {
      seatLeqCPerVolt(design.system, [new Float32Array(48000)], 48000);
    } catch (e) {
      err = e;
    }
    expect(levelFailure(err)).toBe(SILENT_TRACK);
    expect(levelFailure(new Error('worker stopped'))).toBe('The planned level cannot be set for this track: worker stopped');
  });
});
