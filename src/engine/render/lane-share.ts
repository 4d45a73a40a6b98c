// Two threads for one render: a way's channel lane (filter, amplifier channel, driver model, twin)
// is independent of every other until the ways are summed, so a second thread (the helper) runs a
// share of the lanes, chosen to even out the two threads' work (assignLanes), and hands each
// chunk's results over through a SlotRing; the calling thread runs the other lanes, takes the
// helper's, and does everything that joins the lanes (sums, meters, events, the room, the guard) as
// before. The calibration's linear chain splits by channel instead (its lanes cost alike). Each
// lane is computed by the same code on the same input either way, so the output is bit for bit the
// single thread's.
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

/** The helper's lanes of a render's way chains, block by block as renderBuffer feeds them. */
export interface RenderLaneJob extends LaneJobBase {
  kind: 'render';
  renderer: HelperRendererOptions;
  /** lanes[k][w]: the helper runs lane w of way k (assignLanes). */
  lanes: boolean[][];
  /** Frames fed in all (the input and the latency's zeros after it) and per block. */
  total: number;
  block: number;
}

/** The upper channels' lanes of the calibration's weighted seat pressure (level/calibration.ts). */
export interface LevelLaneJob extends LaneJobBase {
  kind: 'level';
}

export type LaneJob = RenderLaneJob | LevelLaneJob;

/** The first channel the helper runs in the calibration: the upper half. */
export function laneSplit(channels: number): number {
  return Math.ceil(channels / 2);
}

const sharedCopies = new WeakMap<object, Float32Array>();

/**
 * The channels as the helper reads them: shared memory as it is; a copy in shared memory for the
 * channels it reads (`reads[c]`) that are not (kept while the original lives, so a headroom search
 * copies once); an empty array for the others.
 */
export function shareChannels(channels: ArrayLike<number>[], reads: readonly boolean[]): Float32Array[] {
  return channels.map((ch, c) => {
    if (ch instanceof Float32Array && ch.buffer instanceof SharedArrayBuffer) return ch;
    if (!reads[c]) return new Float32Array(0);
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

/**
 * The work of one lane per frame, in driver lanes with an active filter (CPU profile of the vented
 * example's render: the cone model, its twin, filter and clipping 1.5 s per lane for 5 minutes of
 * stereo, a flat way's lane 0.08 s, the sums, meters and guard 0.57 s per channel and the file's
 * decoding and encoding 0.29 s per channel, which stay on the calling thread). A passive network
 * and a measured response add their circuit and convolution (estimates).
 */
const DRIVER_LANE = 1;
const NETWORK_EXTRA = 0.5;
const MEASURED_EXTRA = 0.3;
const FLAT_LANE = 0.05;
const JOINING_PER_CHANNEL = 0.57;

const lanesOf = (chain: WayChain) => (chain instanceof DriverWayChain ? chain.lanes.length : chain.out.length);

/**
 * The lanes the helper runs, lanes[k][w] for lane w of way k: the costliest lanes first, each to
 * the thread with less work so far, the calling thread starting with the work that joins the lanes.
 */
export function assignLanes(chains: WayChain[], channels: number): boolean[][] {
  const units: { k: number; w: number; cost: number }[] = [];
  chains.forEach((chain, k) => {
    for (let w = 0; w < lanesOf(chain); w++) {
      let cost = FLAT_LANE;
      if (chain instanceof DriverWayChain) {
        const lane = chain.lanes[w];
        cost = DRIVER_LANE + (lane.net ? NETWORK_EXTRA : 0) + (lane.measured ? MEASURED_EXTRA : 0);
      }
      units.push({ k, w, cost });
    }
  });
  units.sort((a, b) => b.cost - a.cost || a.k - b.k || a.w - b.w);
  const lanes = chains.map((chain) => new Array<boolean>(lanesOf(chain)).fill(false));
  let main = JOINING_PER_CHANNEL * channels,
    helper = 0;
  for (const u of units) {
    if (helper <= main) {
      lanes[u.k][u.w] = true;
      helper += u.cost;
    } else main += u.cost;
  }
  return lanes;
}

/** The input channels the helper's lanes read (a shared mono-sum lane reads them all). */
export function channelsRead(chains: WayChain[], lanes: boolean[][], channels: number): boolean[] {
  const reads = new Array<boolean>(channels).fill(false);
  chains.forEach((chain, k) => {
    const shared = chain instanceof DriverWayChain && chain.monoSum;
    lanes[k].forEach((runs, w) => {
      if (!runs) return;
      if (shared) reads.fill(true);
      else reads[Math.min(w, channels - 1)] = true;
    });
  });
  return reads;
}

/** Doubles of one chunk of the helper's lanes. */
export function helperLaneDoubles(chains: WayChain[], lanes: boolean[][]): number {
  let d = 0;
  chains.forEach((chain, k) => {
    const count = lanes[k].filter(Boolean).length;
    d += count * (chain instanceof DriverWayChain ? DRIVER_DOUBLES : CHUNK);
  });
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
function moveLanes(chains: WayChain[], lanes: boolean[][], n: number, slot: Float64Array, intoSlot: boolean): void {
  const move = intoSlot ? put : take;
  let at = 0;
  chains.forEach((chain, k) => {
    const runs = lanes[k];
    if (chain instanceof DriverWayChain) {
      for (let w = 0; w < chain.lanes.length; w++) {
        if (!runs[w]) continue;
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
      for (let c = 0; c < chain.out.length; c++) {
        if (!runs[c]) continue;
        move(slot, at, chain.out[c], n);
        at += CHUNK;
      }
    }
  });
}

/** Helper: its lanes' chunk into a slot. */
export function exportLanes(chains: WayChain[], lanes: boolean[][], n: number, slot: Float64Array): void {
  moveLanes(chains, lanes, n, slot, true);
}

/** Calling thread: the helper's lanes' chunk from a slot. */
export function importLanes(chains: WayChain[], lanes: boolean[][], n: number, slot: Float64Array): void {
  moveLanes(chains, lanes, n, slot, false);
}

/**
 * Whole-buffer input block by block, as a renderer takes it: views into the channels where the block
 * lies inside them, zero-padded copies (in `scratch`) past their end; only the channels `reads`
 * marks (default: all). `each` returns false to stop.
 */
export function forEachBlock(
  channels: ArrayLike<number>[],
  frames: number,
  total: number,
  block: number,
  scratch: Float32Array[],
  each: (views: ArrayLike<number>[], s: number, n: number) => boolean,
  reads?: readonly boolean[],
): void {
  const nCh = channels.length;
  const views: ArrayLike<number>[] = new Array(nCh).fill(scratch[0]);
  for (let s = 0; s < total; s += block) {
    const n = Math.min(block, total - s);
    for (let c = 0; c < nCh; c++) {
      if (reads && !reads[c]) continue;
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
