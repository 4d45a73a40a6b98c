import { describe, expect, it } from 'vitest';
import { readFileSync, readdirSync } from 'node:fs';
import { parseDesign } from '../src/engine/design/validate.ts';
import { doc } from './helpers/designs.ts';

const paths = (r: ReturnType<typeof parseDesign>) => (r.ok ? [] : r.errors.map((e) => e.path));
const driver = { fs_hz: 40, qes: 0.4, qms: 4, vas_l: 30 };

describe('design document validation', () => {
  it('accepts every shipped example', () => {
    for (const name of readdirSync('public/examples')) {
      const r = parseDesign(readFileSync(`public/examples/${name}`, 'utf8'));
      expect(r.ok, name).toBe(true);
    }
  });

  it('reports every problem at once, each naming the field, the value and the allowed range', () => {
    const bad = doc({ ...driver, fs_hz: -5, sd_cm2: Number.NaN as unknown as number }, { type: 'sealed', vb_l: 1e6 });
    (bad.listening as { space: string }).space = 'moon';
    const r = parseDesign(JSON.parse(JSON.stringify(bad).replace('null', '"NaN"')));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(paths(r)).toEqual(expect.arrayContaining(['driver.fs_hz', 'driver.sd_cm2', 'box.vb_l', 'listening.space']));
    const fs = r.errors.find((e) => e.path === 'driver.fs_hz')!;
    expect(fs.message).toMatch(/from 1 to 2000 Hz, got -5/);
  });

  it('names missing and unknown fields', () => {
    const d = doc(driver, { type: 'sealed', vb_l: 10 }) as unknown as Record<string, Record<string, unknown>>;
    delete d.driver.re_ohm;
    d.driver.colour = 'red';
    const r = parseDesign(d);
    if (r.ok) throw new Error('should fail');
    expect(r.errors).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ path: 'driver.re_ohm', message: 'is required' }),
        expect.objectContaining({ path: 'driver.colour', message: 'is not a field of this design format' }),
      ]),
    );
  });

  it('names array elements by index', () => {
    const r = parseDesign(doc(driver, { type: 'vented', vb_l: 20, fb_hz: 40, ports: [{ diameter_cm: 6 }, { diameter_cm: 0 }] }));
    expect(paths(r)).toContain('box.ports[1].diameter_cm');
  });

  it('refuses bad JSON, non-objects, foreign formats and newer versions with one clear message', () => {
    expect(parseDesign('{"format":')).toMatchObject({
      ok: false,
      errors: [{ path: '', message: expect.stringMatching(/not valid JSON/) }],
    });
    expect(parseDesign('[1,2]')).toMatchObject({ ok: false, errors: [{ message: 'a design must be a JSON object' }] });
    expect(parseDesign({ format: 'something-else' })).toMatchObject({ ok: false, errors: [{ path: 'format' }] });
    expect(parseDesign({ ...doc(driver, { type: 'sealed', vb_l: 10 }), version: 7 })).toMatchObject({
      ok: false,
      errors: [{ path: 'version', message: expect.stringMatching(/newer/) }],
    });
  });

  it('refuses a port that cannot reach the tuning and a port longer than the box holds', () => {
    const tiny = parseDesign(doc(driver, { type: 'vented', vb_l: 100, fb_hz: 200, ports: [{ diameter_cm: 1 }] }));
    expect(tiny.ok).toBe(false);
    if (!tiny.ok) expect(tiny.errors[0].message).toMatch(/cannot tune to 200 Hz/);
    const huge = parseDesign(doc(driver, { type: 'vented', vb_l: 2, fb_hz: 20, ports: [{ diameter_cm: 10 }] }));
    expect(huge.ok).toBe(false);
    if (!huge.ok) expect(huge.errors.map((e) => e.message).join(' ')).toMatch(/larger than the 2 l box/);
  });

  it('warns when the port must be longer than the box is deep', () => {
    const r = parseDesign(doc(driver, { type: 'vented', vb_l: 15, fb_hz: 30, ports: [{ diameter_cm: 8 }] }));
    expect(r.ok).toBe(true);
    expect(r.warnings.map((w) => w.message).join(' ')).toMatch(/longer than the box's likely inner depth/);
  });

  it('refuses a box smaller than the driver itself', () => {
    const r = parseDesign(doc({ ...driver, sd_cm2: 500 }, { type: 'sealed', vb_l: 1 }));
    expect(paths(r)).toContain('box.vb_l');
  });

  it('warns outside the sane travel of bass drivers rather than refusing (common practice, no source: a few mm at home, about 25 mm for large PA drivers)', () => {
    const r = parseDesign(doc({ ...driver, xmax_mm: 40, xlim_mm: 60 }, { type: 'sealed', vb_l: 20 }));
    expect(r.ok).toBe(true);
    expect(r.warnings.find((w) => w.path === 'driver.xmax_mm')?.message).toMatch(/beyond even large PA bass drivers/);
  });

  it('requires Xlim beyond Xmax, and a crossover frequency for a crossover', () => {
    const d = doc({ ...driver, xmax_mm: 5, xlim_mm: 4 }, { type: 'sealed', vb_l: 20 });
    d.crossover = { type: 'lr4' };
    expect(paths(parseDesign(d))).toEqual(expect.arrayContaining(['driver.xlim_mm', 'crossover.fx_hz']));
  });

  it('accepts a driver given only by its mechanical parameters', () => {
    const r = parseDesign(doc({ bl_tm: 7, mms_g: 20, cms_mm_per_n: 0.8, rms_kg_s: 1.5 }, { type: 'sealed', vb_l: 20 }));
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.system.driver.fs).toBeCloseTo(1 / (2 * Math.PI * Math.sqrt(0.02 * 0.8e-3)), 9);
  });
});
