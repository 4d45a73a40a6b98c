// Planned level -> amplifier volts: the long-term average C-weighted SPL at the seat of a track
// played through the design's own linear chain (so a less sensitive design needs more volts).
import { InputProblem } from '../issues.ts';
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { LinearChain } from '../render/linear-chain.ts';
import { cWeightingFilter } from './weighting.ts';
import { splDbOfMeanSquare } from '../units.ts';
import { drivenPaPerV } from '../design/convert.ts';
import { roomPaths, RoomStage } from '../room/stage.ts';

/**
 * Passband seat pressure per amplifier volt of the design, Pa/V: its bass way's (the first driver
 * way) with that way's gain. The reference of the default calibration and of level matching.
 */
export function passbandPaPerV(sys: SpeakerSystem): number {
  const bass = sys.ways.find((w): w is DriverWay => w.kind === 'driver');
  if (!bass) throw new InputProblem('the design has no way with a driver');
  return drivenPaPerV(bass.driver, sys.amplifier.rs, sys.air, sys.listening) * bass.filter.gain;
}

/**
 * Long-term average C-weighted SPL (Leq,C) at the seat for 1 V per full scale. The ways' energies
 * add (as the first version added its woofer's and its upper band's), and so do the two speakers
 * of a pair; in a mono-sum pair the shared bass way counts once.
 */
export function seatLeqCPerVolt(sys: SpeakerSystem, channels: ArrayLike<number>[], sampleRate: number): number {
  const nCh = channels.length;
  const frames = channels[0]?.length ?? 0;
  if (nCh === 0 || frames === 0) throw new InputProblem('the audio is empty: a level cannot be set from silence');
  const chain = new LinearChain(sys, sampleRate, nCh, 1);
  const block = 8192;
  const nWays = chain.ways.length;
  const out = chain.ways.map((_, w) => Array.from({ length: chain.laneCount(w) }, () => new Float64Array(block)));
  const weights = chain.ways.map((_, w) => Array.from({ length: chain.laneCount(w) }, () => cWeightingFilter(sampleRate)));
  // The level at the seat is the level in the room when there is one (channel c from speaker c mod the pair).
  const paths = roomPaths(sys);
  const rooms =
    paths &&
    chain.ways.map((_, w) => Array.from({ length: chain.laneCount(w) }, (_, c) => new RoomStage(paths[c % paths.length], sampleRate)));
  const views: ArrayLike<number>[] = new Array(nCh);
  let energy = 0;
  for (let s = 0; s < frames; s += block) {
    const n = Math.min(block, frames - s);
    for (let c = 0; c < nCh; c++) views[c] = (channels[c] as Float32Array).subarray(s, s + n);
    chain.process(views, out, n);
    for (let c = 0; c < nCh; c++) {
      for (let w = 0; w < nWays; w++) {
        if (c >= out[w].length) continue;
        const o = out[w][c];
        rooms?.[w][c].process(o, n);
        weights[w][c].processInPlace(o, 0, n);
        for (let j = 0; j < n; j++) energy += o[j] * o[j];
      }
    }
  }
  const ms = energy / frames;
  if (!(ms > 0)) throw new InputProblem('the audio is silent in the band the design plays: a level cannot be set from it');
  return splDbOfMeanSquare(ms);
}

/** Volts per full scale that make the track's Leq,C at the seat equal splDb. */
export function voltsForSpl(sys: SpeakerSystem, channels: ArrayLike<number>[], sampleRate: number, targetDb: number): number {
  const l1 = seatLeqCPerVolt(sys, channels, sampleRate);
  return Math.pow(10, (targetDb - l1) / 20);
}
