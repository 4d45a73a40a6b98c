// Passive ladder networks in the small-signal model, checked against circuit theory written here
// independently of the engine's two-port code (voltage dividers, series and parallel impedances):
//  - a second-order Butterworth low-pass (series L, shunt C) into a resistor R with L = sqrt2·R/w0,
//    C = 1/(sqrt2·R·w0) has H(s) = 1/(1 + sqrt2·s/w0 + s²/w0²) (the textbook LC ladder, e.g.
//    Williams & Taylor, Electronic Filter Design Handbook, normalised Butterworth ladder);
//  - a way's transfer with the driver's full impedance (coil with Le, motional impedance in its box).
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseDesign } from '../src/engine/design/validate.ts';
import type { DesignDoc } from '../src/engine/design/document.ts';
import type { DriverWay, LadderPart, SpeakerSystem } from '../src/engine/system.ts';
import { ladderInputImpedance, ladderStates, ladderThevenin, partPower } from '../src/engine/response/ladder.ts';
import { respond } from '../src/engine/response/frequency.ts';
import { analyze } from '../src/engine/response/analyze.ts';

type C = [number, number];
const add = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]];
const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const div = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};
const par = (a: C, b: C): C => div(mul(a, b), add(a, b));
const dB = (a: C) => 20 * Math.log10(Math.hypot(a[0], a[1]));
const deg = (a: C) => (Math.atan2(a[1], a[0]) * 180) / Math.PI;
const of = (z: { re: number; im: number }): C => [z.re, z.im];

const part = (at: LadderPart['at'], p: Partial<LadderPart> & Pick<LadderPart, 'part'>): LadderPart => ({
  at,
  r: 0,
  l: 0,
  c: 0,
  dcr: 0,
  ratedW: 0,
  ...p,
});

function parsed(doc: unknown): SpeakerSystem {
  const r = parseDesign(doc);
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('; '));
  return r.system;
}

const example = (name: string) => JSON.parse(readFileSync(`public/examples/${name}.json`, 'utf8')) as DesignDoc;

describe('ladder two-port', () => {
  it('a second-order Butterworth LC low-pass into a resistor is the textbook transfer', () => {
    const R = 8;
    const f0 = 2000;
    const w0 = 2 * Math.PI * f0;
    const ladder = [part('series', { part: 'l', l: (Math.SQRT2 * R) / w0 }), part('shunt', { part: 'c', c: 1 / (Math.SQRT2 * R * w0) })];
    for (const f of [100, 700, 2000, 3500, 12000]) {
      const w = 2 * Math.PI * f;
      const th = ladderThevenin(ladder, w, 0);
      const h = div(mul(of(th.gain), [R, 0]), add(of(th.z), [R, 0]));
      const s: C = [0, w / w0];
      const ref = div([1, 0], add(add([1, 0], [Math.SQRT2 * s[0], Math.SQRT2 * s[1]]), mul(s, s)));
      expect(dB(h)).toBeCloseTo(dB(ref), 9);
      expect(deg(h)).toBeCloseTo(deg(ref), 7);
    }
    // At f0 the Butterworth response is 3.01 dB down.
    const th = ladderThevenin(ladder, w0, 0);
    expect(dB(div(mul(of(th.gain), [R, 0]), add(of(th.z), [R, 0])))).toBeCloseTo(-10 * Math.log10(2), 9);
  });

  it('the input impedance and each part against series and parallel sums; the heat adds up to the input power', () => {
    const ladder = [
      part('series', { part: 'l', l: 0.6e-3, dcr: 0.3 }),
      part('shunt', { part: 'c', c: 8e-6 }),
      part('series', { part: 'r', r: 1.5 }),
      part('shunt', { part: 'rc', r: 6.8, c: 12e-6 }),
      part('series', { part: 'lc-parallel', l: 0.2e-3, c: 20e-6, dcr: 0.1, r: 4 }),
      part('shunt', { part: 'rlc', r: 3, l: 1e-3, c: 30e-6, dcr: 0.2 }),
    ];
    const load: C = [6, 2];
    for (const f of [50, 900, 2500, 8000]) {
      const w = 2 * Math.PI * f;
      const zl = (l: number, dcr: number): C => [dcr, w * l];
      const zc = (c: number): C => [0, -1 / (w * c)];
      // Folded from the load back towards the amplifier.
      let z = load;
      z = par(z, add(add([3, 0], zl(1e-3, 0.2)), zc(30e-6)));
      const tank: C = div([1, 0], add(add(div([1, 0], zl(0.2e-3, 0.1)), div([1, 0], zc(20e-6))), [1 / 4, 0]));
      z = add(z, tank);
      z = par(z, add([6.8, 0], zc(12e-6)));
      z = add(z, [1.5, 0]);
      z = par(z, zc(8e-6));
      z = add(z, zl(0.6e-3, 0.3));
      const zin = of(ladderInputImpedance(ladder, w, { re: load[0], im: load[1] }));
      expect(zin[0]).toBeCloseTo(z[0], 9);
      expect(zin[1]).toBeCloseTo(z[1], 9);
      // 1 V at the input: the driver's current from the Thevenin source, then every part's heat.
      const th = ladderThevenin(ladder, w, 0);
      const i2 = div(of(th.gain), add(of(th.z), load));
      const v2 = mul(i2, load);
      const states = ladderStates(ladder, w, { re: v2[0], im: v2[1] }, { re: i2[0], im: i2[1] });
      const heat = states.reduce((sum, st, k) => sum + partPower(ladder[k], w, st), 0);
      const inPower = div([1, 0], zin)[0];
      expect(heat + (i2[0] ** 2 + i2[1] ** 2) * load[0]).toBeCloseTo(inPower, 10);
      // The first part carries the amplifier's current.
      const iin = div([1, 0], zin);
      expect(states[0].current.re).toBeCloseTo(iin[0], 10);
      expect(states[0].current.im).toBeCloseTo(iin[1], 10);
    }
  });
});

describe('a passive way with its driver', () => {
  const sys = parsed(example('bookshelf-two-way-passive'));
  const direct = (way: DriverWay): DriverWay => ({ ...way, network: undefined });

  for (const k of [0, 1]) {
    it(`${k === 0 ? 'woofer' : 'tweeter'}: the transfer through the network loading the driver's full impedance, within 0.05 dB and 0.5°`, () => {
      const way = sys.ways[k] as DriverWay;
      const rs = sys.amplifier.rs;
      for (const f of [60, 300, 1000, 2200, 4000, 9000, 16000]) {
        const w = 2 * Math.PI * f;
        // The driver's own terminal impedance (coil with Le, motional in its box), from the way alone.
        const zd = of(respond(sys, direct(way), f, 1).impedance);
        // Our own divider: fold the ladder from the driver back to the amplifier, then divide down.
        let z = zd;
        let h: C = [1, 0];
        for (let j = way.network!.length - 1; j >= 0; j--) {
          const p = way.network![j];
          const zl: C = [p.dcr, w * p.l];
          const zc: C = [0, -1 / (w * p.c)];
          const zp: C =
            p.part === 'l' ? zl : p.part === 'c' ? zc : p.part === 'r' ? [p.r, 0] : p.part === 'rc' ? add([p.r, 0], zc) : [Number.NaN, 0];
          if (p.at === 'series') {
            h = mul(h, div(z, add(z, zp)));
            z = add(z, zp);
          } else z = par(z, zp);
        }
        h = mul(h, div(z, add(z, [rs, 0])));
        const r = respond(sys, way, f, 1);
        const t = of(r.terminalVoltage);
        expect(Math.abs(dB(t) - dB(h))).toBeLessThan(0.05);
        expect(Math.abs(deg(div(t, h)))).toBeLessThan(0.5);
        // The pressure follows the terminal voltage: the way alone at those volts.
        const alone = respond(sys, direct(way), f, 1);
        const ratio = div(of(r.pressure), of(alone.pressure));
        const expected = div(h, div(zd, add(zd, [rs, 0])));
        expect(Math.abs(dB(ratio) - dB(expected))).toBeLessThan(0.05);
        expect(Math.abs(deg(div(ratio, expected)))).toBeLessThan(0.5);
      }
    });
  }

  it('analyze: the amplifier load of both networks together, each part at the planned level, a level near the woofer alone', () => {
    const a = analyze(sys);
    const min = a.sum.figures.passiveLoadMinOhm!;
    expect(min).toBeGreaterThan(3);
    expect(min).toBeLessThan(8);
    const k = a.sum.curves.freqHz.findIndex((f) => f >= a.sum.figures.passiveLoadMinHz!);
    // The two ways' loads in parallel, from each way's own curve.
    const zw = a.ways[0].curves.impedanceOhm[k];
    const zt = a.ways[1].curves.impedanceOhm[k];
    expect(min).toBeLessThanOrEqual(Math.min(zw, zt) + 1e-9);
    expect(a.ways[1].figures.parts!.length).toBe(4);
    // The tweeter's series pad resistor takes more heat than its shunt inductor's winding.
    const [, coil, pad] = a.ways[1].figures.parts!;
    expect(pad.peakPowerW).toBeGreaterThan(coil.peakPowerW);
    expect(pad.ratedW).toBe(10);
    // Well below the crossover the woofer's network passes the band nearly untouched (its winding's
    // loss, a slight lift where the inductor starts to resonate with the capacitor).
    const wooferAlone = analyze({ ...sys, ways: [direct(sys.ways[0] as DriverWay)] });
    const at200 = a.ways[0].curves.freqHz.findIndex((f) => f >= 200);
    const loss = wooferAlone.ways[0].curves.splDb[at200] - a.ways[0].curves.splDb[at200];
    expect(Math.abs(loss)).toBeLessThan(0.6);
  });
});

describe('passive network documents', () => {
  const base = example('bookshelf-two-way-passive');
  const withLadder = (ladder: unknown, k = 1) => {
    const d = structuredClone(base) as unknown as { ways: { filter: unknown }[] };
    d.ways[k].filter = { type: 'passive', ladder };
    return parseDesign(d);
  };

  it('refuses impossible parts with a message naming the field', () => {
    const bad = withLadder([{ at: 'series', part: 'c', uf: -4 }]);
    expect(bad.ok).toBe(false);
    expect(!bad.ok && bad.errors[0].path).toBe('ways[1].filter.ladder[0].uf');
    expect(!bad.ok && bad.errors[0].message).toMatch(/µF/);
    const kind = withLadder([{ at: 'series', part: 'x' }]);
    expect(!kind.ok && kind.errors[0].message).toMatch(/part must be one of/);
    const place = withLadder([{ at: 'across', part: 'r', ohm: 2 }]);
    expect(!place.ok && place.errors[0].message).toMatch(/"series" or "shunt"/);
    const nan = withLadder([{ at: 'series', part: 'l', mh: Number.NaN }]);
    expect(nan.ok).toBe(false);
    const long = withLadder(Array.from({ length: 17 }, () => ({ at: 'series', part: 'r', ohm: 1 })));
    expect(!long.ok && long.errors[0].message).toMatch(/at most 16 parts/);
  });

  it('a flat band cannot take a passive network', () => {
    const d = structuredClone(base) as unknown as { ways: unknown[] };
    d.ways[1] = { kind: 'flat', name: 'top', filter: { type: 'passive', ladder: [] } };
    const r = parseDesign(d);
    expect(r.ok).toBe(false);
  });

  it('the third-order example parses and its tweeter is no bass way', () => {
    const r = parseDesign(example('bookshelf-two-way-passive-3rd'));
    expect(r.ok).toBe(true);
    expect(r.ok && r.warnings.filter((w) => w.path.startsWith('ways[1].driver.fs'))).toEqual([]);
  });
});

describe('part ratings', () => {
  it('a resistor rated below its heat at the planned level is named in a warning', () => {
    const d = example('bookshelf-two-way-passive') as unknown as { ways: { filter: { ladder: { w?: number }[] } }[] };
    // The tweeter's series pad takes about 1.8 W at the planned level: rate it 1 W.
    d.ways[1].filter.ladder[2].w = 1;
    const a = analyze(parsed(d));
    const w = a.warnings.find((x) => x.path === 'ways[1].filter.ladder[2].w');
    expect(w?.message).toMatch(/over its rating of 1 W/);
    expect(analyze(sys()).warnings.some((x) => x.path.includes('ladder'))).toBe(false);
  });
});

const sys = () => parsed(example('bookshelf-two-way-passive'));
