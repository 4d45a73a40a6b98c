import { describe, expect, it } from 'vitest';
import { readFileSync, readdirSync } from 'node:fs';
import { migrate, parseDesign } from '../src/engine/design/validate.ts';
import type { DesignDoc } from '../src/engine/design/document.ts';
import type { DriverWay } from '../src/engine/system.ts';
import { AIR_20C, doc, type V1Doc } from './helpers/designs.ts';
import { tweeterWay } from './helpers/tweeter.ts';

const paths = (r: ReturnType<typeof parseDesign>) => (r.ok ? [] : r.errors.map((e) => e.path));
const driver = { fs_hz: 40, qes: 0.4, qms: 4, vas_l: 30 };

/** A version 2 document with one driver way (our own test values). */
function doc2(d: Record<string, unknown>, box: Record<string, unknown>, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    format: 'preheard-design',
    version: 2,
    name: 'test',
    ways: [{ kind: 'driver', name: 'woofer', driver: { re_ohm: 6, le_mh: 0, sd_cm2: 130, xmax_mm: 5, xlim_mm: 10, pe_w: 50, ...d }, box }],
    amplifier: { power_w: 100, load_ohm: 8, rs_ohm: 0 },
    listening: { distance_m: 1, space: 'half' },
    air: AIR_20C,
    ...extra,
  };
}

describe('design document validation', () => {
  it('accepts every shipped example, as a version 2 design', () => {
    for (const name of readdirSync('public/examples')) {
      const r = parseDesign(readFileSync(`public/examples/${name}`, 'utf8'));
      expect(r.ok, name).toBe(true);
      if (r.ok) expect(r.design.version).toBe(2);
    }
  });

  it('reports every problem at once, each naming the field, the value and the allowed range', () => {
    const bad = doc2(
      { ...driver, fs_hz: -5, sd_cm2: 'NaN' },
      { type: 'sealed', vb_l: 1e6 },
      { listening: { distance_m: 1, space: 'moon' } },
    );
    const r = parseDesign(bad);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(paths(r)).toEqual(
      expect.arrayContaining(['ways[0].driver.fs_hz', 'ways[0].driver.sd_cm2', 'ways[0].box.vb_l', 'listening.space']),
    );
    const fs = r.errors.find((e) => e.path === 'ways[0].driver.fs_hz')!;
    expect(fs.message).toMatch(/from 1 to 5000 Hz, got -5/);
  });

  it('names missing and unknown fields', () => {
    const d = doc2(driver, { type: 'sealed', vb_l: 10 }) as { ways: { driver: Record<string, unknown> }[] };
    delete d.ways[0].driver.re_ohm;
    d.ways[0].driver.colour = 'red';
    const r = parseDesign(d);
    if (r.ok) throw new Error('should fail');
    expect(r.errors).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ path: 'ways[0].driver.re_ohm', message: 'is required' }),
        expect.objectContaining({ path: 'ways[0].driver.colour', message: 'is not a field of this design format' }),
      ]),
    );
  });

  it('names array elements by index', () => {
    const r = parseDesign(doc2(driver, { type: 'vented', vb_l: 20, fb_hz: 40, ports: [{ diameter_cm: 6 }, { diameter_cm: 0 }] }));
    expect(paths(r)).toContain('ways[0].box.ports[1].diameter_cm');
  });

  it('refuses bad JSON, non-objects, foreign formats and newer versions with one clear message', () => {
    expect(parseDesign('{"format":')).toMatchObject({
      ok: false,
      errors: [{ path: '', message: expect.stringMatching(/not valid JSON/) }],
    });
    expect(parseDesign('[1,2]')).toMatchObject({ ok: false, errors: [{ message: 'a design must be a JSON object' }] });
    expect(parseDesign({ format: 'something-else' })).toMatchObject({ ok: false, errors: [{ path: 'format' }] });
    expect(parseDesign({ ...doc2(driver, { type: 'sealed', vb_l: 10 }), version: 7 })).toMatchObject({
      ok: false,
      errors: [{ path: 'version', message: expect.stringMatching(/newer/) }],
    });
  });

  it('refuses a port that cannot reach the tuning and a port longer than the box holds', () => {
    const tiny = parseDesign(doc2(driver, { type: 'vented', vb_l: 100, fb_hz: 200, ports: [{ diameter_cm: 1 }] }));
    expect(tiny.ok).toBe(false);
    if (!tiny.ok) expect(tiny.errors[0].message).toMatch(/cannot tune to 200 Hz/);
    const huge = parseDesign(doc2(driver, { type: 'vented', vb_l: 2, fb_hz: 20, ports: [{ diameter_cm: 10 }] }));
    expect(huge.ok).toBe(false);
    if (!huge.ok) expect(huge.errors.map((e) => e.message).join(' ')).toMatch(/larger than the 2 l box/);
  });

  it('warns when the port must be longer than the box is deep', () => {
    const r = parseDesign(doc2(driver, { type: 'vented', vb_l: 15, fb_hz: 30, ports: [{ diameter_cm: 8 }] }));
    expect(r.ok).toBe(true);
    expect(r.warnings.map((w) => w.message).join(' ')).toMatch(/longer than the box's likely inner depth/);
  });

  it('refuses a box smaller than the driver itself', () => {
    const r = parseDesign(doc2({ ...driver, sd_cm2: 500 }, { type: 'sealed', vb_l: 1 }));
    expect(paths(r)).toContain('ways[0].box.vb_l');
  });

  it('warns outside the sane travel of bass drivers rather than refusing (common practice, no source: a few mm at home, about 25 mm for large PA drivers)', () => {
    const r = parseDesign(doc2({ ...driver, xmax_mm: 40, xlim_mm: 60 }, { type: 'sealed', vb_l: 20 }));
    expect(r.ok).toBe(true);
    expect(r.warnings.find((w) => w.path === 'ways[0].driver.xmax_mm')?.message).toMatch(/beyond even large PA bass drivers/);
  });

  it('requires Xlim beyond Xmax, and a crossover frequency for a version 1 crossover', () => {
    expect(paths(parseDesign(doc2({ ...driver, xmax_mm: 5, xlim_mm: 4 }, { type: 'sealed', vb_l: 20 })))).toContain(
      'ways[0].driver.xlim_mm',
    );
    const d = doc(driver, { type: 'sealed', vb_l: 20 });
    d.crossover = { type: 'lr4' };
    expect(paths(parseDesign(d))).toEqual(['crossover.fx_hz']);
  });

  it('accepts a driver given only by its mechanical parameters', () => {
    const r = parseDesign(doc2({ bl_tm: 7, mms_g: 20, cms_mm_per_n: 0.8, rms_kg_s: 1.5 }, { type: 'sealed', vb_l: 20 }));
    expect(r.ok).toBe(true);
    if (r.ok) expect((r.system.ways[0] as DriverWay).driver.fs).toBeCloseTo(1 / (2 * Math.PI * Math.sqrt(0.02 * 0.8e-3)), 9);
  });
});

describe('design version 2: ways', () => {
  const twoWay = doc2(driver, { type: 'sealed', vb_l: 20 }, {});
  const ways = twoWay.ways as Record<string, unknown>[];
  ways[0].filter = { type: 'active', lowpass: { shape: 'lr4', hz: 2200 } };
  ways[0].count = 2;
  ways[0].wiring = 'series';
  const tweeter = tweeterWay();
  ways.push({ ...tweeter, filter: { ...tweeter.filter!, delay_ms: 0.1 }, polarity: -1, offset_mm: 20 });

  it('builds each way in SI: the filter gain linear, the delay in s, the offset in m, the drivers of a way combined', () => {
    const r = parseDesign(twoWay);
    if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('\n'));
    const [w, t] = r.system.ways as DriverWay[];
    expect(w.count).toBe(2);
    // Two in series: twice the resistance and force factor, twice the moving mass and area.
    expect(w.driver.re / w.unit.re).toBeCloseTo(2, 12);
    expect(w.driver.bl / w.unit.bl).toBeCloseTo(2, 12);
    expect(w.driver.sd / w.unit.sd).toBeCloseTo(2, 12);
    expect(t.filter).toEqual({ type: 'active', highpass: { shape: 'lr4', hz: 2200 }, lowpass: null, gain: 10 ** (-3 / 20), delay: 0.0001 });
    expect(t.polarity).toBe(-1);
    expect(t.offset).toBeCloseTo(0.02, 12);
  });

  it('reads its own output back unchanged', () => {
    const r = parseDesign(twoWay);
    if (!r.ok) throw new Error('should parse');
    const again = parseDesign(JSON.parse(JSON.stringify(r.design)));
    expect(again.ok && again.design).toEqual(r.design);
  });

  it('names the way of a problem, and refuses no ways, more than four, a way list without a driver and an unknown filter shape', () => {
    const badShape = structuredClone(twoWay) as { ways: { filter: { highpass?: { shape: string } } }[] };
    badShape.ways[1].filter.highpass!.shape = 'lr6';
    expect(paths(parseDesign(badShape))).toContain('ways[1].filter.highpass.shape');
    expect(paths(parseDesign({ ...twoWay, ways: [] }))).toContain('ways');
    expect(paths(parseDesign({ ...twoWay, ways: [ways[0], ways[1], ways[0], ways[1], ways[0]] }))).toContain('ways');
    expect(paths(parseDesign({ ...twoWay, ways: [{ kind: 'flat', name: 'upper band' }] }))).toContain('ways');
  });
});

describe('version 1 -> 2 migration', () => {
  // A first-version document with every optional field set (our own values).
  const full: V1Doc = {
    format: 'preheard-design',
    version: 1,
    name: 'every field',
    notes: 'invented for this test',
    driver: {
      name: 'test woofer',
      fs_hz: 38,
      qes: 0.45,
      qms: 3.8,
      vas_l: 28,
      re_ohm: 5.8,
      le_mh: 0.5,
      sd_cm2: 133,
      xmax_mm: 5,
      xlim_mm: 9,
      pe_w: 55,
      bl_rel_per_mm: [-0.01, -0.004],
      kms_rel_per_mm: [0, 0.01],
      le_rel_per_mm: [-0.02],
      rtv_k_per_w: 4,
      ctv_j_per_k: 5,
      rtm_k_per_w: 2,
      ctm_j_per_k: 300,
      coil_material: 'aluminium',
      coil_max_c: 180,
    },
    box: {
      type: 'vented',
      vb_l: 22,
      fb_hz: 38,
      ql: 9,
      ports: [{ width_cm: 8, height_cm: 3, count: 2, outer_end: 'free', inner_end: 'flanged' }],
    },
    amplifier: { power_w: 120, load_ohm: 4, rs_ohm: 0.2, clip: 'soft' },
    crossover: { type: 'lr2', fx_hz: 1800, highpass_hz: 22 },
    listening: {
      distance_m: 2.5,
      space: 'quarter',
      channels: 'mono-sum',
      level: { mode: 'volts', volts_fs: 12 },
      room_gain_hz: 35,
      baffle_width_cm: 0,
    },
    air: { temperature_c: 24, pressure_kpa: 98 },
  };

  /** Every leaf of a JSON value with its path. */
  function leaves(value: unknown, path: string[] = []): [string[], unknown][] {
    if (value === null || typeof value !== 'object') return [[path, value]];
    return Object.entries(value).flatMap(([k, x]) => leaves(x, [...path, k]));
  }
  const at = (value: unknown, path: (string | number)[]) => path.reduce<unknown>((x, k) => (x as Record<string, unknown>)?.[k], value);

  for (const type of ['none', 'lr2', 'lr4', 'lr8'] as const) {
    it(`keeps every field of a version 1 design with a ${type} crossover, each at its new place`, () => {
      const v1 = { ...full, crossover: type === 'none' ? { type, highpass_hz: 22 } : { ...full.crossover, type } };
      const migrated = migrate(structuredClone(v1) as unknown as Record<string, unknown>);
      if ('issue' in migrated) throw new Error(migrated.issue.message);
      const v2 = migrated.doc;
      for (const [path, value] of leaves(v1)) {
        const [head, ...rest] = path;
        if (head === 'version') expect(at(v2, ['version'])).toBe(2);
        else if (head === 'driver' || head === 'box') expect(at(v2, ['ways', 0, head, ...rest]), path.join('.')).toEqual(value);
        else if (head === 'crossover' && rest[0] === 'type') continue;
        else if (head === 'crossover' && rest[0] === 'fx_hz') {
          expect(at(v2, ['ways', 0, 'filter', 'lowpass'])).toEqual({ shape: type, hz: value });
          expect(at(v2, ['ways', 1, 'filter', 'highpass'])).toEqual({ shape: type, hz: value });
        } else if (head === 'crossover' && rest[0] === 'highpass_hz') {
          expect(at(v2, ['ways', 0, 'filter', 'highpass'])).toEqual({ shape: 'bw2', hz: value });
        } else expect(at(v2, path), path.join('.')).toEqual(value);
      }
      const kinds = (v2.ways as { kind: string }[]).map((w) => w.kind);
      expect(kinds).toEqual(type === 'none' ? ['driver'] : ['driver', 'flat']);
      // The first version summed an LR2 split with the upper band inverted.
      if (type !== 'none') expect(at(v2, ['ways', 1, 'polarity'])).toBe(type === 'lr2' ? -1 : undefined);
      const parsed = parseDesign(v1);
      expect(parsed.ok).toBe(true);
      if (parsed.ok) expect(parsed.design).toEqual(v2 as DesignDoc);
    });
  }

  it('carries only the fields a version 1 design has: no optional field appears from nowhere', () => {
    const minimal = doc(driver, { type: 'sealed', vb_l: 20 }, { crossover: { type: 'none' } });
    delete minimal.air;
    const migrated = migrate(structuredClone(minimal) as unknown as Record<string, unknown>);
    if ('issue' in migrated) throw new Error(migrated.issue.message);
    expect(migrated.doc).toEqual({
      format: 'preheard-design',
      version: 2,
      name: 'test',
      ways: [{ kind: 'driver', name: 'woofer', driver: minimal.driver, box: minimal.box, filter: { type: 'active' } }],
      amplifier: minimal.amplifier,
      listening: minimal.listening,
    });
  });
});
