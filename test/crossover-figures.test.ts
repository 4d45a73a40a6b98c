// Crossover figures from curves: a Linkwitz-Riley LR4 pair (Linkwitz, JAES 24(1), 1976: each half
// is -6.02 dB at the corner and the two sum flat in magnitude) computed here from its closed form.
import { describe, expect, it } from 'vitest';
import { crossoverFigures } from '../src/engine/response/crossover-figures.ts';
import { logGrid } from '../src/engine/response/analyze.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { twoWayFrom } from './helpers/tweeter.ts';

describe('crossover figures', () => {
  it('an ideal LR4 pair at 2 kHz: each way -6 dB at 2 kHz (within 1%), the sum flat', () => {
    const f = logGrid(20, 20000, 96);
    // |LR4| = |BW2|² = 1/(1 + (f/fc)^4) for the low-pass, (f/fc)^4/(1 + (f/fc)^4) for the high-pass.
    const lo = f.map((x) => 90 + 20 * Math.log10(1 / (1 + (x / 2000) ** 4)));
    const hi = f.map((x) => 90 + 20 * Math.log10((x / 2000) ** 4 / (1 + (x / 2000) ** 4)));
    const sum = f.map(() => 90);
    const xo = crossoverFigures(
      f,
      sum,
      [
        { name: 'woofer', splDb: lo },
        { name: 'tweeter', splDb: hi },
      ],
      90,
      20,
    );
    expect(xo.ways[0].lowHz).toBeNull();
    expect(xo.ways[0].highHz! / 2000).toBeCloseTo(1, 2);
    expect(xo.ways[1].lowHz! / 2000).toBeCloseTo(1, 2);
    expect(xo.ways[1].highHz).toBeNull();
    expect(xo.deviationDb).toBe(0);
  });

  it('analyze reports them for a two-way design: the tweeter LR4 high-pass at 2.2 kHz sets its -6 dB point near 2.2 kHz', () => {
    const r = parseDesign(twoWayFrom('public/examples/living-room-sealed.json'));
    if (!r.ok) throw new Error('two-way');
    const xo = analyze(r.system).sum.figures.crossover;
    const tw = xo.ways.find((w) => w.name === 'tweeter')!;
    expect(tw.lowHz).not.toBeNull();
    expect(tw.lowHz!).toBeGreaterThan(1500);
    expect(tw.lowHz!).toBeLessThan(3200);
    expect(Number.isFinite(xo.deviationDb)).toBe(true);
  });
});
