// The listening bench's lanes: A, B and the reference render side by side on the same input, all
// the time, so switching is sample-synchronous. The heard lane changes only at a block boundary,
// through a short linear crossfade (the lanes carry the same music, so their sum stays level).
// Pure: no DOM, no Web Audio; the worklet processor and the Node tests both drive it.

export type LaneId = 'a' | 'b' | 'ref';
export const LANE_IDS: LaneId[] = ['a', 'b', 'ref'];

/** What the mixer needs of a renderer: a block of planar input in, a block of planar output out. */
export interface BlockRenderer {
  process(input: readonly Float32Array[], output: Float32Array[], frames: number): void;
}

/** Crossfade length, s: short enough to feel instant, long enough to hide the step. */
export const CROSSFADE_S = 0.005;

export class LaneMixer {
  private readonly scratch: Float32Array[][];
  private heard: LaneId = 'a';
  /** The lane being faded to (equal to `heard` when no fade runs). */
  private target: LaneId = 'a';
  private requested: LaneId = 'a';
  /** Frames into the running crossfade; 0 when none runs. */
  private fadePos = 0;
  private readonly fadeLen: number;
  /** Linear gain per lane (level matching) and for the monitor. */
  readonly laneGain: Record<LaneId, number> = { a: 1, b: 1, ref: 1 };
  monitorGain = 0;
  /** Frames processed so far. */
  frame = 0;
  /** The frame at which the last crossfade began: always a block boundary. */
  lastSwitchFrame = -1;

  constructor(
    private readonly renderers: Record<LaneId, BlockRenderer>,
    private readonly channels: number,
    sampleRate: number,
    maxFrames = 128,
  ) {
    this.fadeLen = Math.max(1, Math.round(CROSSFADE_S * sampleRate));
    this.scratch = LANE_IDS.map(() => Array.from({ length: channels }, () => new Float32Array(maxFrames)));
  }

  get lane(): LaneId {
    return this.requested;
  }

  /** The lane heard now (before any requested switch has begun). */
  get heardLane(): LaneId {
    return this.heard;
  }

  /** Crossfade length in frames. */
  get fadeFrames(): number {
    return this.fadeLen;
  }

  /** True while a crossfade runs. */
  get fading(): boolean {
    return this.fadePos > 0;
  }

  /** The last block one lane rendered, before any gain (for meters and switch checks). */
  laneBlock(lane: LaneId): readonly Float32Array[] {
    return this.scratch[LANE_IDS.indexOf(lane)];
  }

  /** Takes effect at the start of the next block (after any crossfade already running). */
  select(lane: LaneId): void {
    this.requested = lane;
  }

  process(input: readonly Float32Array[], output: Float32Array[], frames: number): void {
    for (let l = 0; l < LANE_IDS.length; l++) this.renderers[LANE_IDS[l]].process(input, this.scratch[l], frames);
    if (this.fadePos === 0 && this.requested !== this.heard) {
      this.target = this.requested;
      this.fadePos = 1;
      this.lastSwitchFrame = this.frame;
    }
    const from = this.scratch[LANE_IDS.indexOf(this.heard)];
    const to = this.scratch[LANE_IDS.indexOf(this.target)];
    const gFrom = this.laneGain[this.heard] * this.monitorGain;
    const gTo = this.laneGain[this.target] * this.monitorGain;
    let pos = this.fadePos;
    for (let c = 0; c < output.length; c++) {
      const src = Math.min(c, this.channels - 1);
      const out = output[c];
      const a = from[src];
      const b = to[src];
      pos = this.fadePos;
      for (let k = 0; k < frames; k++) {
        if (pos > 0) {
          const w = pos / this.fadeLen;
          out[k] = (1 - w) * gFrom * a[k] + w * gTo * b[k];
          pos = pos >= this.fadeLen ? 0 : pos + 1;
        } else {
          out[k] = gTo * b[k];
        }
      }
    }
    if (this.fadePos > 0 && (pos === 0 || output.length === 0)) this.heard = this.target;
    this.fadePos = output.length === 0 ? 0 : pos;
    this.frame += frames;
  }
}
