// Planned level -> amplifier volts: the long-term average C-weighted SPL at the seat of a track
// played through the design's own linear chain (so a less sensitive design needs more volts).
import { InputProblem } from '../issues.ts';
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { LinearChain } from '../render/linear-chain.ts';
import { cWeightingFilter } from './weighting.ts';
import { splDbOfMeanSquare } from '../units.ts';
import { drivenPaPerV } from '../design/convert.ts';
import { roomPaths, RoomStage } from '../room/stage.ts';
import { forEachBlock, type LaneHelper, type LevelLaneJob, laneSplit, shareChannels } from '../render/lane-share.ts';
import { SlotRing } from '../render/slot-ring.ts';

/**
 * Passband seat pressure per amplifier volt of the design, Pa/V: its bass way's (the first driver
 * way) with that way's gain. The reference of the default calibration and of level matching.
 */
export function passbandPaPerV(sys: SpeakerSystem): number {
  const bass = sys.ways.find((w): w is DriverWay => w.kind === 'driver');
  if (!bass) throw new InputProblem('the design has no way with a driver');
  return drivenPaPerV(bass.driver, sys.amplifier.rs, sys.air, sys.listening) * bass.filter.gain;
}

/** Frames per block of the calibration pass, and blocks a helper thread may run ahead. */
const LEVEL_BLOCK = 8192;
const LEVEL_BLOCKS_AHEAD = 8;

/** What the calibration weighs, per way and lane: the linear chain at 1 V, the room, C weighting. */
class WeightedSeatPressure {
  private readonly chain: LinearChain;
  /** out[w][lane]: one block of way w's weighted seat pressure in that lane, Pa. */
  readonly out: Float64Array[][];
  /** C weighting after the room (null without a room: the chain weights). */
  private readonly weights: ReturnType<typeof cWeightingFilter>[][] | null;
  private readonly rooms: RoomStage[][] | null;

  constructor(sys: SpeakerSystem, sampleRate: number, nCh: number) {
    // The level at the seat is the level in the room when there is one (channel c from speaker c mod the pair).
    const paths = roomPaths(sys);
    // Without a room between them, the chain runs the C weighting itself, joined to its cascades.
    const weighting = () => cWeightingFilter(sampleRate);
    const chain = new LinearChain(sys, sampleRate, nCh, 1, paths ? undefined : weighting);
    this.chain = chain;
    this.out = chain.ways.map((_, w) => Array.from({ length: chain.laneCount(w) }, () => new Float64Array(LEVEL_BLOCK)));
    this.weights = paths ? chain.ways.map((_, w) => Array.from({ length: chain.laneCount(w) }, weighting)) : null;
    this.rooms =
      paths &&
      chain.ways.map((_, w) => Array.from({ length: chain.laneCount(w) }, (_, c) => new RoomStage(paths[c % paths.length], sampleRate)));
  }

  /** One block of lanes `from` to `to` - 1. */
  run(views: ArrayLike<number>[], n: number, from: number, to: number): void {
    this.chain.process(views, this.out, n, from, to);
    for (let w = 0; w < this.out.length; w++) {
      const end = Math.min(to, this.out[w].length);
      for (let c = from; c < end; c++) {
        const o = this.out[w][c];
        this.rooms?.[w][c].process(o, n);
        this.weights?.[w][c].processInPlace(o, 0, n);
      }
    }
  }

  /** Blocks of the lanes from `split` on, one after the other (a helper thread's share, lane-share.ts). */
  upperLanes(split: number): Float64Array[] {
    const lanes: Float64Array[] = [];
    for (let c = split; ; c++) {
      const ofC = this.out.filter((o) => c < o.length).map((o) => o[c]);
      if (ofC.length === 0) return lanes;
      lanes.push(...ofC);
    }
  }
}

/**
 * Long-term average C-weighted SPL (Leq,C) at the seat for 1 V per full scale. The ways' energies
 * add (as the first version added its woofer's and its upper band's), and so do the two speakers
 * of a pair; in a mono-sum pair the shared bass way counts once. With a helper thread the upper
 * channels' lanes are filtered there; the energies are added here in the same order either way.
 */
export function seatLeqCPerVolt(sys: SpeakerSystem, channels: ArrayLike<number>[], sampleRate: number, helper?: LaneHelper): number {
  const nCh = channels.length;
  const frames = channels[0]?.length ?? 0;
  if (nCh === 0 || frames === 0) throw new InputProblem('the audio is empty: a level cannot be set from silence');
  const seat = new WeightedSeatPressure(sys, sampleRate, nCh);
  const out = seat.out;
  const nWays = out.length;
  const split = helper && nCh > 1 ? laneSplit(nCh) : nCh;
  const remote = seat.upperLanes(split);
  const ring = remote.length > 0 ? new SlotRing(remote.length * LEVEL_BLOCK, LEVEL_BLOCKS_AHEAD) : null;
  if (ring) {
    const reads = channels.map((_, c) => c >= split);
    helper!({ kind: 'level', system: sys, sampleRate, channels: shareChannels(channels, reads), frames, ring: ring.buffers });
  }
  // The blocks to add, in the order the energies have always been added: channel by channel, way
  // by way; a helper's lanes are read where it left them in the ring.
  const order: { w: number; c: number }[] = [];
  for (let c = 0; c < nCh; c++) for (let w = 0; w < nWays; w++) if (c < out[w].length) order.push({ w, c });
  const blocks: Float64Array[] = order.map(({ w, c }) => out[w][c]);
  let energy = 0;
  try {
    const scratch = channels.map(() => new Float32Array(LEVEL_BLOCK));
    forEachBlock(channels, frames, frames, LEVEL_BLOCK, scratch, (views, _s, n) => {
      seat.run(views, n, 0, split);
      const slot = ring?.nextFull();
      if (slot) for (let i = 0, k = 0; i < order.length; i++) if (order[i].c >= split) blocks[i] = slot.subarray(LEVEL_BLOCK * k++);
      energy = addSquares(blocks, n, energy);
      ring?.release();
      return true;
    });
  } finally {
    ring?.stop();
  }
  const ms = energy / frames;
  if (!(ms > 0)) throw new InputProblem('the audio is silent in the band the design plays: a level cannot be set from it');
  return splDbOfMeanSquare(ms);
}

/** energy + the squares of blocks[0][0..n-1], then of blocks[1], ..., added one by one in that order. */
function addSquares(blocks: Float64Array[], n: number, energy: number): number {
  let e = energy;
  for (const o of blocks) for (let j = 0; j < n; j++) e += o[j] * o[j];
  return e;
}

/** A helper thread's part of seatLeqCPerVolt: the upper channels' lanes, block by block into the ring. */
export function runLevelLanes(job: LevelLaneJob, ring: SlotRing): void {
  const nCh = job.channels.length;
  const split = laneSplit(nCh);
  const seat = new WeightedSeatPressure(job.system, job.sampleRate, nCh);
  const lanes = seat.upperLanes(split);
  forEachBlock(
    job.channels,
    job.frames,
    job.frames,
    LEVEL_BLOCK,
    job.channels.map(() => new Float32Array(LEVEL_BLOCK)),
    (views, _s, n) => {
      seat.run(views, n, split, nCh);
      const slot = ring.nextFree();
      if (!slot) return false;
      for (let k = 0; k < lanes.length; k++) slot.set(lanes[k].subarray(0, n), k * LEVEL_BLOCK);
      ring.publish();
      return true;
    },
    job.channels.map((_, c) => c >= split),
  );
}

/** Volts per full scale that make the track's Leq,C at the seat equal splDb. */
export function voltsForSpl(sys: SpeakerSystem, channels: ArrayLike<number>[], sampleRate: number, targetDb: number): number {
  const l1 = seatLeqCPerVolt(sys, channels, sampleRate);
  return Math.pow(10, (targetDb - l1) / 20);
}
