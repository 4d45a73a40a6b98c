// The registry of box kinds: one line per kind. The design schema is built from the kinds' own schemas.
import { makeDesignSchema } from '../design/schema.ts';
import type { BoxKind } from './types.ts';
import { sealed } from './sealed.ts';
import { vented } from './vented.ts';
import { passiveRadiator } from './passive-radiator.ts';
import { bandpass4 } from './bandpass4.ts';

const KINDS = [sealed, vented, passiveRadiator, bandpass4] as const;

export const designSchema = makeDesignSchema(KINDS.map((k) => k.schema));

export type BoxType = (typeof KINDS)[number]['type'];
/** Every built box: the union of the kinds' own box types. */
export type Box = NonNullable<ReturnType<(typeof KINDS)[number]['build']>['box']>;
export type { SealedBox } from './sealed.ts';
export type { VentedBox } from './vented.ts';
export type { PassiveRadiatorBox } from './passive-radiator.ts';
/** Dispatch by the box's type; each kind checks its own document and box shapes. */
// biome-ignore lint/suspicious/noExplicitAny: the registry erases each kind's own types
export const BOX_KINDS = Object.fromEntries(KINDS.map((k) => [k.type, k])) as Record<BoxType, BoxKind<any, any>>;
export const BOX_TYPES = KINDS.map((k) => k.type);

export type { BoxKind, BoxContext } from './types.ts';
export type { BoxAcoustics, BoxProbe, Chamber, ChamberContext } from './physics.ts';
