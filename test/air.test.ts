import { describe, expect, it } from 'vitest';
import { airAt } from '../src/engine/air.ts';

describe('air', () => {
  it('gives c and rho at 20 °C, 101.325 kPa from the ideal-gas law', () => {
    const air = airAt(20, 101.325);
    // c = 331.3·sqrt(1 + 20/273.15) = 343.2 m/s; rho = p/(R·T), R = 287.05 → 1.2041 kg/m^3 (ideal-gas law)
    expect(air.c).toBeCloseTo(343.2, 1);
    expect(air.rho).toBeCloseTo(1.2041, 4);
  });

  it('has a wavelength of about 3.4 m at 100 Hz (common practice, no source)', () => {
    expect(airAt().c / 100).toBeCloseTo(3.43, 2);
  });

  it('gets thinner when warm and faster: c rises about 0.6 m/s per K (ideal gas, sqrt(T))', () => {
    const a = airAt(0);
    const b = airAt(30);
    expect((b.c - a.c) / 30).toBeCloseTo(0.6, 1);
    expect(b.rho / a.rho).toBeCloseTo(273.15 / 303.15, 6);
  });
});
