// Stress events: intervals where a limit is exceeded, merged when closer than 50 ms, kept per
// source (a way, or the whole output for the distortion of the sum). Stored in preallocated typed
// arrays (grown only when full), turned into objects on request.

import { keepShape } from '../keep-shape.ts';

export const EVENT_KINDS = [
  'excursion',
  'xlim',
  'radiator-excursion',
  'coil-temperature',
  'port-speed',
  'amplifier-clip',
  'compression',
  'distortion',
] as const;
export type EventKind = (typeof EVENT_KINDS)[number];

export const EV_EXCURSION = 0;
export const EV_XLIM = 1;
export const EV_RADIATOR = 2;
export const EV_COIL = 3;
export const EV_PORT = 4;
export const EV_CLIP = 5;
export const EV_COMPRESSION = 6;
export const EV_DISTORTION = 7;

/**
 * Order of kinds that start in the same frame: the order the stress meter checks them in (motion,
 * outlet, amplifier, heat, then the output's distortion), so the list reads cause before effect.
 */
const SAME_FRAME_RANK: readonly number[] = (() => {
  const order = [EV_EXCURSION, EV_XLIM, EV_PORT, EV_RADIATOR, EV_CLIP, EV_COIL, EV_COMPRESSION, EV_DISTORTION];
  const rank = new Array<number>(EVENT_KINDS.length);
  order.forEach((kind, k) => {
    rank[kind] = k;
  });
  return rank;
})();

export const EVENT_UNITS: Record<EventKind, string> = {
  excursion: 'mm',
  xlim: 'mm',
  'radiator-excursion': 'mm',
  'coil-temperature': '°C',
  'port-speed': 'm/s',
  'amplifier-clip': 'V',
  compression: 'dB',
  distortion: 'dB',
};

export interface StressEvent {
  kind: EventKind;
  /** The way whose limit was crossed; absent for the summed output's own events (distortion). */
  way?: string;
  start_s: number;
  end_s: number;
  peak: number;
  unit: string;
  limit: number;
}

/** Events of one kind closer than this are one event. */
export const MERGE_GAP_S = 0.05;

/** Source index of the summed output. */
export const OUTPUT_SOURCE = -1;

export class EventLog {
  private kind = new Int8Array(64);
  private source = new Int16Array(64);
  private start = new Float64Array(64);
  private end = new Float64Array(64);
  private peak = new Float64Array(64);
  private limit = new Float64Array(64);
  count = 0;
  /** Names of the sources so far (a way keeps its index while the renderer lives). */
  private names: string[] = [];
  /** Per slot (a source and a kind): index of its open (or last) record, -1 if none. */
  private last = new Int32Array(8 * EVENT_KINDS.length).fill(-1);
  /** Per slot: its current limit (0 if none was set). */
  private limits = new Float64Array(8 * EVENT_KINDS.length);

  constructor() {
    keepShape(this);
  }

  reset(): void {
    this.count = 0;
    this.last.fill(-1);
  }

  /** The source index of a way's name (new names get the next index). */
  sourceOf(name: string): number {
    const k = this.names.indexOf(name);
    if (k >= 0) return k;
    this.names.push(name);
    return this.names.length - 1;
  }

  private slot(source: number, kind: number): number {
    return (source + 1) * EVENT_KINDS.length + kind;
  }

  /** Room for the slot of `source` (a new way's name gets a new source index). */
  private reach(key: number): void {
    if (key < this.last.length) return;
    const n = 2 * (key + 1);
    const last = new Int32Array(n).fill(-1);
    last.set(this.last);
    const limits = new Float64Array(n);
    limits.set(this.limits);
    this.last = last;
    this.limits = limits;
  }

  setLimit(source: number, kind: number, value: number): void {
    const key = this.slot(source, kind);
    this.reach(key);
    this.limits[key] = value;
  }

  limitOf(source: number, kind: number): number {
    const key = this.slot(source, kind);
    return key < this.limits.length ? this.limits[key] : 0;
  }

  /** Condition of `kind` at `source` true at time t (s) with value `value` (larger = worse). */
  mark(source: number, kind: number, t: number, value: number): void {
    const key = this.slot(source, kind);
    this.reach(key);
    const li = this.last[key];
    if (li >= 0 && t - this.end[li] <= MERGE_GAP_S) {
      this.end[li] = t;
      if (value > this.peak[li]) this.peak[li] = value;
      return;
    }
    if (this.count === this.kind.length) this.grow();
    const k = this.count++;
    this.kind[k] = kind;
    this.source[k] = source;
    this.start[k] = t;
    this.end[k] = t;
    this.peak[k] = value;
    this.limit[k] = this.limitOf(source, kind);
    this.last[key] = k;
  }

  /**
   * The condition true with the same value at every frame from tFirst to tLast (frames closer than
   * MERGE_GAP_S): the same record as marking each frame, without the frames between.
   */
  markSpan(source: number, kind: number, tFirst: number, tLast: number, value: number): void {
    this.mark(source, kind, tFirst, value);
    this.end[this.last[this.slot(source, kind)]] = tLast;
  }

  private grow(): void {
    const n = this.kind.length * 2;
    const widen = <T extends Int8Array | Int16Array | Float64Array>(a: T, b: T): T => {
      b.set(a);
      return b;
    };
    this.kind = widen(this.kind, new Int8Array(n));
    this.source = widen(this.source, new Int16Array(n));
    this.start = widen(this.start, new Float64Array(n));
    this.end = widen(this.end, new Float64Array(n));
    this.peak = widen(this.peak, new Float64Array(n));
    this.limit = widen(this.limit, new Float64Array(n));
  }

  /**
   * All events so far in order of start (ties: ways in order, the output last, then the kinds in
   * the order they are checked). `endPad` s is added to each end (one sample, say).
   */
  list(endPad = 0, round = true): StressEvent[] {
    const r = (v: number, d: number) => (round ? Number(v.toFixed(d)) : v);
    const order = Array.from({ length: this.count }, (_, k) => k);
    const sourceRank = (k: number) => (this.source[k] === OUTPUT_SOURCE ? 1 << 15 : this.source[k]);
    order.sort(
      (a, b) =>
        this.start[a] - this.start[b] || sourceRank(a) - sourceRank(b) || SAME_FRAME_RANK[this.kind[a]] - SAME_FRAME_RANK[this.kind[b]],
    );
    return order.map((k) => {
      const kind = EVENT_KINDS[this.kind[k]];
      return {
        kind,
        ...(this.source[k] === OUTPUT_SOURCE ? {} : { way: this.names[this.source[k]] }),
        start_s: r(Math.max(0, this.start[k]), 4),
        end_s: r(this.end[k] + endPad, 4),
        peak: r(this.peak[k], 3),
        unit: EVENT_UNITS[kind],
        limit: r(this.limit[k], 3),
      };
    });
  }
}
