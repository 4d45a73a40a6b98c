// The ways of a design document: which one is meant, and the edits that add, remove or copy one.
// Pure functions on documents; the new document goes to the store as one undoable step.
import {
  activeFilterOf,
  MAX_WAYS,
  type DesignDoc,
  type DriverWayDoc,
  type FlatWayDoc,
  type LadderPartDoc,
  type WayDoc,
} from '../engine/design/document.ts';
import type { DriverWay, SpeakerSystem, Way } from '../engine/system.ts';

export { MAX_WAYS };

/** What "Add way" can add. */
export type NewWayKind = 'tweeter' | 'midrange' | 'flat';

export const NEW_WAY_LABEL: Record<NewWayKind, string> = {
  tweeter: 'Tweeter in a closed back',
  midrange: 'Midrange in a small sealed box',
  flat: 'Ideal flat band',
};

/** Index of the first way with a driver (a valid document has one); 0 when there is none. */
export function firstDriverIndex(doc: DesignDoc): number {
  const i = doc.ways.findIndex((w) => w.kind === 'driver');
  return i < 0 ? 0 : i;
}

/** The first way with a driver: where a single driver is meant (the woofer of a first-version design). */
export function firstDriverWay(doc: DesignDoc): DriverWayDoc | null {
  return (doc.ways.find((w) => w.kind === 'driver') as DriverWayDoc | undefined) ?? null;
}

/** The same for the engine's system. */
export function firstDriverOf(system: SpeakerSystem): DriverWay | null {
  return (system.ways.find((w) => w.kind === 'driver') as DriverWay | undefined) ?? null;
}

/** A remembered way index made safe for this document (ways may have been removed meanwhile). */
export function clampWay(doc: DesignDoc, index: number | undefined): number {
  const i = index ?? firstDriverIndex(doc);
  return Number.isInteger(i) && i >= 0 && i < doc.ways.length ? i : firstDriverIndex(doc);
}

/**
 * The system's way for document way `index`: the same position while the system belongs to this
 * document; for an older valid version (the document has errors) the way of the same name.
 */
export function systemWay(system: SpeakerSystem, doc: DesignDoc, index: number): Way | null {
  const name = doc.ways[index]?.name;
  const same = system.ways[index];
  if (same && same.name === name) return same;
  return system.ways.find((w) => w.name === name) ?? null;
}

export function systemDriverWay(system: SpeakerSystem, doc: DesignDoc, index: number): DriverWay | null {
  const w = systemWay(system, doc, index);
  return w && w.kind === 'driver' ? w : null;
}

/** A name not yet used in the design: "tweeter", "tweeter 2", ... */
export function freeName(doc: DesignDoc, base: string): string {
  const used = new Set(doc.ways.map((w) => w.name));
  if (!used.has(base)) return base;
  for (let k = 2; ; k++) if (!used.has(`${base} ${k}`)) return `${base} ${k}`;
}

/** Where the design splits bass from treble: the first driver way's active low-pass, else 2200 Hz. */
export function crossoverHz(doc: DesignDoc): number {
  const first = firstDriverWay(doc);
  return (first && activeFilterOf(first)?.lowpass?.hz) ?? 2200;
}

/**
 * Starting ways. The drivers are our own invented examples with typical published values for their
 * class (common practice, no source); the user replaces them with the real driver's sheet.
 */
export function newWay(doc: DesignDoc, kind: NewWayKind): WayDoc {
  const fx = crossoverHz(doc);
  if (kind === 'flat') {
    const flat: FlatWayDoc = {
      kind: 'flat',
      name: freeName(doc, 'upper band'),
      filter: { type: 'active', highpass: { shape: 'lr4', hz: fx } },
    };
    return flat;
  }
  if (kind === 'tweeter') {
    const tweeter: DriverWayDoc = {
      kind: 'driver',
      name: freeName(doc, 'tweeter'),
      driver: {
        name: 'Wren 25 (invented 1 inch dome tweeter)',
        fs_hz: 950,
        qes: 1.1,
        qms: 2.2,
        vas_l: 0.04,
        re_ohm: 4.8,
        le_mh: 0.04,
        sd_cm2: 7.1,
        xmax_mm: 0.35,
        xlim_mm: 0.8,
        pe_w: 15,
      },
      box: { type: 'sealed', vb_l: 0.12 },
      filter: { type: 'active', highpass: { shape: 'lr4', hz: fx } },
    };
    return tweeter;
  }
  const lowHz = Math.min(350, fx / 2);
  const midrange: DriverWayDoc = {
    kind: 'driver',
    name: freeName(doc, 'midrange'),
    driver: {
      name: 'Finch 100 (invented 4 inch midrange)',
      fs_hz: 85,
      qes: 0.55,
      qms: 3.2,
      vas_l: 1.6,
      re_ohm: 5.4,
      le_mh: 0.18,
      sd_cm2: 52,
      xmax_mm: 2,
      xlim_mm: 4,
      pe_w: 40,
    },
    box: { type: 'sealed', vb_l: 1.5 },
    filter: { type: 'active', highpass: { shape: 'lr4', hz: lowHz }, lowpass: { shape: 'lr4', hz: fx } },
  };
  return midrange;
}

export function canAddWay(doc: DesignDoc): boolean {
  return doc.ways.length < MAX_WAYS;
}

export function addWay(doc: DesignDoc, kind: NewWayKind): DesignDoc {
  if (!canAddWay(doc)) return doc;
  return { ...doc, ways: [...doc.ways, newWay(doc, kind)] };
}

/** The last way with a driver cannot be removed: a design needs one. */
export function canRemoveWay(doc: DesignDoc, index: number): boolean {
  const way = doc.ways[index];
  if (!way || doc.ways.length < 2) return false;
  return way.kind !== 'driver' || doc.ways.filter((w) => w.kind === 'driver').length > 1;
}

export function removeWay(doc: DesignDoc, index: number): DesignDoc {
  if (!canRemoveWay(doc, index)) return doc;
  return { ...doc, ways: doc.ways.filter((_, k) => k !== index) };
}

/**
 * Copies a way into another design: it replaces the way of the same name there, else it is added
 * (when there is room). Returns the new document and the index of the copy, or null when full.
 */
export function copyWayInto(target: DesignDoc, way: WayDoc): { doc: DesignDoc; index: number } | null {
  const copy = structuredClone(way);
  const same = target.ways.findIndex((w) => w.name === way.name);
  if (same >= 0) {
    const replaced = target.ways.map((w, k) => (k === same ? copy : w));
    // Replacing the only driver way by a flat one would leave no driver: refuse.
    if (!replaced.some((w) => w.kind === 'driver')) return null;
    return { doc: { ...target, ways: replaced }, index: same };
  }
  if (!canAddWay(target)) return null;
  return { doc: { ...target, ways: [...target.ways, copy] }, index: target.ways.length };
}

/** Two significant digits, as parts are sold. */
const partValue = (x: number): number => Number(x.toPrecision(2));

/**
 * A passive network to start from when a way switches to one: second-order Butterworth sections
 * (series L and shunt C for a low-pass, series C and shunt L for a high-pass) at the active
 * filter's corners for a load of the driver's Re, L = sqrt2·R/w0, C = 1/(sqrt2·R·w0) (the
 * textbook LC ladder into a resistor; the real driver's impedance moves the response, as it does).
 */
export function starterLadder(way: DriverWayDoc): LadderPartDoc[] {
  const active = activeFilterOf(way);
  const r = way.driver.re_ohm;
  const section = (hz: number, lowpass: boolean): LadderPartDoc[] => {
    const w0 = 2 * Math.PI * hz;
    const mh = partValue(((Math.SQRT2 * r) / w0) * 1000);
    const uf = partValue(1e6 / (Math.SQRT2 * r * w0));
    return lowpass
      ? [
          { at: 'series', part: 'l', mh, dcr_ohm: 0.2 },
          { at: 'shunt', part: 'c', uf },
        ]
      : [
          { at: 'series', part: 'c', uf },
          { at: 'shunt', part: 'l', mh, dcr_ohm: 0.2 },
        ];
  };
  return [...(active?.highpass ? section(active.highpass.hz, false) : []), ...(active?.lowpass ? section(active.lowpass.hz, true) : [])];
}
