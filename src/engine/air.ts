import type { Air } from './system.ts';

/** Specific gas constant of dry air, J/(kg·K). */
export const R_AIR = 287.05;
export const STANDARD_TEMPERATURE_C = 20;
export const STANDARD_PRESSURE_KPA = 101.325;

/** Speed of sound and density of dry air (ideal gas; c = 331.3·sqrt(1 + theta/273.15)). */
export function airAt(temperatureC = STANDARD_TEMPERATURE_C, pressureKpa = STANDARD_PRESSURE_KPA): Air {
  const kelvin = temperatureC + 273.15;
  const pressurePa = pressureKpa * 1000;
  return {
    c: 331.3 * Math.sqrt(1 + temperatureC / 273.15),
    rho: pressurePa / (R_AIR * kelvin),
    temperatureC,
    pressurePa,
  };
}

/** Bulk modulus rho·c^2 (Pa): the stiffness of air in a box, Cab = Vb / (rho c^2). */
export const bulkModulus = (air: Air): number => air.rho * air.c * air.c;
