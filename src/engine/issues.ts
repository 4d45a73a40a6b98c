// Problems found in a design or an input, as values: the UI and the CLI only present them.
import { significantTrimmed } from './number-text.ts';

export interface Issue {
  /** Field path in the design document, e.g. "box.vb_l"; "" for the whole document. */
  path: string;
  message: string;
  severity: 'error' | 'warning';
}

export const error = (path: string, message: string): Issue => ({ path, message, severity: 'error' });
export const warning = (path: string, message: string): Issue => ({ path, message, severity: 'warning' });

/**
 * Readable number for messages: three significant figures (number-text.ts), whole numbers kept whole
 * and no trailing zeros, so a value the user typed reads as typed ("a 2 l box", "1 W").
 */
export function fmt(value: number): string {
  return significantTrimmed(value, 3);
}

/**
 * A problem with what the user gave (an empty or silent track, an impossible drive level): the one
 * error the engine throws for input; its message is written for a user. Any other error is a defect.
 */
export class InputProblem extends Error {
  override name = 'InputProblem';
}
