// Two threads for one render: the channel lanes of every way are independent until the ways are
// summed, so a second thread (the helper) runs the upper lanes (channels from `split` on) of the
// way chains, or of the calibration's linear chain, and hands each chunk's results over through a
// SlotRing; the calling thread runs the lower lanes, takes the helper's, and does everything that
// joins the lanes (sums, meters, events, the room, the guard) as before. Each lane is computed by
// the same code on the same input either way, so the output is bit for bit the single thread's.
// A shared (mono-sum) lane reads every channel: it always stays on the calling thread.
//
// The engine does not start threads: the shell passes a LaneHelper, a function that starts
// runLaneJob(job) (lane-helper.ts) on another thread, and the engine waits on the ring for it.
import type { SpeakerSystem } from '../system.ts';
import type { SlotRingBuffers } from './slot-ring.ts';
import { CHUNK, DriverWayChain, type FlatWayChain } from './way-chain.ts';
import type { DriverRate, RenderMode } from './renderer.ts';

/** Starts runLaneJob(job) on another thread and returns at once. */
export type LaneHelper = (job: LaneJob) => void;

/** What the helper's renderer is made with: the calling thread's own options. */
export interface HelperRendererOptions {
  sampleRate: number;
  channels: number;
  voltsFs: number;
  mode?: RenderMode;
  extraStreams?: boolean;
  driverRate?: DriverRate;
  fixedMode?: boolean;
}

interface LaneJobBase {
  system: SpeakerSystem;
  sampleRate: number;
  /** The input, shared memory for the helper's channels (the others may be empty). */
  channels: Float32Array[];
  frames: number;
  ring: SlotRingBuffers;
}

/** The upper lanes of a render's way chains, block by block as renderBuffer feeds them. */
export interface RenderLaneJob extends LaneJobBase {
  kind: 'render';
  renderer: HelperRendererOptions;
  /** Frames fed in all (the input and the latency's zeros after it) and per block. */
  total: number;
  block: number;
}

/** The upper lanes of the calibration's weighted seat pressure (level/calibration.ts). */
export interface LevelLaneJob extends LaneJobBase {
  kind: 'level';
}

export type LaneJob = RenderLaneJob | LevelLaneJob;

/** The first channel whose lanes the helper runs: the upper half. */
export function laneSplit(channels: number): number {
  return Math.ceil(channels / 2);
}

const sharedCopies = new WeakMap<object, Float32Array>();

/**
 * The channels as the helper reads them: shared memory as it is; a copy in shared memory for the
 * helper's channels that are not (kept while the original lives, so a headroom search copies once).
 */
export function shareChannels(channels: ArrayLike<number>[], split: number): Float32Array[] {
  return channels.map((ch, c) => {
    if (ch instanceof Float32Array && ch.buffer instanceof SharedArrayBuffer) return ch;
    if (c < split) return new Float32Array(0);
    let copy = sharedCopies.get(ch);
    if (!copy) {
      copy = new Float32Array(new SharedArrayBuffer(ch.length * 4));
      for (let j = 0; j < ch.length; j++) copy[j] = ch[j];
      sharedCopies.set(ch, copy);
    }
    return copy;
  });
}

type WayChain = DriverWayChain | FlatWayChain;

/** Per driver lane: its seat pressures, cone travel, outlet, delayed demand, and the coil's R and rise. */
const DRIVER_ARRAYS = 5;
const DRIVER_DOUBLES = DRIVER_ARRAYS * CHUNK + 2;

/** Doubles of one chunk of the helper's lanes (0: it would have none). */
export function helperLaneDoubles(chains: WayChain[], split: number): number {
  let d = 0;
  for (const chain of chains) {
    if (chain instanceof DriverWayChain) d += Math.max(0, chain.lanes.length - split) * DRIVER_DOUBLES;
    else d += Math.max(0, chain.out.length - split) * CHUNK;
  }
  return d;
}

function put(slot: Float64Array, at: number, src: Float64Array, n: number): void {
  for (let k = 0; k < n; k++) slot[at + k] = src[k];
}

function take(slot: Float64Array, at: number, dst: Float64Array, n: number): void {
  for (let k = 0; k < n; k++) dst[k] = slot[at + k];
}

/**
 * The chunk's results of the helper's lanes between the lanes and a slot: into the slot on the
 * helper; out of it on the calling thread, whose copies of those lanes are not run: their buffers
 * and their coil's R and rise are what the sums and meters read.
 */
function moveLanes(chains: WayChain[], split: number, n: number, slot: Float64Array, intoSlot: boolean): void {
  const move = intoSlot ? put : take;
  let at = 0;
  for (const chain of chains) {
    if (chain instanceof DriverWayChain) {
      for (let w = split; w < chain.lanes.length; w++) {
        const lane = chain.lanes[w];
        move(slot, at, lane.pN, n);
        move(slot, at + CHUNK, lane.pL, n);
        move(slot, at + 2 * CHUNK, lane.x, n);
        move(slot, at + 3 * CHUNK, lane.outlet, n);
        move(slot, at + 4 * CHUNK, lane.uDel, n);
        const coil = at + DRIVER_ARRAYS * CHUNK;
        if (intoSlot) {
          slot[coil] = lane.sim.r;
          slot[coil + 1] = lane.sim.riseV;
        } else {
          lane.sim.r = slot[coil];
          lane.sim.riseV = slot[coil + 1];
        }
        at += DRIVER_DOUBLES;
      }
    } else {
      for (let c = split; c < chain.out.length; c++) {
        move(slot, at, chain.out[c], n);
        at += CHUNK;
      }
    }
  }
}

/** Helper: its lanes' chunk into a slot. */
export function exportLanes(chains: WayChain[], split: number, n: number, slot: Float64Array): void {
  moveLanes(chains, split, n, slot, true);
}

/** Calling thread: the helper's lanes' chunk from a slot. */
export function importLanes(chains: WayChain[], split: number, n: number, slot: Float64Array): void {
  moveLanes(chains, split, n, slot, false);
}

/**
 * Whole-buffer input block by block, as a renderer takes it: views into the channels where the block
 * lies inside them, zero-padded copies (in `scratch`) past their end. Channels below `from` are not
 * read. `each` returns false to stop.
 */
export function forEachBlock(
  channels: ArrayLike<number>[],
  frames: number,
  total: number,
  block: number,
  scratch: Float32Array[],
  each: (views: ArrayLike<number>[], s: number, n: number) => boolean,
  from = 0,
): void {
  const nCh = channels.length;
  const views: ArrayLike<number>[] = new Array(nCh).fill(scratch[0]);
  for (let s = 0; s < total; s += block) {
    const n = Math.min(block, total - s);
    for (let c = from; c < nCh; c++) {
      const src = channels[c];
      if (s + n <= frames && ArrayBuffer.isView(src)) {
        views[c] = (src as unknown as Float32Array).subarray(s, s + n);
      } else {
        const dst = scratch[c];
        for (let j = 0; j < n; j++) dst[j] = s + j < frames ? src[s + j] : 0;
        views[c] = dst;
      }
    }
    if (!each(views, s, n)) return;
  }
}
