import type * as v from 'valibot';
import type { Air, Box, Driver } from '../system.ts';
import type { Complex } from '../complex.ts';
import type { Issue } from '../issues.ts';

export interface BoxContext {
  air: Air;
  /** The way's driver (the equivalent of all its drivers as wired). */
  driver: Driver;
  /** Series resistance (amplifier output + cable), ohm: it raises Qes. */
  rs: number;
}

/** The document shape of a box kind: a strict object with a `type` literal. */
// biome-ignore lint/suspicious/noExplicitAny: valibot's own entry types
export type BoxSchema = v.StrictObjectSchema<{ type: v.LiteralSchema<string, any> } & v.ObjectEntries, any>;

/**
 * One box kind. Adding a kind means one module with this interface and one line in box/index.ts.
 */
export interface BoxKind<S extends BoxSchema = BoxSchema, B extends Box = Box, D extends v.InferOutput<S> = v.InferOutput<S>> {
  type: D['type'];
  /** Display name, ours. */
  label: string;
  schema: S;
  /** Converts the document to SI, with every problem found. `path` is the document path of the box. */
  build(doc: D, ctx: BoxContext, path: string): { box: B | null; issues: Issue[] };
  /**
   * Acoustic admittance of the outlet (port or radiator) seen from inside the box, at angular
   * frequency w: its volume velocity out of the box is U = Y · pb. Null for a closed box.
   */
  outletAdmittance(box: B, air: Air, w: number): Complex | null;
}
