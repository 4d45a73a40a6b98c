// Display units: the user's preference (metric, or inches, cubic feet and °F) applied where numbers
// meet the eye. Design files keep their SI-named fields (vb_l, xmax_mm, temperature_c) whatever is
// shown; fields convert what is typed back to the file's unit. The one place for these conversions.

export type UnitSystem = 'metric' | 'imperial';

export const UNIT_SYSTEMS: readonly { id: UnitSystem; label: string }[] = [
  { id: 'metric', label: 'metric (L, mm, °C)' },
  { id: 'imperial', label: 'inches, cubic feet, °F' },
];

/** The stored preference, metric unless it says imperial (an unknown stored value falls back). */
export function unitSystemOf(settings: { units?: unknown }): UnitSystem {
  return settings.units === 'imperial' ? 'imperial' : 'metric';
}

/** How a value in a file unit is shown: its label, and the exact conversions both ways. */
export interface DisplayUnit {
  label: string;
  fromFile: (value: number) => number;
  toFile: (value: number) => number;
  /** False for the file's own unit: values pass untouched. */
  converted: boolean;
}

// Exact by definition: the inch is 25.4 mm and the foot 0.3048 m (international yard and pound,
// 1959; NIST SP 811 appendix B), so a cubic foot is 0.3048³ m³ = 28.316846592 L.
const MM_PER_INCH = 25.4;
const LITRES_PER_CUBIC_FOOT = 28.316846592;
const METRES_PER_FOOT = 0.3048;

const scale = (label: string, fileUnitsPerShown: number): Omit<DisplayUnit, 'label'> & { label: string } => ({
  label,
  fromFile: (v) => v / fileUnitsPerShown,
  toFile: (v) => v * fileUnitsPerShown,
  converted: true,
});

/** Imperial counterparts of the metric units the screens show, by the unit's first word. */
const IMPERIAL: Record<string, DisplayUnit> = {
  L: scale('ft³', LITRES_PER_CUBIC_FOOT),
  mm: scale('in', MM_PER_INCH),
  cm: scale('in', MM_PER_INCH / 10),
  'cm²': scale('in²', (MM_PER_INCH / 10) ** 2),
  m: scale('ft', METRES_PER_FOOT),
  'm/s': scale('ft/s', METRES_PER_FOOT),
  '°C': { label: '°F', fromFile: (c) => (c * 9) / 5 + 32, toFile: (f) => ((f - 32) * 5) / 9, converted: true },
};

const identity = (label: string): DisplayUnit => ({ label, fromFile: (v) => v, toFile: (v) => v, converted: false });

/**
 * The unit a quantity is shown in. `fileUnit` is the metric label the screen would show ("L",
 * "cm ⌀", "°C"); words after the unit ("⌀", "wide") are kept. Units with no imperial counterpart
 * in the preference (Hz, dB, Ω, g) stay as they are.
 */
export function displayUnit(fileUnit: string | undefined, system: UnitSystem): DisplayUnit {
  const label = fileUnit ?? '';
  if (system === 'metric' || label === '') return identity(label);
  const space = label.indexOf(' ');
  const head = space < 0 ? label : label.slice(0, space);
  const tail = space < 0 ? '' : label.slice(space);
  const u = IMPERIAL[head];
  return u ? { ...u, label: u.label + tail } : identity(label);
}

/** Significant digits a converted value is shown with in a field (what is not typed stays exact in the file). */
export const FIELD_DIGITS = 6;

/** A file value as a field shows it: untouched in its own unit, else converted and rounded for reading. */
export function fieldValue(value: unknown, unit: DisplayUnit): unknown {
  if (!unit.converted || typeof value !== 'number' || !Number.isFinite(value)) return value;
  return Number(unit.fromFile(value).toPrecision(FIELD_DIGITS));
}
