// Planned level -> amplifier volts: the long-term average C-weighted SPL at the seat of a track
// played through the design's own linear chain (so a less sensitive design needs more volts).
import type { SpeakerSystem } from '../system.ts';
import { LinearChain } from '../render/linear-chain.ts';
import { cWeightingFilter } from './weighting.ts';
import { splDbOfMeanSquare } from '../units.ts';

/**
 * Long-term average C-weighted SPL (Leq,C) at the seat for 1 V per full scale. Pair: the two
 * speakers' energies add at the seat; mono-sum: the one subwoofer plus each channel's high band.
 */
export function seatLeqCPerVolt(sys: SpeakerSystem, channels: ArrayLike<number>[], sampleRate: number): number {
  const nCh = channels.length;
  const frames = channels[0]?.length ?? 0;
  if (nCh === 0 || frames === 0) throw new RangeError('the audio is empty: a level cannot be set from silence');
  const chain = new LinearChain(sys, sampleRate, nCh, 1);
  const mono = sys.listening.channels === 'mono-sum' && nCh > 1;
  const block = 8192;
  const out = Array.from({ length: nCh }, () => new Float64Array(block));
  const high = Array.from({ length: nCh }, () => new Float64Array(block));
  const wOut = Array.from({ length: nCh }, () => cWeightingFilter(sampleRate));
  const wHigh = Array.from({ length: nCh }, () => cWeightingFilter(sampleRate));
  const views: ArrayLike<number>[] = new Array(nCh);
  let energy = 0;
  for (let s = 0; s < frames; s += block) {
    const n = Math.min(block, frames - s);
    for (let c = 0; c < nCh; c++) views[c] = (channels[c] as Float32Array).subarray(s, s + n);
    chain.process(views, out, n, high);
    for (let c = 0; c < nCh; c++) {
      if (!mono || c === 0) {
        wOut[c].processInPlace(out[c], 0, n);
        for (let j = 0; j < n; j++) energy += out[c][j] * out[c][j];
      }
      wHigh[c].processInPlace(high[c], 0, n);
      for (let j = 0; j < n; j++) energy += high[c][j] * high[c][j];
    }
  }
  const ms = energy / frames;
  if (!(ms > 0)) throw new RangeError('the audio is silent in the band the design plays: a level cannot be set from it');
  return splDbOfMeanSquare(ms);
}

/** Volts per full scale that make the track's Leq,C at the seat equal splDb. */
export function voltsForSpl(sys: SpeakerSystem, channels: ArrayLike<number>[], sampleRate: number, targetDb: number): number {
  const l1 = seatLeqCPerVolt(sys, channels, sampleRate);
  return Math.pow(10, (targetDb - l1) / 20);
}
