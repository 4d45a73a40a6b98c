// The app's way edits and per-way views: adding, removing and copying ways keeps a design valid,
// the Stress strip puts each event in its way's lane, and the charts draw each way on demand.
import { describe, expect, it } from 'vitest';
import { demoPair } from '../src/ui/demo.ts';
import { validate } from '../src/ui/engine.ts';
import { addWay, canRemoveWay, clampWay, copyWayInto, firstDriverIndex, freeName, removeWay } from '../src/ui/ways.ts';
import { eventLanes } from '../src/ui/bench/event-lanes.ts';
import { buildCharts } from '../src/ui/charts/specs.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { activeFilterOf, type DesignDoc, type DriverWayDoc } from '../src/engine/design/document.ts';
import type { StressEvent } from '../src/engine/render/index.ts';

const valid = (d: DesignDoc) => {
  const r = validate(d);
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('; '));
  return r;
};

describe('way edits', () => {
  it('adds a tweeter, a midrange and a flat band that the engine accepts, up to four ways', () => {
    const b = demoPair().b;
    const fx = activeFilterOf(b.ways[0])?.lowpass?.hz;
    const t = addWay(b, 'tweeter');
    expect(t.ways.length).toBe(3);
    const tw = t.ways[2] as DriverWayDoc;
    expect(activeFilterOf(tw)?.highpass).toEqual({ shape: 'lr4', hz: fx });
    expect(tw.box.type).toBe('sealed');
    expect(valid(t).system.ways.map((w) => w.kind)).toEqual(['driver', 'flat', 'driver']);
    const m = addWay(t, 'midrange');
    const mid = m.ways[3] as DriverWayDoc;
    // The midrange band sits below the crossover: its high-pass under its low-pass.
    expect(activeFilterOf(mid)!.highpass!.hz).toBeLessThan(activeFilterOf(mid)!.lowpass!.hz);
    expect(valid(m).system.ways.length).toBe(4);
    expect(addWay(m, 'flat')).toBe(m);
    // Names stay unique.
    expect(addWay(addWay(b, 'flat'), 'flat').ways.map((w) => w.name)).toEqual(['woofer', 'upper band', 'upper band 2', 'upper band 3']);
    expect(freeName(b, 'woofer')).toBe('woofer 2');
  });

  it('removes any way but the last one with a driver', () => {
    const a = demoPair().a;
    expect(canRemoveWay(a, 0)).toBe(false);
    expect(removeWay(a, 0)).toBe(a);
    const one = removeWay(a, 1);
    expect(one.ways.map((w) => w.name)).toEqual(['woofer']);
    valid(one);
    const two = addWay(a, 'tweeter');
    expect(canRemoveWay(two, 0)).toBe(true);
    expect(removeWay(two, 0).ways.map((w) => w.name)).toEqual(['upper band', 'tweeter']);
  });

  it('copies a way into the other design: the same name is replaced, a new one added, a full design refused', () => {
    const { a, b } = demoPair();
    const woofB = b.ways[0];
    const replaced = copyWayInto(a, woofB)!;
    expect(replaced.index).toBe(0);
    expect(replaced.doc.ways[0]).toEqual(woofB);
    expect(replaced.doc.ways[0]).not.toBe(woofB);
    expect(replaced.doc.ways[1]).toBe(a.ways[1]);
    const tweeterB = addWay(b, 'tweeter').ways[2];
    const added = copyWayInto(a, tweeterB)!;
    expect(added.index).toBe(2);
    valid(added.doc);
    const full = addWay(addWay(a, 'tweeter'), 'midrange');
    expect(copyWayInto(full, { ...tweeterB, name: 'other' })).toBeNull();
    // A flat way copied over the only driver way would leave no driver: refused.
    expect(copyWayInto(removeWay(a, 1), { ...a.ways[1], name: 'woofer' })).toBeNull();
  });

  it('keeps a remembered way index within the design', () => {
    const a = demoPair().a;
    expect(clampWay(a, undefined)).toBe(firstDriverIndex(a));
    expect(clampWay(a, 1)).toBe(1);
    expect(clampWay(a, 3)).toBe(0);
    expect(clampWay(a, -1)).toBe(0);
  });
});

describe('stress lanes', () => {
  const ev = (kind: StressEvent['kind'], start: number, way?: string | null): StressEvent =>
    ({ kind, start_s: start, end_s: start + 0.1, peak: 1, unit: 'mm', limit: 0.5, ...(way === undefined ? {} : { way }) }) as StressEvent;

  it('puts each event in its way lane; events naming no way go to the first way', () => {
    const lanes = eventLanes(
      { a: [ev('excursion', 1), ev('excursion', 2, 'tweeter'), ev('distortion', 3, null)], b: [ev('port-speed', 4, 'woofer')] },
      { a: ['woofer', 'tweeter'], b: ['woofer'] },
    );
    expect(lanes.map((l) => `${l.slot}:${l.way}:${l.events.map((e) => e.start_s).join(',')}`)).toEqual([
      'a:woofer:1,3',
      'a:tweeter:2',
      'b:woofer:4',
    ]);
  });

  it('gives a way named only by its events a lane of its own, and every listed way a lane even when quiet', () => {
    const lanes = eventLanes({ a: [ev('xlim', 1, 'mid')], b: [] }, { a: ['woofer'], b: ['woofer', 'tweeter'] });
    expect(lanes.map((l) => `${l.slot}:${l.way}:${l.events.length}`)).toEqual(['a:woofer:0', 'a:mid:1', 'b:woofer:0', 'b:tweeter:0']);
  });
});

describe('charts per way', () => {
  const model = (d: DesignDoc) => {
    const r = valid(d);
    return { analysis: analyze(r.system, {}), system: r.system };
  };
  const b = addWay(demoPair().b, 'tweeter');
  const pair = { a: model(demoPair().a), b: model(b) };

  it('draws the sum alone by default and each way beside it on demand', () => {
    const plain = buildCharts(pair).find((c) => c.id === 'spl')!;
    expect(plain.series.filter((s) => s.role === 'b-way')).toEqual([]);
    const spl = buildCharts(pair, { showWays: true }).find((c) => c.id === 'spl')!;
    expect(spl.series.filter((s) => s.role === 'b-way').map((s) => s.label)).toEqual(['B woofer', 'B upper band', 'B tweeter']);
    expect(spl.series.filter((s) => s.role === 'a-way').map((s) => s.label)).toEqual(['A woofer', 'A upper band']);
    // The widest grid is the charts' (B's, analysed up to its tweeter). The B line is the analysis's
    // sum, unchanged; each way line is that way as it enters the sum.
    const an = pair.b.analysis as unknown as { sum: { curves: { splDb: Float64Array; ways: { name: string; splDb: Float64Array }[] } } };
    expect(spl.freqHz).toBe(pair.b.analysis.curves.freqHz);
    expect(spl.series.find((s) => s.role === 'b')!.values).toBe(an.sum.curves.splDb);
    expect(spl.series.find((s) => s.label === 'B tweeter')!.values).toBe(an.sum.curves.ways[2].splDb);
    // A's line is on B's grid where A was analysed, and a gap above A's own grid.
    const fa = pair.a.analysis.curves.freqHz;
    const aLine = spl.series.find((s) => s.role === 'a')!.values!;
    const top = fa[fa.length - 1];
    for (let i = 0; i < spl.freqHz.length; i++) {
      const f = spl.freqHz[i];
      if (f > top * 1.05) expect(Number.isNaN(aLine[i])).toBe(true);
      else if (f < top / 1.05) expect(Number.isFinite(aLine[i])).toBe(true);
    }
    // The excursion chart adds the driver ways only (a flat band has no cone).
    const ex = buildCharts(pair, { showWays: true }).find((c) => c.id === 'excursion')!;
    expect(ex.series.filter((s) => s.role === 'b-way').map((s) => s.label)).toEqual(['B woofer', 'B tweeter']);
  });
});
