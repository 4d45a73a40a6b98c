// Problems found in a design or an input, as values: the UI and the CLI only present them.

export interface Issue {
  /** Field path in the design document, e.g. "box.vb_l"; "" for the whole document. */
  path: string;
  message: string;
  severity: 'error' | 'warning';
}

export const error = (path: string, message: string): Issue => ({ path, message, severity: 'error' });
export const warning = (path: string, message: string): Issue => ({ path, message, severity: 'warning' });

/** Readable number for messages: 4 significant digits, no exponent for ordinary magnitudes. */
export function fmt(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  const a = Math.abs(value);
  if (a !== 0 && (a < 1e-3 || a >= 1e6)) return value.toExponential(3);
  return String(Number(value.toPrecision(4)));
}

/**
 * A problem with what the user gave (an empty or silent track, an impossible drive level): the one
 * error the engine throws for input; its message is written for a user. Any other error is a defect.
 */
export class InputProblem extends Error {
  override name = 'InputProblem';
}
