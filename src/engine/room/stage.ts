// The room as a render stage on the summed seat pressure (room/modes.ts): the Linkwitz-Riley
// high-pass at the transition times the diffuse-field gain, plus the modes' branch: the matching
// low-pass, then the modal sum as a bank of resonators K_n/(s^2 + 2·delta·s + w_n^2) (bilinear,
// each prewarped at its own frequency) plus the constant of the modes above, then the smoothing
// low-pass. After the low-pass the branch holds nothing near the low rate's Nyquist frequency
// (at least 12 times the transition: the fourth-order slope is 62 dB down there), so the bank runs
// on every D-th sample and comes back zero-stuffed through the smoothing filter (images at least
// 56 dB down). A bank at a low rate rather than an FIR: measured cheaper (test/bench/room.ts), no
// latency, no block size. Every mode's numerator is K·(1 + z^-1)^2/A0: (x + 2x1 + x2) is formed once.
import type { SpeakerSystem } from '../system.ts';
import { BiquadCascade } from '../filters/biquad.ts';
import { wayFilterBiquads } from '../filters/way-filter.ts';
import { roomModel, type RoomPath } from './modes.ts';
import { keepShape } from '../keep-shape.ts';

/** The low rate is at least this multiple of the transition frequency. */
const LOW_RATE_TO_TRANSITION = 12;
const MAX_DECIMATION = 32;

/** One speaker's room path on one stream: state carried across blocks, no allocation per block once warm. */
export class RoomStage {
  /** Audio samples per low-rate sample. */
  readonly decimation: number;
  private readonly b0: Float64Array;
  private readonly a1: Float64Array;
  private readonly a2: Float64Array;
  private readonly y1: Float64Array;
  private readonly y2: Float64Array;
  private readonly residual: number;
  private readonly diffuse: number;
  private readonly low: BiquadCascade;
  private readonly smooth: BiquadCascade;
  private readonly high: BiquadCascade;
  private x1 = 0;
  private x2 = 0;
  private phase = 0;
  private branch = new Float64Array(0);
  private u = new Float64Array(0);
  private acc = new Float64Array(0);

  constructor(path: RoomPath, sampleRate: number) {
    let d = 1;
    while (d < MAX_DECIMATION && sampleRate / (2 * d) >= LOW_RATE_TO_TRANSITION * path.transitionHz) d *= 2;
    this.decimation = d;
    const fs = sampleRate / d;
    // Padded to a multiple of 4 modes (zero residues) for the interleaved loop.
    const n = Math.ceil(path.w.length / 4) * 4;
    this.b0 = new Float64Array(n);
    this.a1 = new Float64Array(n);
    this.a2 = new Float64Array(n);
    this.y1 = new Float64Array(n);
    this.y2 = new Float64Array(n);
    for (let i = 0; i < path.w.length; i++) {
      const wn = Math.min(path.w[i], 0.9 * Math.PI * fs);
      const k = wn / Math.tan(wn / (2 * fs));
      const a0 = k * k + 2 * path.delta * k + wn * wn;
      this.b0[i] = path.k[i] / a0;
      this.a1[i] = (2 * (wn * wn - k * k)) / a0;
      this.a2[i] = (k * k - 2 * path.delta * k + wn * wn) / a0;
    }
    this.residual = path.residual;
    this.diffuse = path.diffuseGain;
    this.low = new BiquadCascade(wayFilterBiquads(path.low, sampleRate)!);
    this.smooth = new BiquadCascade(wayFilterBiquads(path.smooth, sampleRate)!);
    this.high = new BiquadCascade(wayFilterBiquads(path.high, sampleRate)!);
    keepShape(this);
  }

  /** The room over buf[0..n-1], in place. */
  process(buf: Float64Array, n: number): void {
    if (this.branch.length < n) {
      this.branch = new Float64Array(n);
      this.u = new Float64Array(n);
      this.acc = new Float64Array(n);
    }
    const d = this.decimation;
    const branch = this.branch;
    branch.set(buf.subarray(0, n));
    this.low.processInPlace(branch, 0, n);
    // Every d-th sample of the low-passed branch, the clock carried across blocks.
    const u = this.u;
    const acc = this.acc;
    const first = (d - this.phase) % d;
    let m = 0;
    let x1 = this.x1;
    let x2 = this.x2;
    for (let j = first; j < n; j += d) {
      const x = branch[j];
      u[m] = x + 2 * x1 + x2;
      acc[m] = this.residual * x;
      x2 = x1;
      x1 = x;
      m++;
    }
    this.x1 = x1;
    this.x2 = x2;
    this.phase = (this.phase + n) % d;
    const { b0, a1, a2, y1, y2 } = this;
    // Four modes per pass: their recursions are independent, so the processor overlaps them.
    for (let i = 0; i < b0.length; i += 4) {
      const bA = b0[i],
        pA = a1[i],
        qA = a2[i],
        bB = b0[i + 1],
        pB = a1[i + 1],
        qB = a2[i + 1],
        bC = b0[i + 2],
        pC = a1[i + 2],
        qC = a2[i + 2],
        bD = b0[i + 3],
        pD = a1[i + 3],
        qD = a2[i + 3];
      let sA = y1[i],
        tA = y2[i],
        sB = y1[i + 1],
        tB = y2[i + 1],
        sC = y1[i + 2],
        tC = y2[i + 2],
        sD = y1[i + 3],
        tD = y2[i + 3];
      for (let j = 0; j < m; j++) {
        const x = u[j];
        const yA = bA * x - pA * sA - qA * tA;
        const yB = bB * x - pB * sB - qB * tB;
        const yC = bC * x - pC * sC - qC * tC;
        const yD = bD * x - pD * sD - qD * tD;
        acc[j] += yA + yB + yC + yD;
        tA = sA;
        sA = yA;
        tB = sB;
        sB = yB;
        tC = sC;
        sC = yC;
        tD = sD;
        sD = yD;
      }
      y1[i] = sA;
      y2[i] = tA;
      y1[i + 1] = sB;
      y2[i + 1] = tB;
      y1[i + 2] = sC;
      y2[i + 2] = tC;
      y1[i + 3] = sD;
      y2[i + 3] = tD;
    }
    // Back to the audio rate: zero-stuffed (times d, the energy the zeros leave out), then smoothed.
    branch.fill(0, 0, n);
    for (let j = first, k = 0; j < n; j += d, k++) branch[j] = d * acc[k];
    this.smooth.processInPlace(branch, 0, n);
    this.high.processInPlace(buf, 0, n);
    const g = this.diffuse;
    for (let j = 0; j < n; j++) buf[j] = branch[j] + g * buf[j];
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
    keepShape(this);
  }

  /**
   * The room on the summed streams; the residual stays their difference. `only` (a renderer whose
   * heard stream never changes and has no side streams): the room on that stream alone, the others
   * left as they are (no one reads them); the heard stream comes out the same sample for sample.
   */
  process(
    streams: { nonlinear: Float64Array[]; linear: Float64Array[]; residual: Float64Array[] },
    n: number,
    only?: 'nonlinear' | 'linear',
  ): void {
    for (let c = 0; c < this.nonlinear.length; c++) {
      const on = streams.nonlinear[c],
        ol = streams.linear[c],
        or = streams.residual[c];
      if (only !== 'linear') this.nonlinear[c].process(on, n);
      if (only !== 'nonlinear') this.linear[c].process(ol, n);
      if (only === undefined) for (let k = 0; k < n; k++) or[k] = on[k] - ol[k];
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
