import { describe, expect, it } from 'vitest';
import { suggestAlignments } from '../src/engine/align/index.ts';
import { analyze, PORT_SPEED_LIMIT, unfiltered } from '../src/engine/response/analyze.ts';
import { respond } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { doc, qesFor, system, woofer } from './helpers/designs.ts';
import type { DriverWay } from '../src/engine/system.ts';
import { tweeterWay } from './helpers/tweeter.ts';

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

  it('suggests boxes for the way asked for: closed backs for a tweeter from its own Vas and Qts', () => {
    const two = parseDesign({
      format: 'preheard-design',
      version: 2,
      name: 'two-way',
      ways: [
        {
          kind: 'driver',
          name: 'woofer',
          driver: base.driver,
          box: base.box,
          filter: { type: 'active', lowpass: { shape: 'lr4', hz: 2200 } },
        },
        { ...tweeterWay(), filter: { type: 'active', highpass: { shape: 'lr4', hz: 2200 } } },
      ],
      amplifier: base.amplifier,
      listening: base.listening,
      air: base.air,
    });
    if (!two.ok) throw new Error(two.errors.map((e) => e.message).join());
    const tweeter = two.system.ways[1];
    if (tweeter.kind !== 'driver') throw new Error('way kind');
    const list = suggestAlignments(two.system, tweeter);
    const butterworth = list.find((a) => a.qtc === 0.707)!;
    // Small 1972: Vb = Vas/((Qtc/Qts)^2 - 1), Qts with the series resistance (none here) in Qes.
    const qts = (0.7 * 2.5) / (0.7 + 2.5);
    expect(butterworth.vbL).toBeCloseTo(0.0103 / ((0.707 / qts) ** 2 - 1), 3);
    // fc = fs·sqrt(1 + alpha) = fs·Qtc/Qts for the closed box.
    expect(butterworth.fcHz).toBeCloseTo((800 * 0.707) / qts, 6);
    // Without a way named, the first driver way: the woofer.
    expect(suggestAlignments(two.system)).toEqual(suggestAlignments(two.system, two.system.ways[0] as DriverWay));
    expect(suggestAlignments(two.system)[0].vbL).toBeGreaterThan(10);
  });
});
