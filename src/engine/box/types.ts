import type { Air, Box, Driver } from '../system.ts';
import type { BoxDoc } from '../design/document.ts';
import type { Complex } from '../complex.ts';
import type { Issue } from '../issues.ts';

export interface BoxContext {
  air: Air;
  driver: Driver;
  /** Series resistance (amplifier output + cable), ohm: it raises Qes. */
  rs: number;
}

/**
 * One box type. Adding a type means one module with this interface and one line in box/index.ts.
 * Large-signal state equations live in sim/, which switches on `box.type` in one place.
 */
export interface BoxKind<D extends BoxDoc = BoxDoc, B extends Box = Box> {
  type: D['type'];
  /** Display name, ours. */
  label: string;
  /** Converts the document to SI, with every problem found. `path` is the document path of the box. */
  build(doc: D, ctx: BoxContext, path: string): { box: B | null; issues: Issue[] };
  /**
   * Acoustic admittance of the outlet (port or radiator) seen from inside the box, at angular
   * frequency w: its volume velocity out of the box is U = Y · pb. Null for a closed box.
   */
  outletAdmittance(box: B, air: Air, w: number): Complex | null;
}
