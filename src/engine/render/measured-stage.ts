// A driver way's measured-response correction in the render: the correction's FIR (the same curve
// the analysis reads, response/measured.ts) on the full model's and the linear twin's pressure,
// so the residual between them stays what the driver adds. Zero latency (fir/partitioned-convolver.ts):
// the way keeps its place in time beside the others, as in the analysis. The two streams go through
// one convolver as a complex pair (one FFT each way for both), in partitions of the render quantum,
// which divides every chunk the renderer hands on.
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { measuredCorrection } from '../response/frequency.ts';
import { PartitionedConvolver, partitionFor } from '../fir/partitioned-convolver.ts';

export class MeasuredStage {
  private readonly both: PartitionedConvolver;

  constructor(readonly taps: Float64Array) {
    this.both = new PartitionedConvolver(taps, partitionFor(taps.length), 2);
  }

  process(pN: Float64Array, pL: Float64Array, n: number): void {
    this.both.processPair(pN, pL, n);
  }
}

/** The way's stage at this rate, or null without a measured response; the old one carries on when its taps are the same. */
export function measuredStage(sys: SpeakerSystem, way: DriverWay, sampleRate: number, old: MeasuredStage | null): MeasuredStage | null {
  const taps = measuredCorrection(sys, way)?.taps(sampleRate);
  if (!taps) return null;
  if (old && (old.taps === taps || (old.taps.length === taps.length && old.taps.every((t, i) => t === taps[i])))) return old;
  return new MeasuredStage(taps);
}
