// The design variants of a sweep: one driver way's box at another volume and (vented) tuning.
import type { DesignDoc, DriverWayDoc } from '../engine/design/document.ts';

export interface SweepPoint {
  vb_l: number;
  fb_hz: number | null;
}

/** The design with the way at `wayIndex` (a box of one volume) given the point's volume and (vented) tuning. */
export function variant(design: DesignDoc, point: SweepPoint, wayIndex: number): DesignDoc {
  const ways = design.ways.map((way, k) => {
    if (k !== wayIndex || way.kind !== 'driver') return way;
    const box = { ...way.box, vb_l: point.vb_l } as DriverWayDoc['box'];
    if (point.fb_hz !== null && box.type === 'vented') box.fb_hz = point.fb_hz;
    return { ...way, box };
  });
  return { ...design, ways };
}

/**
 * The index of the way a sweep works on: the way named `name`, or the first driver way; -1 when
 * there is no driver way of that name.
 */
export function sweptWayIndex(design: DesignDoc, name: string | undefined): number {
  return design.ways.findIndex((w) => w.kind === 'driver' && (name === undefined || w.name === name));
}
