// The room as a render stage on the summed seat pressure: the modal sum as a bank of resonators
// K_n/(s^2 + 2·delta·s + w_n^2) (each by the bilinear transform prewarped at its own frequency),
// plus the constant of the modes above, through the Linkwitz-Riley low-pass at the transition,
// added to the diffuse-field gain through the matching high-pass (room/modes.ts). A bank rather than
// an FIR: it has no latency, no block size and costs nothing to update (test/bench/room.bench.ts
// measures it). Every mode's numerator is K·(1 + z^-1)^2/A0, so (x + 2x1 + x2) is formed once.
import type { SpeakerSystem } from '../system.ts';
import { BiquadCascade } from '../filters/biquad.ts';
import { wayFilterBiquads } from '../filters/way-filter.ts';
import { roomModel, type RoomPath } from './modes.ts';

/** One speaker's room path on one stream: state carried across blocks, no allocation per block once warm. */
export class RoomStage {
  private readonly b0: Float64Array;
  private readonly a1: Float64Array;
  private readonly a2: Float64Array;
  private readonly y1: Float64Array;
  private readonly y2: Float64Array;
  private readonly residual: number;
  private readonly diffuse: number;
  private readonly low: BiquadCascade;
  private readonly high: BiquadCascade;
  private x1 = 0;
  private x2 = 0;
  private u = new Float64Array(0);
  private acc = new Float64Array(0);

  constructor(path: RoomPath, sampleRate: number) {
    const n = path.w.length;
    this.b0 = new Float64Array(n);
    this.a1 = new Float64Array(n);
    this.a2 = new Float64Array(n);
    this.y1 = new Float64Array(n);
    this.y2 = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const wn = Math.min(path.w[i], 0.9 * Math.PI * sampleRate);
      const k = wn / Math.tan(wn / (2 * sampleRate));
      const a0 = k * k + 2 * path.delta * k + wn * wn;
      this.b0[i] = path.k[i] / a0;
      this.a1[i] = (2 * (wn * wn - k * k)) / a0;
      this.a2[i] = (k * k - 2 * path.delta * k + wn * wn) / a0;
    }
    this.residual = path.residual;
    this.diffuse = path.diffuseGain;
    this.low = new BiquadCascade(wayFilterBiquads(path.low, sampleRate)!);
    this.high = new BiquadCascade(wayFilterBiquads(path.high, sampleRate)!);
  }

  /** The room over buf[0..n-1], in place. */
  process(buf: Float64Array, n: number): void {
    if (this.u.length < n) {
      this.u = new Float64Array(n);
      this.acc = new Float64Array(n);
    }
    const u = this.u;
    const acc = this.acc;
    let x1 = this.x1;
    let x2 = this.x2;
    for (let j = 0; j < n; j++) {
      const x = buf[j];
      u[j] = x + 2 * x1 + x2;
      acc[j] = this.residual * x;
      x2 = x1;
      x1 = x;
    }
    this.x1 = x1;
    this.x2 = x2;
    const { b0, a1, a2, y1, y2 } = this;
    for (let i = 0; i < b0.length; i++) {
      const b = b0[i],
        p1 = a1[i],
        p2 = a2[i];
      let s1 = y1[i],
        s2 = y2[i];
      for (let j = 0; j < n; j++) {
        const y = b * u[j] - p1 * s1 - p2 * s2;
        acc[j] += y;
        s2 = s1;
        s1 = y;
      }
      y1[i] = s1;
      y2[i] = s2;
    }
    this.low.processInPlace(acc, 0, n);
    this.high.processInPlace(buf, 0, n);
    const g = this.diffuse;
    for (let j = 0; j < n; j++) buf[j] = acc[j] + g * buf[j];
  }
}

/** The room stages of a renderer: one per channel and stream; channel c plays from speaker c mod the pair. */
export class RoomStreams {
  private readonly nonlinear: RoomStage[];
  private readonly linear: RoomStage[];

  constructor(paths: RoomPath[], channels: number, sampleRate: number) {
    const make = () => Array.from({ length: channels }, (_, c) => new RoomStage(paths[c % paths.length], sampleRate));
    this.nonlinear = make();
    this.linear = make();
  }

  /** The room on the summed streams; the residual stays their difference. */
  process(streams: { nonlinear: Float64Array[]; linear: Float64Array[]; residual: Float64Array[] }, n: number): void {
    for (let c = 0; c < this.nonlinear.length; c++) {
      const on = streams.nonlinear[c],
        ol = streams.linear[c],
        or = streams.residual[c];
      this.nonlinear[c].process(on, n);
      this.linear[c].process(ol, n);
      for (let k = 0; k < n; k++) or[k] = on[k] - ol[k];
    }
  }
}

/** The room's paths of a design (one per speaker), or null when it has no room. */
export function roomPaths(sys: SpeakerSystem): RoomPath[] | null {
  return roomModel(sys.listening, sys.air)?.paths ?? null;
}

/** What the room stage depends on: a design edit elsewhere keeps the running resonators. */
const roomKey = (sys: SpeakerSystem): string =>
  sys.listening.room ? JSON.stringify([sys.listening.room, sys.listening.distance, sys.listening.omega, sys.air.c]) : '';

/** The room stages for a design: `previous` when its room is unchanged, new ones otherwise, null without a room. */
export function roomStreamsFor(
  sys: SpeakerSystem,
  channels: number,
  sampleRate: number,
  previous: { key: string; streams: RoomStreams } | null,
): { key: string; streams: RoomStreams } | null {
  const key = roomKey(sys);
  if (!key) return null;
  if (previous?.key === key) return previous;
  return { key, streams: new RoomStreams(roomPaths(sys)!, channels, sampleRate) };
}
