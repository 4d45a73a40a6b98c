// The output stage: seat pressure -> digital full scale by one calibration factor, then the
// true-peak guard (one for the heard stream, and one each for the side streams when asked for).
import { TruePeakGuard } from '../level/truepeak.ts';
import { keepShape } from '../keep-shape.ts';

export type RenderMode = 'nonlinear' | 'linear' | 'residual';
export type SampleBuffer = Float32Array | Float64Array;

export interface SideStreams {
  linear?: SampleBuffer[];
  residual?: SampleBuffer[];
}

export class OutputGuard {
  private readonly main: TruePeakGuard;
  private readonly linear: TruePeakGuard | null;
  private readonly residual: TruePeakGuard | null;

  constructor(channels: number, sampleRate: number, sideStreams: boolean) {
    this.main = new TruePeakGuard(channels, sampleRate);
    this.linear = sideStreams ? new TruePeakGuard(channels, sampleRate) : null;
    this.residual = sideStreams ? new TruePeakGuard(channels, sampleRate) : null;
    keepShape(this);
  }

  /** Frames of look-ahead delay. */
  get latency(): number {
    return this.main.latency;
  }

  /** How far the heard stream's guard has turned the level down, dB. */
  reductionDb(): number {
    return this.main.reductionDb();
  }

  reset(): void {
    this.main.reset();
    this.linear?.reset();
    this.residual?.reset();
  }

  /** Pressures (Pa) of the three streams -> outputs[c][s..s+n-1] at `scale` full scale per Pa. */
  write(
    mode: RenderMode,
    streams: { nonlinear: Float64Array[]; linear: Float64Array[]; residual: Float64Array[] },
    n: number,
    scale: number,
    outputs: SampleBuffer[],
    s: number,
    extra?: SideStreams,
  ): void {
    this.main.processBlock(streams[mode], n, scale, outputs, s);
    if (extra?.linear && this.linear) this.linear.processBlock(streams.linear, n, scale, extra.linear, s);
    if (extra?.residual && this.residual) this.residual.processBlock(streams.residual, n, scale, extra.residual, s);
  }
}
