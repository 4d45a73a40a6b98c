// A driver way's large-signal model at 1/factor of the audio rate (model-rate.ts chooses the
// factor). Only what the nonlinearity adds is computed at the low rate: the clipped drive and the
// demand are band-limited and decimated, the model and its linear twin run there, and their
// difference (the residual: distortion, compression, the amplifier's clipping), the cone's travel
// and the outlet come back to the audio rate through the interpolator. The way's linear part stays
// at the audio rate (its twin runs on the delayed demand in the way chain), so at low drive the
// way plays exactly what the full-rate model plays, up to rounding, and its response above the
// kept band is untouched.
//
// Timing: the decimator and interpolator are linear-phase with a whole number of audio-rate frames
// of delay, and a first-in first-out buffer of factor - 1 frames lets every block hand out exactly
// as many frames as it took whatever its length (the decimator gives a sample every factor frames).
// `delay` is the sum, in audio-rate frames.
import { cascadeDelay, Downsampler, KEPT_BAND, stageDesigns, Upsampler } from '../filters/multirate.ts';
import type { HalfbandDesign } from '../filters/halfband.ts';
import { LinearRecurrence } from '../sim/linear.ts';
import type { WooferParams } from '../sim/params.ts';
import { WooferSim } from '../sim/woofer.ts';
import { MAX_RATE_FACTOR, MIN_RATE_FACTOR } from './model-rate.ts';
import { keepShape } from '../keep-shape.ts';

/** Stopband of every resampling stage, dB (the drive beyond the band is already ALIAS_MARGIN_DB down). */
const STAGE_ATTEN_DB = 70;
/** The drive's decimator keeps at least this fraction of the low rate (short filters below it anyway). */
const MIN_DRIVE_BAND = 0.1;

/** The decimator's stages for a drive band (fraction of the low rate). */
function driveDesigns(factor: number, band: number): HalfbandDesign[] {
  return stageDesigns(factor, Math.min(KEPT_BAND, Math.max(MIN_DRIVE_BAND, band)), STAGE_ATTEN_DB);
}

/** The residual's interpolator keeps the whole kept band: the distortion products above the drive's band. */
function residualDesigns(factor: number): HalfbandDesign[] {
  return stageDesigns(factor, KEPT_BAND, STAGE_ATTEN_DB);
}

/** Audio-rate frames from the drive in to the residual, travel and outlet out. */
export function lowRateDelay(factor: number, band: number): number {
  // Down, then up; the buffer's factor - 1 frames make up for the decimator handing out its
  // sample at the last frame of each group (checked in test/low-rate-model.test.ts).
  return factor === 1 ? 0 : cascadeDelay(driveDesigns(factor, band)) + cascadeDelay(residualDesigns(factor));
}

/**
 * Frames every driver way is delayed by when models may run at a low rate: the longest any factor
 * and band may need (ways at a smaller delay, or at the audio rate, wait the rest), so the
 * renderer's latency does not change when an edit changes a way's rate.
 */
export function lowRateLatency(lowRate: boolean): number {
  let most = 0;
  if (lowRate) for (let f = MIN_RATE_FACTOR; f <= MAX_RATE_FACTOR; f *= 2) most = Math.max(most, lowRateDelay(f, KEPT_BAND));
  return most;
}

/** Output streams of one block at the audio rate. */
export interface LowRateOut {
  /** Nonlinear minus linear seat pressure, Pa. */
  residual: Float64Array;
  /** Cone excursion, m. */
  x: Float64Array;
  /** The outlet's probe (port flow or radiator travel). */
  outlet: Float64Array;
}

export class LowRateModel {
  readonly factor: number;
  readonly band: number;
  readonly delay: number;
  sim: WooferSim;
  lin: LinearRecurrence;
  private readonly downClip: Downsampler;
  private readonly downDemand: Downsampler;
  private readonly upRes: Upsampler;
  private readonly cLow: Float64Array;
  private readonly dLow: Float64Array;
  private readonly pLow: Float64Array;
  private readonly lLow: Float64Array;
  private readonly xLow: Float64Array;
  private readonly oLow: Float64Array;
  /** Interpolated frames not yet handed out: the residual (`held` of them), travel and outlet (`heldMotion`). */
  private readonly fifo: Float64Array;
  private held: number;
  private readonly fifoX: Float64Array;
  private readonly fifoO: Float64Array;
  private heldMotion: number;
  /** The previous low-rate travel and outlet (the motion is drawn straight between samples). */
  private lastX = 0;
  private lastO = 0;
  /**
   * The clipping stage hands out the demand itself while the drive stays clear of the rail: after
   * `span` such frames both decimators hold the same past, and the demand's one is skipped
   * (`mirrored`) until the two differ again.
   */
  private sameFor = 0;
  private mirrored = false;
  private readonly span: number;

  /**
   * `p`: the model's constants at the low rate (step factor/sampleRate); `band`: the drive's band
   * as a fraction of the low rate (model-rate.ts); `maxBlock`: the longest block.
   */
  constructor(p: WooferParams, factor: number, band: number, maxBlock: number) {
    this.factor = factor;
    this.band = band;
    this.delay = lowRateDelay(factor, band);
    this.sim = new WooferSim(p);
    this.lin = new LinearRecurrence(p);
    const down = driveDesigns(factor, band);
    const up = residualDesigns(factor);
    const low = Math.ceil(maxBlock / factor) + 1;
    this.downClip = new Downsampler(down, maxBlock);
    this.downDemand = new Downsampler(down, maxBlock);
    this.upRes = new Upsampler(up, low);
    this.span = 2 * this.delay + 4;
    this.cLow = new Float64Array(low);
    this.dLow = new Float64Array(low);
    this.pLow = new Float64Array(low);
    this.lLow = new Float64Array(low);
    this.xLow = new Float64Array(low);
    this.oLow = new Float64Array(low);
    this.fifo = new Float64Array(maxBlock + 2 * factor);
    this.held = factor - 1;
    // Low-rate sample m stands for audio frame m·factor + factor - 1 - (down delay); drawn straight
    // from the one before, the motion lines up with the residual after (up delay) - 1 frames.
    const upDelay = cascadeDelay(up);
    this.heldMotion = upDelay - 1;
    if (this.heldMotion < factor - 1) throw new Error('low-rate model: interpolator shorter than its factor');
    this.fifoX = new Float64Array(maxBlock + upDelay + 2 * factor);
    this.fifoO = new Float64Array(maxBlock + upDelay + 2 * factor);
    keepShape(this);
  }

  /**
   * n frames of clipped drive and demand (V, audio rate) in; the residual, travel and outlet of the
   * frames `delay` earlier out. Returns the sum of i^2 over the block, scaled to audio-rate frames
   * (for the coil's heating).
   */
  process(uClip: Float64Array, uDemand: Float64Array, n: number, out: LowRateOut): number {
    let same = true;
    for (let k = 0; k < n; k++)
      if (uClip[k] !== uDemand[k]) {
        same = false;
        break;
      }
    // The two part: the demand's decimator takes the past both had in common.
    if (!same && this.mirrored) {
      this.downDemand.copyFrom(this.downClip);
      this.mirrored = false;
    }
    const m = this.downClip.process(uClip, n, this.cLow);
    if (this.mirrored) this.dLow.set(this.cLow.subarray(0, m));
    else this.downDemand.process(uDemand, n, this.dLow);
    this.sameFor = same ? this.sameFor + n : 0;
    if (this.sameFor >= this.span) this.mirrored = true;
    const i2 = this.sim.processBlock(this.cLow, m, this.pLow, this.xLow, this.oLow);
    this.lin.processBlock(this.dLow, this.lLow, m);
    const p = this.pLow,
      l = this.lLow;
    for (let k = 0; k < m; k++) p[k] -= l[k];
    const f = this.factor,
      fr = this.fifo;
    this.upRes.process(p, m, fr, this.held);
    const total = this.held + m * f;
    out.residual.set(fr.subarray(0, n));
    fr.copyWithin(0, n, total);
    this.held = total - n;
    // The motion: straight lines between low-rate samples.
    const fx = this.fifoX,
      fo = this.fifoO,
      xl = this.xLow,
      ol = this.oLow,
      step = 1 / f;
    let at = this.heldMotion,
      x0 = this.lastX,
      o0 = this.lastO;
    for (let k = 0; k < m; k++) {
      const dx = (xl[k] - x0) * step,
        dp = (ol[k] - o0) * step;
      for (let j = 0; j < f; j++) {
        fx[at] = x0 + j * dx;
        fo[at] = o0 + j * dp;
        at++;
      }
      x0 = xl[k];
      o0 = ol[k];
    }
    this.lastX = x0;
    this.lastO = o0;
    out.x.set(fx.subarray(0, n));
    out.outlet.set(fo.subarray(0, n));
    fx.copyWithin(0, n, at);
    fo.copyWithin(0, n, at);
    this.heldMotion = at - n;
    return i2 * f;
  }
}
