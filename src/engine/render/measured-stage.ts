// A driver way's measured-response correction in the render: the correction's FIR (the same curve
// the analysis reads, response/measured.ts) on the full model's and the linear twin's pressure,
// so the residual between them stays what the driver adds. Zero latency (fir/partitioned-convolver.ts):
// the way keeps its place in time beside the others, as in the analysis. The two streams go through
// one convolver as a complex pair (one FFT each way for both), in partitions of the render quantum,
// which divides every chunk the renderer hands on.
//
// New taps while playing (an edit on the listening bench) take over without a click: the old FIR
// carries on while the new one fills its history (as many samples as it has taps), then a
// raised-cosine crossfade of SWAP_FADE_S hands over.
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { measuredCorrection } from '../response/frequency.ts';
import { PartitionedConvolver, partitionFor } from '../fir/partitioned-convolver.ts';
import { keepShape } from '../keep-shape.ts';

/** Length of the crossfade from old taps to new, s (common practice for a click-free filter change, no source). */
export const SWAP_FADE_S = 0.02;

export class MeasuredStage {
  private readonly both: PartitionedConvolver;
  /** The stage it replaces (itself perhaps still in a swap), while the swap lasts. */
  private leaving: MeasuredStage | null;
  /** Samples since the swap began; the fade starts once the new FIR's history is full. */
  private swapAt = 0;
  private readonly fadeFrom: number;
  private readonly fadeLength: number;
  private oldN = new Float64Array(0);
  private oldL = new Float64Array(0);

  constructor(
    readonly taps: Float64Array,
    sampleRate: number,
    replaces: MeasuredStage | null = null,
  ) {
    this.both = new PartitionedConvolver(taps, partitionFor(taps.length), 2);
    this.leaving = replaces;
    this.fadeFrom = taps.length;
    this.fadeLength = Math.max(1, Math.round(SWAP_FADE_S * sampleRate));
    keepShape(this);
  }

  process(pN: Float64Array, pL: Float64Array, n: number): void {
    const leaving = this.leaving;
    if (leaving === null) {
      this.both.processPair(pN, pL, n);
      return;
    }
    if (this.oldN.length < n) {
      // Only while a swap lasts, and once per larger block.
      this.oldN = new Float64Array(n);
      this.oldL = new Float64Array(n);
    }
    const oN = this.oldN,
      oL = this.oldL;
    oN.set(pN.subarray(0, n));
    oL.set(pL.subarray(0, n));
    leaving.process(oN, oL, n);
    this.both.processPair(pN, pL, n);
    const from = this.fadeFrom,
      len = this.fadeLength;
    let t = this.swapAt;
    for (let k = 0; k < n; k++, t++) {
      const u = (t - from) / len;
      const w = u <= 0 ? 0 : u >= 1 ? 1 : 0.5 - 0.5 * Math.cos(Math.PI * u);
      pN[k] = oN[k] + w * (pN[k] - oN[k]);
      pL[k] = oL[k] + w * (pL[k] - oL[k]);
    }
    this.swapAt = t;
    if (t >= from + len) this.leaving = null;
  }
}

/**
 * The way's stage at this rate, or null without a measured response; the old one carries on when
 * its taps are the same, and hands over through a crossfade when they are not.
 */
export function measuredStage(sys: SpeakerSystem, way: DriverWay, sampleRate: number, old: MeasuredStage | null): MeasuredStage | null {
  const taps = measuredCorrection(sys, way)?.taps(sampleRate);
  if (!taps) return null;
  if (old && (old.taps === taps || (old.taps.length === taps.length && old.taps.every((t, i) => t === taps[i])))) return old;
  return new MeasuredStage(taps, sampleRate, old);
}
