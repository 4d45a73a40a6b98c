import type * as v from 'valibot';
import type { Air, Driver } from '../system.ts';
import type { BoxAcoustics, BoxFigure, BoxProbe, Chamber, ChamberContext } from './physics.ts';
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
/** What every built box has; a kind adds its own fields. */
export interface BoxBase {
  type: string;
  /** Effective acoustic volume of all chambers, m^3. */
  vb: number;
  /** Net internal volume of all chambers as entered, m^3. */
  vbNet: number;
  ql: number | null;
}

export interface BoxKind<S extends BoxSchema = BoxSchema, B extends BoxBase = BoxBase, D extends v.InferOutput<S> = v.InferOutput<S>> {
  type: D['type'];
  /** Display name, ours. */
  label: string;
  schema: S;
  /** Converts the document to SI, with every problem found. `path` is the document path of the box. */
  build(doc: D, ctx: BoxContext, path: string): { box: B | null; issues: Issue[] };
  /** The small-signal acoustic load on the cone at w rad/s, per unit cone volume velocity. */
  acoustics(box: B, air: Air, w: number): BoxAcoustics;
  /** A new large-signal chamber model (states at rest) for one driver way. */
  chamber(box: B, ctx: ChamberContext): Chamber;
  /** The stress this box adds (port air speed, radiator travel), or null. */
  probe(box: B): BoxProbe | null;
  /** The box's own figures (tuning, port length, pipe resonance...). */
  figures(box: B, air: Air): BoxFigure[];
}
