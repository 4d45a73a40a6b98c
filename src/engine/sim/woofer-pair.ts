// Two lanes of the large-signal model (the two channels of one way) stepped together by the
// WebAssembly loop of woofer-pair.wat, which does every operation of WooferSim.processBlock on
// both lanes at once (f64x2): the same samples bit for bit, in a little over half the time of two
// calls (31-39 against 54-70 ns a lane-step, measured by hand side by side; the render bench shows
// it in its per-frame cost). Only where the loop applies (pairable): no passive network, no
// semi-inductance, a closed or ported chamber, both lanes on the same constants; elsewhere, and
// where WebAssembly's SIMD is missing, the caller runs processBlock lane by lane.
import type { PairedChamber } from '../box/one-chamber.ts';
import { WOOFER_PAIR_WASM } from './woofer-pair-wasm.ts';
import { loopOnce, type WasmLoop } from '../wasm-module.ts';
import { WooferSim } from './woofer.ts';

/** The loop's memory layout in doubles (see the .wat): constants, state, then the four streams, lane 0's 256 then lane 1's. */
const CONSTANTS = 0;
const CHAMBER_CONSTANTS = 2 * 42;
const STATE = 128;
const CHAMBER_STATE = STATE + 2 * 14;
const I2 = STATE + 2 * 21;
const U = 512;
const P = 1024;
const X = 1536;
const OUTLET = 2048;
/** Most steps per call. */
export const PAIR_MAX_STEPS = 256;

type PairRun = (n: number, nBl: number, nK: number, nL: number, hasLe: number, ported: number) => void;

/** The loop, compiled once per thread; null where WebAssembly or its SIMD is not available. */
const pairLoop = loopOnce<PairRun>(WOOFER_PAIR_WASM);

/** The constants last written for each lane (their parameters object): rewritten when it changes. */
const written: [unknown, unknown] = [null, null];

function chamberOf(sim: WooferSim): PairedChamber | null {
  const c = sim.chamber as Partial<PairedChamber>;
  return c.pairKind === 0 || c.pairKind === 1 ? (c as PairedChamber) : null;
}

/** Whether a and b can step together (and the loop is there). */
export function pairable(a: WooferSim, b: WooferSim): boolean {
  if (a.p !== b.p || a.p.l2 > 0) return false;
  const ca = chamberOf(a),
    cb = chamberOf(b);
  return ca !== null && cb !== null && ca.pairKind === cb.pairKind && pairLoop() !== null;
}

/** One lane's streams (named as the renderer's lanes name them): drive in, seat pressure, cone excursion and the outlet's probe out. */
export interface PairLane {
  uClip: Float64Array;
  pN: Float64Array;
  x: Float64Array;
  outlet: Float64Array;
}

/** A lane's constants (when its parameters changed), coil resistance, state and drive into the loop's memory. */
function load(l: WasmLoop<PairRun>, sim: WooferSim, from: PairLane, lane: number, n: number): void {
  const mem = l.mem;
  const chamber = chamberOf(sim)!;
  if (written[lane] !== sim.p) {
    sim.writePairConstants(mem, CONSTANTS, lane);
    chamber.writePairConstants(mem, CHAMBER_CONSTANTS, lane);
    written[lane] = sim.p;
  }
  mem[CONSTANTS + 2 * WooferSim.pairR + lane] = sim.r;
  sim.writePairState(mem, STATE, lane);
  chamber.writePairState(mem, CHAMBER_STATE, lane);
  const u = from.uClip;
  mem.set(u.length === n ? u : u.subarray(0, n), U + PAIR_MAX_STEPS * lane);
}

/** Whole-chunk views of each lane's output streams in the loop's memory, made once (a view per chunk is garbage). */
let chunkViews: Float64Array[][] | null = null;

function outputViews(mem: Float64Array, lane: number, n: number): Float64Array[] {
  const at = PAIR_MAX_STEPS * lane;
  const view = (base: number) => mem.subarray(base + at, base + at + n);
  if (n !== PAIR_MAX_STEPS) return [view(P), view(X), view(OUTLET)];
  chunkViews ??= [0, 1].map((k) => [P, X, OUTLET].map((base) => mem.subarray(base + PAIR_MAX_STEPS * k, base + PAIR_MAX_STEPS * (k + 1))));
  return chunkViews[lane];
}

/** A lane's state and streams back from the loop's memory; returns its sum of i^2. */
function store(l: WasmLoop<PairRun>, sim: WooferSim, to: PairLane, lane: number, n: number): number {
  const mem = l.mem;
  sim.readPairState(mem, STATE, lane);
  chamberOf(sim)!.readPairState(mem, CHAMBER_STATE, lane);
  const [p, x, outlet] = outputViews(mem, lane, n);
  to.pN.set(p);
  to.x.set(x);
  to.outlet.set(outlet);
  return mem[I2 + lane];
}

/**
 * n (at most PAIR_MAX_STEPS) steps of a and b, as a.processBlock(la.uClip, n, la.pN, la.x, la.outlet)
 * and the same for b would take them; sums[0] and sums[1] receive what those calls return (each
 * one's sum of i^2).
 */
export function processPair(a: WooferSim, b: WooferSim, la: PairLane, lb: PairLane, n: number, sums: Float64Array): void {
  const l = pairLoop();
  if (!l || n > PAIR_MAX_STEPS || !pairable(a, b)) throw new Error('processPair on lanes the loop cannot run (check pairable)');
  load(l, a, la, 0, n);
  load(l, b, lb, 1, n);
  const p = a.p;
  l.run(n, p.blC.length, p.kmsC.length, p.leC.length, p.le0 > 0 ? 1 : 0, chamberOf(a)!.pairKind);
  sums[0] = store(l, a, la, 0, n);
  sums[1] = store(l, b, lb, 1, n);
}
