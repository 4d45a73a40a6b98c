import { describe, expect, it } from 'vitest';
import { END_CORRECTION, helmholtzHz, portGeometry, portLengthFor } from '../src/engine/box/vented.ts';
import { airAt } from '../src/engine/air.ts';
import { doc, system } from './helpers/designs.ts';
import { analyze } from '../src/engine/response/analyze.ts';

const c = airAt(20).c;

describe('port tuning (Helmholtz resonator with end corrections)', () => {
  it("uses Rayleigh's flanged end 8/(3 pi)·a ≈ 0.85·a and Levine & Schwinger's free end 0.6133·a (Phys. Rev. 73, 1948)", () => {
    expect(END_CORRECTION.flanged).toBeCloseTo(0.8488, 4);
    expect(END_CORRECTION.free).toBeCloseTo(0.6133, 4);
  });

  it('gives the physical length from fb = (c/2 pi)·sqrt(Sv/(Vb·Leff)), flush outer end and free inner end', () => {
    const vb = 0.02;
    const fb = 40;
    const a = 0.03;
    const sv = Math.PI * a * a;
    // Leff from the Helmholtz relation, less both end corrections
    const expected = (c * c * sv) / ((2 * Math.PI * fb) ** 2 * vb) - (8 / (3 * Math.PI) + 0.6133) * a;
    const length = portLengthFor([portGeometry({ diameter_cm: 6 })], vb, fb, c);
    expect(length).toBeCloseTo(expected, 6);
    expect(helmholtzHz(c, sv, vb, length + (END_CORRECTION.flanged + END_CORRECTION.free) * a)).toBeCloseTo(fb, 9);
  });

  it('makes a port with two free ends longer than one with a flanged outer end', () => {
    const flanged = portLengthFor([portGeometry({ diameter_cm: 6 })], 0.02, 40, c);
    const free = portLengthFor([portGeometry({ diameter_cm: 6, outer_end: 'free' })], 0.02, 40, c);
    expect(free - flanged).toBeCloseTo((8 / (3 * Math.PI) - 0.6133) * 0.03, 6);
  });

  it('treats a slot by its equal-area radius and splits the area among several ports', () => {
    const slot = portGeometry({ width_cm: 10, height_cm: 2.5, count: 2 });
    expect(slot.area).toBeCloseTo(0.0025, 12);
    expect(slot.radius).toBeCloseTo(Math.sqrt(0.0025 / Math.PI), 12);
    expect(slot.count).toBe(2);
  });

  it('reports the port length of the design in analyze', () => {
    const s = system(doc({ fs_hz: 40, qes: 0.4, qms: 4, vas_l: 30 }, { type: 'vented', vb_l: 20, fb_hz: 40, ports: [{ diameter_cm: 6 }] }));
    const expected = (c * c * Math.PI * 0.03 ** 2) / ((2 * Math.PI * 40) ** 2 * 0.02) - (8 / (3 * Math.PI) + 0.6133) * 0.03;
    expect(analyze(s).figures.portLengthCm).toBeCloseTo(expected * 100, 3);
  });
});
