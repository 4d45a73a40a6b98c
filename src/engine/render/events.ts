// Stress events: intervals where a limit is exceeded, merged when closer than 50 ms.
// Stored in preallocated typed arrays (grown only when full), turned into objects on request.

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
  start_s: number;
  end_s: number;
  peak: number;
  unit: string;
  limit: number;
}

/** Events of one kind closer than this are one event. */
export const MERGE_GAP_S = 0.05;

export class EventLog {
  private kind = new Int8Array(64);
  private start = new Float64Array(64);
  private end = new Float64Array(64);
  private peak = new Float64Array(64);
  count = 0;
  /** Index of the open (or last) record of each kind, -1 if none. */
  private readonly last = new Int32Array(EVENT_KINDS.length).fill(-1);
  readonly limits = new Float64Array(EVENT_KINDS.length);
  /** Time the condition was last true per kind, or -Infinity. */
  private readonly activeUntil = new Float64Array(EVENT_KINDS.length).fill(-Infinity);

  reset(): void {
    this.count = 0;
    this.last.fill(-1);
    this.activeUntil.fill(-Infinity);
  }

  /** Condition of `kind` true at time t (s) with value `value` (larger = worse). */
  mark(kind: number, t: number, value: number): void {
    const li = this.last[kind];
    if (li >= 0 && t - this.end[li] <= MERGE_GAP_S) {
      this.end[li] = t;
      if (value > this.peak[li]) this.peak[li] = value;
    } else {
      if (this.count === this.kind.length) this.grow();
      const k = this.count++;
      this.kind[k] = kind;
      this.start[k] = t;
      this.end[k] = t;
      this.peak[k] = value;
      this.last[kind] = k;
    }
    this.activeUntil[kind] = t;
  }

  private grow(): void {
    const n = this.kind.length * 2;
    const k = new Int8Array(n),
      s = new Float64Array(n),
      e = new Float64Array(n),
      p = new Float64Array(n);
    k.set(this.kind);
    s.set(this.start);
    e.set(this.end);
    p.set(this.peak);
    this.kind = k;
    this.start = s;
    this.end = e;
    this.peak = p;
  }

  /** All events so far, in order of start. `endPad` s is added to each end (one sample, say). */
  list(endPad = 0, round = true): StressEvent[] {
    const out: StressEvent[] = [];
    const r = (v: number, d: number) => (round ? Number(v.toFixed(d)) : v);
    for (let k = 0; k < this.count; k++) {
      const kind = EVENT_KINDS[this.kind[k]];
      out.push({
        kind,
        start_s: r(Math.max(0, this.start[k]), 4),
        end_s: r(this.end[k] + endPad, 4),
        peak: r(this.peak[k], 3),
        unit: EVENT_UNITS[kind],
        limit: r(this.limits[this.kind[k]], 3),
      });
    }
    out.sort((a, b) => a.start_s - b.start_s);
    return out;
  }

  /** Seconds covered by events of one kind. */
  total(kind: number): number {
    let s = 0;
    for (let k = 0; k < this.count; k++) if (this.kind[k] === kind) s += this.end[k] - this.start[k];
    return s;
  }

  firstOf(): { kind: EventKind; t: number } | null {
    let best = -1;
    for (let k = 0; k < this.count; k++) if (best < 0 || this.start[k] < this.start[best]) best = k;
    return best < 0 ? null : { kind: EVENT_KINDS[this.kind[best]], t: this.start[best] };
  }
}
