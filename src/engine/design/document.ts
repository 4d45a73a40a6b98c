// The design document as stored in files, IndexedDB and share links, version 2: a list of ways.
// Field names carry their unit; the engine converts to SI once, in `toSystem`. The types are
// inferred from the schema (the box kinds' own schemas included), never kept by hand.
import type * as v from 'valibot';
import type { designSchema } from '../box/index.ts';
import type {
  activeFilterSchema,
  driverSchema,
  ladderPartSchema,
  measuredResponseSchema,
  passiveFilterSchema,
  portSchema,
} from './schema.ts';

export { DESIGN_FORMAT, DESIGN_VERSION, MAX_WAYS, FILTER_SHAPES, LADDER_PARTS, MAX_LADDER_PARTS } from './schema.ts';

export type DesignDoc = v.InferOutput<typeof designSchema>;
export type WayDoc = DesignDoc['ways'][number];
export type DriverWayDoc = Extract<WayDoc, { kind: 'driver' }>;
export type FlatWayDoc = Extract<WayDoc, { kind: 'flat' }>;
export type DriverDoc = v.InferOutput<typeof driverSchema>;
export type BoxDoc = DriverWayDoc['box'];
export type PortDoc = v.InferOutput<typeof portSchema>;
/** A way's active filter (the only kind a flat way has). */
export type FilterDoc = v.InferOutput<typeof activeFilterSchema>;
export type PassiveFilterDoc = v.InferOutput<typeof passiveFilterSchema>;
export type LadderPartDoc = v.InferOutput<typeof ladderPartSchema>;
export type MeasuredResponseDoc = v.InferOutput<typeof measuredResponseSchema>;
export type FilterBandDoc = NonNullable<FilterDoc['highpass']>;
export type FilterShape = FilterBandDoc['shape'];
export type AmplifierDoc = DesignDoc['amplifier'];
export type ListeningDoc = DesignDoc['listening'];
export type PlannedLevelDoc = NonNullable<ListeningDoc['level']>;
export type AirDoc = NonNullable<DesignDoc['air']>;

/** A way's active filter, or undefined for none or a passive network. */
export const activeFilterOf = (way: WayDoc): FilterDoc | undefined => (way.filter?.type === 'active' ? way.filter : undefined);
