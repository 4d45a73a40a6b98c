// How far below the audio rate a driver way's large-signal model may run. The model's input is the
// way's drive after its own filter; at the low rate it sees that drive band-limited to KEPT_BAND of
// the low rate (filters/multirate.ts), and its distortion products above half the low rate fold
// back. Both stay out of hearing when everything the way plays above the kept band is at least
// ALIAS_MARGIN_DB below its passband: the products of a component are no louder than the component
// (a distortion ratio of 0 dB, the worst the meters ever report), so what is dropped or folded is
// at least that far down. The way's pressure per volt (its active filter times its driver in its
// box, small signal) is checked from the kept band's edge to the audio rate's Nyquist frequency.
// test/model-rate.test.ts measures the folded products of a loud two-tone against the full rate.
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { wayFilterAt } from '../filters/way-filter.ts';
import { KEPT_BAND } from '../filters/multirate.ts';
import { polyEval } from '../filters/analog.ts';
import { wayParams } from '../sim/ladder.ts';
import { speakerTransfer } from '../sim/transfer.ts';
import { hypot } from '../complex.ts';

/** What the way plays above the kept band stays at least this far below its passband, dB. */
export const ALIAS_MARGIN_DB = 60;
/** The largest step down: 1/8 of the audio rate. */
export const MAX_RATE_FACTOR = 8;
/**
 * The smallest step down. At 1/2 the resamplers cost about what the model saves (measured with
 * `npm run bench -- render`: the model is about 11 biquad sections per sample, the two resamplers
 * about 5 together), so a way that only allows 1/2 stays at the audio rate.
 */
export const MIN_RATE_FACTOR = 4;

/** A way's model rate: 1/factor of the audio rate; its drive keeps `band` (a fraction of the low rate). */
export interface ModelRate {
  factor: number;
  band: number;
}

/** The way's small-signal pressure per volt of drive at f Hz (filter and driver in box), magnitude. */
function wayMagnitude(filter: DriverWay['filter'], num: number[], den: number[], f: number): number {
  const w = 2 * Math.PI * f;
  const h = wayFilterAt(filter, w);
  const [nr, ni] = polyEval(num, 0, w);
  const [dr, di] = polyEval(den, 0, w);
  return hypot(h.re, h.im) * Math.sqrt((nr * nr + ni * ni) / (dr * dr + di * di));
}

/**
 * The highest frequency at which the way plays within ALIAS_MARGIN_DB of its passband, Hz (the
 * Nyquist frequency when it never falls that far), on a grid of 48 points per octave.
 */
export function wayBandHz(sys: SpeakerSystem, way: DriverWay, sampleRate: number): number {
  const p = wayParams(sys, way, 1 / sampleRate, { linear: true });
  const { num, den } = speakerTransfer(p);
  const nyquist = sampleRate / 2;
  const grid: number[] = [];
  for (let f = 10; f < nyquist; f *= 2 ** (1 / 48)) grid.push(f);
  grid.push(nyquist);
  const mag = grid.map((f) => wayMagnitude(way.filter, num, den, f));
  const floor = Math.max(...mag) * 10 ** (-ALIAS_MARGIN_DB / 20);
  let top = grid[0];
  for (let k = 0; k < grid.length; k++) if (mag[k] > floor) top = grid[k + 1] ?? nyquist;
  return top;
}

/**
 * The rate of a way's model: the largest factor (MIN_RATE_FACTOR to MAX_RATE_FACTOR) whose kept
 * band holds everything within ALIAS_MARGIN_DB of the way's passband, else 1 (the audio rate). A
 * passive way runs at the audio rate (its network is part of the model's circuit), as does a way
 * without a low-pass.
 */
export function modelRate(sys: SpeakerSystem, way: DriverWay, sampleRate: number): ModelRate {
  const audio = { factor: 1, band: 0.5 };
  if (way.network || !way.filter.lowpass) return audio;
  const top = wayBandHz(sys, way, sampleRate);
  for (let d = MAX_RATE_FACTOR; d >= MIN_RATE_FACTOR; d /= 2) {
    const low = sampleRate / d;
    // The band in steps of 1/20 of the low rate, so a small edit keeps the way's resamplers.
    if (top <= KEPT_BAND * low) return { factor: d, band: Math.min(KEPT_BAND, Math.ceil((20 * top) / low) / 20) };
  }
  return audio;
}
