// A driver way's measured-response correction in the render: the correction's FIR (the same curve
// the analysis reads, response/measured.ts) on the full model's and the linear twin's pressure,
// so the residual between them stays what the driver adds. Zero latency (fir/partitioned-convolver.ts):
// the way keeps its place in time beside the others, as in the analysis.
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { measuredCorrection } from '../response/frequency.ts';
import { PartitionedConvolver } from '../fir/partitioned-convolver.ts';

export class MeasuredStage {
  private readonly full: PartitionedConvolver;
  private readonly linear: PartitionedConvolver;

  constructor(readonly taps: Float64Array) {
    this.full = new PartitionedConvolver(taps);
    this.linear = new PartitionedConvolver(taps);
  }

  process(pN: Float64Array, pL: Float64Array, n: number): void {
    this.full.process(pN, n);
    this.linear.process(pL, n);
  }
}

/** The way's stage at this rate, or null without a measured response; the old one carries on when its taps are the same. */
export function measuredStage(sys: SpeakerSystem, way: DriverWay, sampleRate: number, old: MeasuredStage | null): MeasuredStage | null {
  const taps = measuredCorrection(sys, way)?.taps(sampleRate);
  if (!taps) return null;
  if (old && (old.taps === taps || (old.taps.length === taps.length && old.taps.every((t, i) => t === taps[i])))) return old;
  return new MeasuredStage(taps);
}
