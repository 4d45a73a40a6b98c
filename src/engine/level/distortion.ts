// The sliding-window distortion measure behind the `distortion` stress event: the energy of the
// residual (nonlinear minus linear output) relative to the energy of the output, both averaged by
// one-pole filters with the same time constant.

export class ResidualMeter {
  private readonly alpha: number;
  eOut = 0;
  eRes = 0;

  constructor(sampleRate: number, windowS: number) {
    this.alpha = 1 - Math.exp(-1 / (windowS * sampleRate));
  }

  reset(): void {
    this.eOut = this.eRes = 0;
  }

  /**
   * Feeds n samples of output and residual; ratio[k] becomes max(ratio[k], eRes/eOut) wherever the
   * output energy exceeds floor2 (a mean-square floor, same units squared).
   */
  processBlock(out: Float64Array, res: Float64Array, n: number, floor2: number, ratio: Float64Array): void {
    const a = this.alpha;
    let eOut = this.eOut,
      eRes = this.eRes;
    for (let k = 0; k < n; k++) {
      eOut += a * (out[k] * out[k] - eOut);
      eRes += a * (res[k] * res[k] - eRes);
      if (eOut > floor2) {
        const r = eRes / eOut;
        if (r > ratio[k]) ratio[k] = r;
      }
    }
    this.eOut = eOut;
    this.eRes = eRes;
  }
}

/** Amplitude of the component at f Hz (Goertzel over whole periods of the window), for tests and reports. */
export function toneAmplitude(x: ArrayLike<number>, start: number, length: number, f: number, sampleRate: number): number {
  const w = (2 * Math.PI * f) / sampleRate;
  let c = 0,
    s = 0;
  for (let k = 0; k < length; k++) {
    const v = x[start + k];
    c += v * Math.cos(w * k);
    s += v * Math.sin(w * k);
  }
  return (2 * Math.hypot(c, s)) / length;
}
