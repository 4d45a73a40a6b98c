// The fast linear chain at the audio rate, per way: the way's filter -> the driver in its box as a
// small-signal transfer (bilinear biquads) with room gain, or the flat band -> the baffle step, at
// the way's pressure per volt (polarity and gain included). No stress model and no delays: level
// calibration adds the ways' energies, which a delay does not change. Also the speed benchmark's
// subject against a native Web Audio implementation.
import type { DriverWay, SpeakerSystem, Way } from '../system.ts';
import { BiquadCascade, JoinedCascade, packSections } from '../filters/biquad.ts';
import { CASCADE_PAIR_MAX_FRAMES, cascadesPairable, processCascadePair } from '../filters/cascade-pair.ts';
import { wayFilterBiquads } from '../filters/way-filter.ts';
import { rationalToBiquads } from '../filters/analog.ts';
import type { WooferParams } from '../sim/params.ts';
import { LinearBehindLadder, wayParams } from '../sim/ladder.ts';
import { LinearRecurrence } from '../sim/linear.ts';
import { speakerTransfer } from '../sim/transfer.ts';
import { baffleStepSection, roomGainSection } from '../filters/room.ts';
import { measuredCorrection } from '../response/frequency.ts';
import { PartitionedConvolver } from '../fir/partitioned-convolver.ts';
import { keepShape } from '../keep-shape.ts';
import { copySamples } from './copy-samples.ts';

export interface LinearWayDesign {
  name: string;
  /** Packed biquads: the way's filter, the driver in its box and the room gain (driver ways), the baffle step. */
  coef: Float64Array;
  /** Seat pressure per volt, Pa/V, with the way's polarity and gain. */
  gain: number;
  /** Played from the channels' mean (the bass way of a mono-sum pair). */
  monoSum: boolean;
  /**
   * A passive way: the driver's state-space twin behind its network runs before `coef` (which then
   * holds the room gain and baffle step only) and `gain` is its polarity.
   */
  passive?: { way: DriverWay; params: WooferParams; rs: number };
}

function designWay(sys: SpeakerSystem, way: Way, monoSum: boolean, sampleRate: number): LinearWayDesign {
  const filter = wayFilterBiquads(way.filter, sampleRate);
  const baffle = baffleStepSection(sys.listening.baffleWidth ?? 0, sampleRate);
  const parts = (...secs: (Float64Array | null)[]) => packSections(secs.filter((s): s is Float64Array => s !== null));
  if (way.kind === 'flat') {
    // The first version's flat band: its sign times its Pa/V, then the gain (exact when 1).
    return { name: way.name, coef: parts(filter, baffle), gain: way.polarity * way.paPerV * way.filter.gain, monoSum };
  }
  const p = wayParams(sys, way, 1 / sampleRate, { linear: true });
  const room = roomGainSection(sys.listening.roomGainHz, sampleRate);
  if (way.network) {
    // A network's response depends on the driver's impedance: run the circuit, not a transfer.
    return { name: way.name, coef: parts(room, baffle), gain: way.polarity, monoSum, passive: { way, params: p, rs: sys.amplifier.rs } };
  }
  const tf = speakerTransfer(p);
  const spk = rationalToBiquads(tf.num, tf.den, sampleRate);
  return { name: way.name, coef: parts(filter, spk.coef, room, baffle), gain: spk.gain * way.filter.gain * way.polarity, monoSum };
}

/** Every way's linear chain; with `monoSum` the first driver way of a mono-sum pair plays the channels' mean. */
export function designLinearChain(
  sys: SpeakerSystem,
  sampleRate: number,
  monoSum = sys.listening.channels === 'mono-sum',
): LinearWayDesign[] {
  const bass = sys.ways.find((w) => w.kind === 'driver');
  return sys.ways.map((way) => designWay(sys, way, monoSum && way === bass, sampleRate));
}

/**
 * Seat pressure (Pa) of each way for input in digital full scale, per channel, at voltsFs volts per
 * full scale; with `after`, each lane's pressure then goes through a filter of its own made by it
 * (the calibration's C weighting), run joined with the lane's cascade where no measured FIR sits
 * between them (the same numbers, about twice as fast: filters/biquad.ts JoinedCascade).
 */
export class LinearChain {
  readonly ways: LinearWayDesign[];
  /** Per way, one cascade per lane (one lane for a shared way), joined with `after` where nothing sits between them. */
  private readonly lanes: (BiquadCascade | JoinedCascade)[][];
  /** Per way, per lane: `after` where a measured FIR sits between it and the cascade (null elsewhere). */
  private readonly afterFir: (BiquadCascade | null)[][];
  /** Per way, per lane: a passive way's driver behind its network (null for the others). */
  private readonly circuits: (LinearBehindLadder | null)[][];
  /** Per way, per lane: a measured response's FIR (null without one). */
  private readonly measured: (PartitionedConvolver | null)[][];
  /** Ways run two at a time, channel by channel, in the two-lane loop (filters/cascade-pair.ts). */
  private readonly pairs: [number, number][] = [];

  constructor(
    sys: SpeakerSystem,
    sampleRate: number,
    readonly channels: number,
    private readonly voltsFs: number,
    after?: () => BiquadCascade,
  ) {
    keepShape(this);
    this.ways = designLinearChain(sys, sampleRate, sys.listening.channels === 'mono-sum' && channels > 1);
    const fir = sys.ways.map((way) => (way.kind === 'driver' ? measuredCorrection(sys, way) : null));
    this.lanes = this.ways.map((w, k) =>
      Array.from({ length: w.monoSum ? 1 : channels }, () => {
        const own = new BiquadCascade(w.coef, w.passive ? w.gain : w.gain * voltsFs);
        return after && !fir[k] ? new JoinedCascade([own, after()]) : own;
      }),
    );
    this.afterFir = this.lanes.map((lanes, k) => lanes.map(() => (after && fir[k] ? after() : null)));
    this.circuits = this.ways.map((w, k) =>
      this.lanes[k].map(() => {
        const pw = w.passive;
        return pw ? new LinearBehindLadder(new LinearRecurrence(pw.params), pw.way.network!, pw.rs, pw.params.h) : null;
      }),
    );
    this.measured = fir.map((correction, k) => {
      const taps = correction?.taps(sampleRate);
      return this.lanes[k].map(() => (taps ? new PartitionedConvolver(taps) : null));
    });
    // Ways of plain joined cascades, one lane per channel, go two by two.
    const plain = this.ways.flatMap((w, k) => {
      const first = this.lanes[k][0];
      return !w.monoSum && !w.passive && !fir[k] && first instanceof JoinedCascade ? [k] : [];
    });
    for (let i = 0; i + 1 < plain.length; i += 2) {
      const [a, b] = [plain[i], plain[i + 1]];
      if (cascadesPairable(this.lanes[a][0] as JoinedCascade, this.lanes[b][0] as JoinedCascade)) this.pairs.push([a, b]);
    }
  }

  /** A passive way's circuit over one lane's block, in place: full scale to volts to seat pressure. */
  private circuit(w: number, lane: number, o: Float64Array, frames: number): void {
    const c = this.circuits[w][lane];
    if (!c) return;
    for (let j = 0; j < frames; j++) o[j] *= this.voltsFs;
    c.processBlock(o, o, frames);
  }

  /** Lanes of way w: 1 for a shared way, else one per channel. */
  laneCount(w: number): number {
    return this.lanes[w].length;
  }

  /**
   * Whole-buffer processing: out[w][lane][0..frames-1] receives way w's pressure in that lane, for
   * lanes `from` to `to` - 1 (default: all; a shared lane counts as lane 0).
   */
  process(inputs: ArrayLike<number>[], out: Float64Array[][], frames: number, from = 0, to = Infinity): void {
    const nIn = inputs.length;
    const paired = frames <= CASCADE_PAIR_MAX_FRAMES;
    if (paired) {
      for (const [a, b] of this.pairs) {
        const end = Math.min(to, this.lanes[a].length);
        for (let c = from; c < end; c++) {
          const inp = inputs[Math.min(c, nIn - 1)];
          processCascadePair(this.lanes[a][c] as JoinedCascade, this.lanes[b][c] as JoinedCascade, inp, frames, out[a][c], out[b][c]);
        }
      }
    }
    for (let w = 0; w < this.lanes.length; w++) {
      if (paired && this.pairs.some((p) => p[0] === w || p[1] === w)) continue;
      const lanes = this.lanes[w];
      if (this.ways[w].monoSum) {
        if (from > 0) continue;
        const o = out[w][0];
        for (let j = 0; j < frames; j++) {
          let s = 0;
          for (let c = 0; c < nIn; c++) s += inputs[c][j];
          o[j] = s / nIn;
        }
        this.circuit(w, 0, o, frames);
        lanes[0].processInPlace(o, 0, frames);
        this.measured[w][0]?.process(o, frames);
        this.afterFir[w][0]?.processInPlace(o, 0, frames);
        continue;
      }
      const end = Math.min(to, lanes.length);
      for (let c = from; c < end; c++) {
        const o = out[w][c],
          inp = inputs[Math.min(c, nIn - 1)];
        copySamples(o, inp, 0, frames);
        this.circuit(w, c, o, frames);
        lanes[c].processInPlace(o, 0, frames);
        this.measured[w][c]?.process(o, frames);
        this.afterFir[w][c]?.processInPlace(o, 0, frames);
      }
    }
  }
}
