// The fast linear chain at the audio rate: crossover low-pass -> the design's small-signal
// transfer (bilinear biquads) + the flat high band. No stress model. Used for level calibration,
// quick previews and the speed benchmark against a native Web Audio implementation.
import type { SpeakerSystem } from '../system.ts';
import { BiquadCascade, packSections } from '../filters/biquad.ts';
import { designCrossover } from '../filters/crossover.ts';
import { rationalToBiquads } from '../filters/analog.ts';
import { wooferParams } from '../sim/params.ts';
import { speakerTransfer } from '../sim/transfer.ts';
import { baffleStepSection, roomGainSection } from '../filters/room.ts';

export interface LinearChainDesign {
  /** Woofer band: crossover low-pass then the speaker, packed biquads and gain (Pa per volt). */
  woofer: Float64Array;
  wooferGain: number;
  /** High band: high-pass biquads and gain (Pa per volt, sign included), or null. */
  high: Float64Array | null;
  highGain: number;
  passbandPaPerV: number;
}

export function designLinearChain(sys: SpeakerSystem, sampleRate: number): LinearChainDesign {
  const p = wooferParams(sys, 1 / sampleRate, { linear: true });
  const xo = designCrossover(sys.crossover, sampleRate);
  const tf = speakerTransfer(p);
  const spk = rationalToBiquads(tf.num, tf.den, sampleRate);
  const room = roomGainSection(sys.listening.roomGainHz, sampleRate);
  const baffle = baffleStepSection(sys.listening.baffleWidth ?? 0, sampleRate);
  const woofer = packSections([...(xo.lp ? [xo.lp] : []), spk.coef, ...(room ? [room] : []), ...(baffle ? [baffle] : [])]);
  return {
    woofer,
    wooferGain: spk.gain,
    // The baffle shapes the whole front, so the flat high band steps with it.
    high: xo.hp && baffle ? packSections([xo.hp, baffle]) : xo.hp,
    highGain: xo.hpSign * p.passbandPaPerV,
    passbandPaPerV: p.passbandPaPerV,
  };
}

/** Seat pressure (Pa) for input in digital full scale, per channel, at voltsFs volts per full scale. */
export class LinearChain {
  private readonly woofer: BiquadCascade[];
  private readonly high: BiquadCascade[] | null;
  private readonly design: LinearChainDesign;
  private readonly mono: boolean;

  constructor(
    sys: SpeakerSystem,
    sampleRate: number,
    readonly channels: number,
    voltsFs: number,
  ) {
    this.design = designLinearChain(sys, sampleRate);
    this.mono = sys.listening.channels === 'mono-sum' && channels > 1;
    const nw = this.mono ? 1 : channels;
    this.woofer = [];
    for (let c = 0; c < nw; c++) this.woofer.push(new BiquadCascade(this.design.woofer, this.design.wooferGain * voltsFs));
    this.high = this.design.high
      ? Array.from({ length: channels }, () => new BiquadCascade(this.design.high!, this.design.highGain * voltsFs))
      : null;
  }

  get passbandPaPerV(): number {
    return this.design.passbandPaPerV;
  }

  /**
   * Whole-buffer processing. `scratch` must be at least `frames` long. Writes the woofer band and
   * the high band separately when `highOut` is given (for level measurement), else their sum.
   */
  process(inputs: ArrayLike<number>[], outputs: Float64Array[], frames: number, highOut?: Float64Array[]): void {
    const nIn = inputs.length;
    if (this.mono) {
      const w = outputs[0];
      for (let j = 0; j < frames; j++) {
        let s = 0;
        for (let c = 0; c < nIn; c++) s += inputs[c][j];
        w[j] = s / nIn;
      }
      this.woofer[0].processInPlace(w, 0, frames);
      for (let c = 1; c < this.channels; c++) outputs[c].set(w.subarray(0, frames));
    } else {
      for (let c = 0; c < this.channels; c++) {
        const o = outputs[c],
          inp = inputs[Math.min(c, nIn - 1)];
        for (let j = 0; j < frames; j++) o[j] = inp[j];
        this.woofer[c].processInPlace(o, 0, frames);
      }
    }
    if (!this.high) return;
    for (let c = 0; c < this.channels; c++) {
      const inp = inputs[Math.min(c, nIn - 1)];
      if (highOut) {
        const hb = highOut[c];
        for (let j = 0; j < frames; j++) hb[j] = inp[j];
        this.high[c].processInPlace(hb, 0, frames);
      } else {
        const o = outputs[c];
        const hc = this.high[c];
        for (let j = 0; j < frames; j++) o[j] += hc.step(inp[j]);
      }
    }
  }
}
