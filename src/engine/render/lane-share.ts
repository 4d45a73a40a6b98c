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
import { CHUNK, type DriverLane, DriverWayChain, type FlatWayChain, type LaneBuffers, separateTwin } from './way-chain.ts';
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
  /** The helper runs its lanes' linear twins too (twinsOnHelper); else the calling thread does. */
  twinsOnHelper: boolean;
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
 * example's render, 5 minutes of stereo: the cone model, its twin, filter and clipping 1.27 s per
 * lane; a flat way's lane 0.06 s; the sums, meters, guard and the file's encoding 0.65 s per
 * channel, which stay on the calling thread). A passive network and a measured response add their
 * circuit and convolution (estimates).
 */
const DRIVER_LANE = 1;
const NETWORK_EXTRA = 0.5;
const MEASURED_EXTRA = 0.3;
const FLAT_LANE = 0.05;
const JOINING_PER_CHANNEL = 0.51;
/** The linear twin's share of a driver lane (same profile: 0.17 s). */
const TWIN_SHARE = 0.13;
/** What each of two lanes saves when their models step together (sim/woofer-pair.ts; same profile: 0.56 s). */
const PAIR_SAVING = 0.44;

const lanesOf = (chain: WayChain) => (chain instanceof DriverWayChain ? chain.lanes.length : chain.out.length);

/**
 * The lanes the helper runs, lanes[k][w] for lane w of way k: the costliest lanes first, each to
 * the thread with less work so far, the calling thread starting with the work that joins the lanes.
 */
export function assignLanes(chains: WayChain[], channels: number): boolean[][] {
  // Each lane's cost, and the part of it (its linear twin) that stays here when the helper runs it.
  const units: { k: number; w: number; cost: number; twin: number }[] = [];
  chains.forEach((chain, k) => {
    for (let w = 0; w < lanesOf(chain); w++) {
      let cost = FLAT_LANE,
        twin = 0;
      if (chain instanceof DriverWayChain) {
        const lane = chain.lanes[w];
        cost = DRIVER_LANE + (lane.net ? NETWORK_EXTRA : 0) + (lane.measured ? MEASURED_EXTRA : 0);
        if (separateTwin(lane)) twin = TWIN_SHARE * cost;
      }
      units.push({ k, w, cost, twin });
    }
  });
  units.sort((a, b) => b.cost - a.cost || a.k - b.k || a.w - b.w);
  const lanes = chains.map((chain) => new Array<boolean>(lanesOf(chain)).fill(false));
  let main = JOINING_PER_CHANNEL * channels,
    helper = 0;
  for (const u of units) {
    if (helper <= main) {
      lanes[u.k][u.w] = true;
      helper += u.cost - u.twin;
      main += u.twin;
    } else main += u.cost;
  }
  return lanes;
}

/**
 * Whether the helper should also run its lanes' linear twins: when that evens out the two
 * threads' work (the twins stay on the calling thread by default, where the lanes are joined). The
 * loads are assignLanes' own, with the saving of lanes whose models step together.
 */
export function twinsOnHelper(chains: WayChain[], lanes: boolean[][], channels: number): boolean {
  let main = JOINING_PER_CHANNEL * channels,
    helper = 0,
    twins = 0;
  chains.forEach((chain, k) => {
    const paired = chain instanceof DriverWayChain && lanes[k].every(Boolean) && chain.pairsLanes();
    for (let w = 0; w < lanesOf(chain); w++) {
      let cost = FLAT_LANE,
        twin = 0;
      if (chain instanceof DriverWayChain) {
        const lane = chain.lanes[w];
        cost = DRIVER_LANE + (lane.net ? NETWORK_EXTRA : 0) + (lane.measured ? MEASURED_EXTRA : 0) - (paired ? PAIR_SAVING : 0);
        if (separateTwin(lane)) twin = TWIN_SHARE * DRIVER_LANE;
      }
      if (!lanes[k][w]) main += cost;
      else {
        helper += cost - twin;
        twins += twin;
      }
    }
  });
  return Math.max(helper + twins, main) < Math.max(helper, main + twins);
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

/** One slot seen as the helper's lanes: each driver lane's buffers and where its coil's R and rise go. */
interface SlotViews {
  drivers: { lane: DriverLane; buffers: LaneBuffers; coil: number }[];
  flats: { out: Float64Array[]; c: number; view: Float64Array }[];
}

/**
 * The helper's lanes in the ring's slots, without copying: for each chunk both threads point those
 * lanes' result buffers at the chunk's slot (attach), the helper's stages write into it and the
 * calling thread's sums and meters read from it; only the coil's R and rise are copied.
 */
export class LaneSlots {
  private readonly views = new Map<Float64Array, SlotViews>();

  constructor(
    private readonly chains: WayChain[],
    private readonly lanes: boolean[][],
  ) {}

  private viewsOf(slot: Float64Array): SlotViews {
    let v = this.views.get(slot);
    if (v) return v;
    v = { drivers: [], flats: [] };
    let at = 0;
    const view = () => {
      const a = slot.subarray(at, at + CHUNK);
      at += CHUNK;
      return a;
    };
    this.chains.forEach((chain, k) => {
      const runs = this.lanes[k];
      if (chain instanceof DriverWayChain) {
        chain.lanes.forEach((lane, w) => {
          if (!runs[w]) return;
          const buffers = { pN: view(), pL: view(), x: view(), outlet: view(), uDel: view() };
          v!.drivers.push({ lane, buffers, coil: at });
          at += 2;
        });
      } else {
        chain.out.forEach((_, c) => {
          if (runs[c]) v!.flats.push({ out: chain.out, c, view: view() });
        });
      }
    });
    this.views.set(slot, v);
    return v;
  }

  /** The helper's lanes write to, or are read from, this slot for the coming chunk. */
  attach(slot: Float64Array): void {
    const v = this.viewsOf(slot);
    for (const d of v.drivers) d.lane.useBuffers(d.buffers);
    for (const f of v.flats) f.out[f.c] = f.view;
  }

  /** Helper, after the chunk: its lanes' coil R and rise into the slot. */
  writeCoils(slot: Float64Array): void {
    for (const d of this.viewsOf(slot).drivers) {
      slot[d.coil] = d.lane.sim.r;
      slot[d.coil + 1] = d.lane.sim.riseV;
    }
  }

  /** Calling thread: the helper's lanes' coil R and rise, where the stress meter reads them. */
  readCoils(slot: Float64Array): void {
    for (const d of this.viewsOf(slot).drivers) {
      d.lane.sim.r = slot[d.coil];
      d.lane.sim.riseV = slot[d.coil + 1];
    }
  }
}

/**
 * Whole-buffer input block by block, as a renderer takes it: views into the channels where the block
 * lies inside them, zero-padded copies (in `scratch`) past their end; only the channels `reads`
 * marks (default: all); from frame `from` on (a multiple of `block`). `each` returns false to stop.
 */
export function forEachBlock(
  channels: ArrayLike<number>[],
  frames: number,
  total: number,
  block: number,
  scratch: Float32Array[],
  each: (views: ArrayLike<number>[], s: number, n: number) => boolean,
  reads?: readonly boolean[],
  from = 0,
): void {
  const nCh = channels.length;
  const views: ArrayLike<number>[] = new Array(nCh).fill(scratch[0]);
  for (let s = from; s < total; s += block) {
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
