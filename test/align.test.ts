import { describe, expect, it } from 'vitest';
import { suggestAlignments } from '../src/engine/align/index.ts';
import { analyze, PORT_SPEED_LIMIT, unfiltered } from '../src/engine/response/analyze.ts';
import { respond } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { doc, qesFor, system, woofer } from './helpers/designs.ts';

describe('alignment suggestions', () => {
  const base = doc(
    { fs_hz: 30, qes: qesFor(0.33, 5), qms: 5, vas_l: 80, sd_cm2: 330, xmax_mm: 8, xlim_mm: 14, pe_w: 30 },
    { type: 'sealed', vb_l: 40 },
  );
  const s = system(base);
  const list = suggestAlignments(s);

  it('offers the closed boxes of Qtc 0.5, 0.577, 0.707 and 1.0 with the Qtc they promise (Small 1972)', () => {
    const sealed = list.filter((a) => a.box.type === 'sealed');
    expect(sealed.map((a) => a.qtc)).toEqual([0.5, 0.577, 0.707, 1.0]);
    for (const a of sealed) {
      const f = analyze(system({ ...base, box: a.box })).figures;
      expect(f.qtc!).toBeCloseTo(a.qtc!, 2);
    }
  });

  it("offers Thiele's QB3 for a driver with Qts below 0.383, with a port that keeps air speed under the limit", () => {
    const vented = list.find((a) => a.box.type === 'vented')!;
    expect(vented.label).toMatch(/QB3/);
    const design = { ...base, box: vented.box };
    const sys = system(design);
    // At each frequency, drive the drivers in their box (no filter: the design has no subsonic
    // high-pass) up to whichever comes first: rated power in Re or Xmax.
    const way = unfiltered(woofer(sys));
    const { box, driver } = way;
    if (box.type !== 'vented') throw new Error('box type');
    let worst = 0;
    for (let f = 10; f <= 400; f *= 1.01) {
      const r = respond(sys, way, f, 1);
      const v = Math.min(driver.xmax / (Math.SQRT2 * abs(r.excursion)), Math.sqrt(driver.pe / (abs(r.current) ** 2 * driver.re)));
      worst = Math.max(worst, (Math.SQRT2 * abs(r.outletFlow) * v) / box.sv);
    }
    expect(vented.note).toMatch(/sized for at most 17 m\/s/);
    expect(worst).toBeLessThanOrEqual(PORT_SPEED_LIMIT * 1.005);
    expect(worst).toBeGreaterThan(PORT_SPEED_LIMIT * 0.7); // and not absurdly oversized
    expect(parseDesign(design).ok).toBe(true);
  });
});
