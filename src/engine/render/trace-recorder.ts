// Decimated traces for the stress strip: at each trace point, the worst value of the chunks that
// ended in its interval, per driver way, and the residual level of the summed output.
import type { OutputDistortion, WayStress } from './stress-meter.ts';
import { keepShape } from '../keep-shape.ts';

/** A growing Float32 series (doubling), viewed without copying. */
class Series {
  data: Float32Array;
  n = 0;
  constructor(cap: number) {
    this.data = new Float32Array(Math.max(16, cap));
    keepShape(this);
  }
  push(v: number): void {
    if (this.n === this.data.length) {
      const d = new Float32Array(this.data.length * 2);
      d.set(this.data);
      this.data = d;
    }
    this.data[this.n++] = v;
  }
  view(): Float32Array {
    return this.data.subarray(0, this.n);
  }
}

export interface WayTraces {
  /** The way's name. */
  name: string;
  excursionMm: Float32Array;
  coilTempC: Float32Array;
  portSpeed: Float32Array;
  compressionDb: Float32Array;
}

export interface Traces {
  hz: number;
  /** The first driver way's traces (the woofer of a first-version design). */
  excursionMm: Float32Array;
  coilTempC: Float32Array;
  portSpeed: Float32Array;
  compressionDb: Float32Array;
  /** Residual level of the summed output relative to it, dB (-120 when silent). */
  residualDb: Float32Array;
  /** Every driver way's own traces, in the design's order. */
  ways: WayTraces[];
}

class WaySeries {
  readonly x = new Series(1024);
  readonly t = new Series(1024);
  readonly p = new Series(1024);
  readonly c = new Series(1024);
  constructor(public name: string) {
    keepShape(this);
  }
}

export class TraceRecorder {
  readonly every: number;
  private count = 0;
  private ways: WaySeries[] = [];
  private readonly residual = new Series(1024);

  constructor(
    private readonly sampleRate: number,
    traceHz: number,
  ) {
    this.every = Math.max(1, Math.round(sampleRate / traceHz));
    keepShape(this);
  }

  /** The driver ways to record, by name (a way keeps its series across edits). */
  setWays(names: string[]): void {
    this.ways = names.map((name, k) => (this.ways[k]?.name === name ? this.ways[k] : new WaySeries(name)));
  }

  /** After each chunk of n frames: points for every interval that ended. */
  advance(n: number, stress: WayStress[], output: OutputDistortion): void {
    this.count += n;
    while (this.count >= this.every) {
      for (let w = 0; w < stress.length; w++) {
        const s = stress[w],
          series = this.ways[w];
        series.x.push(s.traceX * 1000);
        series.t.push(s.tempC);
        series.p.push(s.tracePort);
        series.c.push(s.compressionDb);
        s.traceX = s.tracePort = 0;
      }
      const r = output.traceRatio;
      this.residual.push(r > 1e-12 ? 10 * Math.log10(r) : -120);
      output.traceRatio = 0;
      this.count -= this.every;
    }
  }

  traces(): Traces {
    const ways = this.ways.map((w) => ({
      name: w.name,
      excursionMm: w.x.view(),
      coilTempC: w.t.view(),
      portSpeed: w.p.view(),
      compressionDb: w.c.view(),
    }));
    const first = ways[0];
    return {
      hz: this.sampleRate / this.every,
      excursionMm: first.excursionMm,
      coilTempC: first.coilTempC,
      portSpeed: first.portSpeed,
      compressionDb: first.compressionDb,
      residualDb: this.residual.view(),
      ways,
    };
  }

  /** Drops the points so far (live listening keeps only the latest). */
  clear(): void {
    for (const w of this.ways) w.x.n = w.t.n = w.p.n = w.c.n = 0;
    this.residual.n = 0;
  }

  /** From the start again: no points, and the first interval begins now. */
  restart(): void {
    this.clear();
    this.count = 0;
  }
}
