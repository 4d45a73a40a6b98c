// A two-way active design: the summed SPL of `analyze` against our own complex sum of the two
// ways, built here from the drivers' Thiele/Small parameters and the filters' published forms:
//  - closed box (Small, "Closed-Box Loudspeaker Systems", JAES 20, 1972; Le neglected as there):
//    p(s) = p_pb·s²/(s² + s·wc/Qtc + wc²), wc = ws·sqrt(1 + alpha), Qtc = Qts'·sqrt(1 + alpha),
//    Qes' = Qes·(Re + Rs)/Re, and the passband p_pb = rho·Sd·Bl·e/((Re + Rs)·Mms·Omega·r) with
//    Cms = Vas/(rho c² Sd²), Mms = 1/(ws² Cms), Bl = sqrt(ws·Mms·Re/Qes);
//  - Linkwitz-Riley 4th order (Linkwitz, JAES 24(1), 1976): the square of the 2nd-order
//    Butterworth, LP = [w0²/(s² + sqrt2·w0·s + w0²)]², HP = [s²/(s² + sqrt2·w0·s + w0²)]².
import { describe, expect, it } from 'vitest';
import { analyze } from '../src/engine/response/analyze.ts';
import type { DesignDoc } from '../src/engine/design/document.ts';
import type { DriverWay } from '../src/engine/system.ts';
import { AIR_20C, system } from './helpers/designs.ts';

type C = [number, number];
const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const div = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};
const db = (a: C) => 20 * Math.log10(Math.hypot(a[0], a[1]) / 20e-6);

// Our invented drivers: the 6.5 inch woofer of the examples (Le 0 so Small's form is exact), and a
// 25 mm dome tweeter with a closed back chamber, about 3 dB more sensitive than the woofer.
const wooferTS = { fs_hz: 42, qes: 0.42, qms: 3.6, vas_l: 24, re_ohm: 5.6, le_mh: 0, sd_cm2: 132, xmax_mm: 5.5, xlim_mm: 10, pe_w: 60 };
const tweeterTS = { fs_hz: 800, qes: 0.7, qms: 2.5, vas_l: 0.0103, re_ohm: 5, le_mh: 0, sd_cm2: 7, xmax_mm: 0.3, xlim_mm: 0.6, pe_w: 10 };
const fx = 2200;
const rs = 0.15;

const twoWay: DesignDoc = {
  format: 'preheard-design',
  version: 2,
  name: 'two-way test',
  ways: [
    {
      kind: 'driver',
      name: 'woofer',
      driver: wooferTS,
      box: { type: 'sealed', vb_l: 14 },
      filter: { type: 'active', lowpass: { shape: 'lr4', hz: fx } },
    },
    {
      kind: 'driver',
      name: 'tweeter',
      driver: tweeterTS,
      box: { type: 'sealed', vb_l: 0.03 },
      filter: { type: 'active', highpass: { shape: 'lr4', hz: fx }, gain_db: -3 },
    },
  ],
  amplifier: { power_w: 100, load_ohm: 8, rs_ohm: rs },
  listening: { distance_m: 2, space: 'half' },
  air: AIR_20C,
} as DesignDoc;

/** Small's closed-box pressure at the seat per amplifier volt, from the T/S values alone. */
function closedBox(ts: typeof wooferTS, vbL: number, rho: number, c: number, distance: number, omega: number) {
  const ws = 2 * Math.PI * ts.fs_hz;
  const sd = ts.sd_cm2 / 1e4;
  const cms = ts.vas_l / 1000 / (rho * c * c * sd * sd);
  const mms = 1 / (ws * ws * cms);
  const bl = Math.sqrt((ws * mms * ts.re_ohm) / ts.qes);
  const passband = (rho * sd * bl) / ((ts.re_ohm + rs) * mms * omega * distance);
  const alpha = ts.vas_l / vbL;
  const qesRs = (ts.qes * (ts.re_ohm + rs)) / ts.re_ohm;
  const qtc = ((qesRs * ts.qms) / (qesRs + ts.qms)) * Math.sqrt(1 + alpha);
  const wc = ws * Math.sqrt(1 + alpha);
  return (w: number): C => div([-passband * w * w, 0], [wc * wc - w * w, (w * wc) / qtc]);
}

function lr4(w: number, w0: number, highPass: boolean): C {
  const bw2 = div(highPass ? [-w * w, 0] : [w0 * w0, 0], [w0 * w0 - w * w, Math.SQRT2 * w0 * w]);
  return mul(bw2, bw2);
}

describe('a two-way active design (woofer + closed-back tweeter, LR4 at 2.2 kHz, tweeter padded 3 dB)', () => {
  const s = system(twoWay);
  const a = analyze(s);
  const { rho, c } = s.air;
  const woofer = closedBox(wooferTS, 14, rho, c, 2, 2 * Math.PI);
  const tweeter = closedBox(tweeterTS, 0.03, rho, c, 2, 2 * Math.PI);
  const pad = 10 ** (-3 / 20);
  const reference = (f: number): C => {
    const w = 2 * Math.PI * f;
    const low = mul(woofer(w), lr4(w, 2 * Math.PI * fx, false));
    const high = mul(tweeter(w), lr4(w, 2 * Math.PI * fx, true));
    return [(low[0] + pad * high[0]) * a.driveV, (low[1] + pad * high[1]) * a.driveV];
  };

  it('builds the boxes as entered (no fill, no leakage) so the reference holds', () => {
    const boxes = s.ways.map((w) => (w as DriverWay).box);
    expect(boxes[0].vb).toBeCloseTo(0.014, 15);
    expect(boxes[1].vb).toBeCloseTo(0.00003, 15);
    expect(boxes.every((b) => b.type === 'sealed' && b.ral === Infinity)).toBe(true);
  });

  it('has a tweeter about 3 dB more sensitive than the woofer', () => {
    const [w, t] = a.ways;
    expect(t.figures.sensitivityDb - w.figures.sensitivityDb).toBeCloseTo(3, 0);
    expect(Math.abs(t.figures.sensitivityDb - w.figures.sensitivityDb - 3)).toBeLessThan(0.3);
    // Its way passband carries the pad: within 0.3 dB of the woofer's.
    expect(Math.abs(t.figures.passbandSplDb - w.figures.passbandSplDb)).toBeLessThan(0.3);
  });

  it('sums to our own complex sum of the two ways within 0.1 dB from 10 Hz to 20 kHz', () => {
    const { freqHz, splDb } = a.sum.curves;
    expect(freqHz[0]).toBeCloseTo(10, 9);
    expect(freqHz.at(-1)).toBeCloseTo(20000, 6);
    let worst = 0;
    for (let k = 0; k < freqHz.length; k++) worst = Math.max(worst, Math.abs(splDb[k] - db(reference(freqHz[k]))));
    expect(worst).toBeLessThan(0.1);
    // The sum is flat through the crossover where both drivers are in their passbands.
    const at = (f: number) => splDb[freqHz.findIndex((x) => x >= f)];
    expect(Math.abs(at(fx) - at(600))).toBeLessThan(1);
  });

  it('shows each way through its own filter: the woofer -6 dB and the tweeter -6 dB less its pad at the crossover', () => {
    const [w, t] = a.ways;
    const k = w.curves.freqHz.findIndex((f) => f >= fx);
    const f = w.curves.freqHz[k];
    const wv = 2 * Math.PI * f;
    expect(w.curves.splDb[k]).toBeCloseTo(db(mul(woofer(wv), lr4(wv, 2 * Math.PI * fx, false))) + 20 * Math.log10(a.driveV), 6);
    const tw = mul(tweeter(wv), lr4(wv, 2 * Math.PI * fx, true));
    expect(t.curves.splDb[k]).toBeCloseTo(db([tw[0] * pad, tw[1] * pad]) + 20 * Math.log10(a.driveV), 6);
  });

  it('keeps the woofer as the top-level way, reports the sum f3 near the woofer f3, and one planned drive for both', () => {
    expect(a.way.name).toBe('woofer');
    expect(a.figures).toBe(a.ways[0].figures);
    expect(a.ways.map((w) => w.way.name)).toEqual(['woofer', 'tweeter']);
    expect(Math.abs(a.sum.figures.f3Hz / a.figures.f3Hz - 1)).toBeLessThan(0.01);
    expect(a.ways[1].figures.plannedVoltsRms).toBe(a.sum.figures.plannedVoltsRms);
    // The tweeter's low end is set by its high-pass: its f3 lies above the crossover corner.
    expect(a.ways[1].figures.f3Hz).toBeGreaterThan(fx);
  });

  it('places each way in the sum with its polarity, its filter delay and its acoustic offset (a delay of offset/c)', () => {
    const moved = structuredClone(twoWay);
    Object.assign(moved.ways[1], { polarity: -1, offset_mm: 30 });
    Object.assign(moved.ways[1].filter!, { delay_ms: 0.05 });
    const b = analyze(system(moved));
    const lag = 0.03 / c + 0.00005;
    let worst = 0;
    const { freqHz, splDb, groupDelayMs } = b.sum.curves;
    for (let k = 0; k < freqHz.length; k++) {
      const w = 2 * Math.PI * freqHz[k];
      const low = mul(woofer(w), lr4(w, 2 * Math.PI * fx, false));
      const high = mul(mul(tweeter(w), lr4(w, 2 * Math.PI * fx, true)), [-pad * Math.cos(w * lag), pad * Math.sin(w * lag)]);
      worst = Math.max(worst, Math.abs(splDb[k] - db([(low[0] + high[0]) * b.driveV, (low[1] + high[1]) * b.driveV])));
    }
    expect(worst).toBeLessThan(0.1);
    // Far above the crossover the sum is the tweeter alone: the way's own curve carries its filter's
    // delay, the sum adds the offset's.
    const k = freqHz.findIndex((f) => f >= 15000);
    expect(b.ways[1].curves.groupDelayMs[k] - a.ways[1].curves.groupDelayMs[k]).toBeCloseTo(0.05, 6);
    expect(groupDelayMs[k] - b.ways[1].curves.groupDelayMs[k]).toBeCloseTo((0.03 / c) * 1000, 3);
  });
});
