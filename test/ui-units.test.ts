// Display units: exact conversions both ways, the field's rounding, and the preference's fallback.
import { describe, expect, it } from 'vitest';
import { displayUnit, FIELD_DIGITS, fieldValue, unitSystemOf } from '../src/ui/units.ts';

describe('display units', () => {
  it('metric shows the file unit untouched', () => {
    const u = displayUnit('L', 'metric');
    expect(u.label).toBe('L');
    expect(u.converted).toBe(false);
    expect(fieldValue(20.123456789, u)).toBe(20.123456789);
  });

  it('imperial uses the exact definitions', () => {
    // Independent references (NIST SP 811, appendix B; international yard and pound, 1959): 1 in =
    // 2.54 cm exactly, 1 in³ = 16.387064 cm³ exactly, so 1 ft³ = 1728 in³ = 28.316846592 L.
    expect(displayUnit('L', 'imperial').fromFile((1728 * 16.387064) / 1000)).toBeCloseTo(1, 12);
    expect(displayUnit('mm', 'imperial').fromFile(25.4)).toBeCloseTo(1, 12);
    expect(displayUnit('cm', 'imperial').fromFile(2.54)).toBeCloseTo(1, 12);
    expect(displayUnit('cm²', 'imperial').fromFile(2.54 * 2.54)).toBeCloseTo(1, 12);
    expect(displayUnit('m', 'imperial').fromFile(12 * 0.0254)).toBeCloseTo(1, 12);
    // Water freezes at 32 °F and boils at 212 °F; the scales meet at −40.
    const t = displayUnit('°C', 'imperial');
    expect(t.fromFile(0)).toBeCloseTo(32, 12);
    expect(t.fromFile(100)).toBeCloseTo(212, 12);
    expect(t.fromFile(-40)).toBeCloseTo(-40, 12);
    expect(t.toFile(68)).toBeCloseTo(20, 12);
  });

  it('keeps the words after a unit and leaves units without an imperial counterpart alone', () => {
    expect(displayUnit('cm ⌀', 'imperial').label).toBe('in ⌀');
    expect(displayUnit('cm wide', 'imperial').label).toBe('in wide');
    for (const u of ['Hz', 'dB', 'Ω', 'g', 'dB(C)', 'V rms', 'mm/N']) {
      const d = displayUnit(u, 'imperial');
      expect([d.label, d.converted, d.fromFile(3.7)]).toEqual([u, false, 3.7]);
    }
  });

  it('round-trips: file → shown → file is exact to rounding, and a typed value comes back as typed', () => {
    const units = ['L', 'mm', 'cm', 'cm²', 'm', 'm/s', '°C'];
    const values = [0.001, 0.37, 1, 5.5, 14, 20, 21.7, 101.325, 343, 1e4, -12.5];
    for (const name of units) {
      const u = displayUnit(name, 'imperial');
      for (const v of values) {
        expect(Math.abs(u.toFile(u.fromFile(v)) - v)).toBeLessThanOrEqual(4 * Number.EPSILON * Math.max(Math.abs(v), 32));
        // What a field shows is rounded to FIELD_DIGITS significant digits: typed back unchanged it
        // lands within that rounding of the file's value.
        const shown = fieldValue(v, u) as number;
        expect(Math.abs(u.toFile(shown) - v)).toBeLessThanOrEqual(Math.abs(v) * 10 ** (1 - FIELD_DIGITS) + 1e-9);
        // A value the user types is shown again exactly as typed.
        expect(fieldValue(u.toFile(0.75), u)).toBe(0.75);
      }
    }
  });

  it('reads the stored preference, metric unless it says imperial', () => {
    expect(unitSystemOf({})).toBe('metric');
    expect(unitSystemOf({ units: 'imperial' })).toBe('imperial');
    expect(unitSystemOf({ units: 'furlongs' })).toBe('metric');
    expect(unitSystemOf({ units: 3 })).toBe('metric');
  });
});
