// Reference values of the trade and the level conversions built on them: one definition each.

/** Reference sound pressure, Pa (ISO 1683). */
export const P_REF = 20e-6;

/** Sensitivity is quoted for 2.83 V (1 W into 8 ohm) at 1 m (common practice). */
export const SENSITIVITY_VOLTS = 2.83;

/** Peak port air speed above which port noise is likely: about 5% of c (common practice, no source). */
export const PORT_SPEED_LIMIT = 17;

/** SPL of an rms pressure, dB re 20 µPa. */
export const splDb = (pressureRms: number): number => 20 * Math.log10(Math.max(pressureRms, 1e-30) / P_REF);

/** SPL of a mean-square pressure, dB re 20 µPa. */
export const splDbOfMeanSquare = (meanSquarePa: number): number => 10 * Math.log10(meanSquarePa / (P_REF * P_REF));
