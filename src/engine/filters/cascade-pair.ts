// Two joined cascades over the same input in one WebAssembly loop (cascade-pair.wat): the
// calibration pass runs two ways of a channel this way, each lane of the f64x2 vectors one way's
// JoinedCascade, bit for bit as its processInPlace on the input copied to Float64 (the sign of a
// zero aside, in the shorter way's padding). The 5-minute stereo calibration on one thread took
// about 0.65 s against 0.77 s for the cascades one after the other (measured by hand, side by
// side). Where the loop is not available, or a cascade is longer than it holds, the caller runs
// the cascades one by one.
import { loopOnce } from '../wasm-module.ts';
import type { JoinedCascade } from './biquad.ts';
import { CASCADE_PAIR_WASM } from './cascade-pair-wasm.ts';

/** The loop's memory in doubles (see the .wat): sections, their state, the input, the two outputs. */
const SECTIONS = 0;
const STATE = 512;
const INPUT = 1024;
const OUT = [25600, 33792];
/** The most sections, and frames per call, the loop holds. */
const MAX_SECTIONS = 40;
export const CASCADE_PAIR_MAX_FRAMES = 8192;

const cascadeLoop = loopOnce<(n: number, groups: number) => void>(CASCADE_PAIR_WASM);

/** Whether a and b can run together (and the loop is there). */
export function cascadesPairable(a: JoinedCascade, b: JoinedCascade): boolean {
  return Math.max(a.sections, b.sections) <= MAX_SECTIONS && cascadeLoop() !== null;
}

/**
 * input[0..n-1] (n at most CASCADE_PAIR_MAX_FRAMES) through a into outA and through b into outB,
 * as copying it into each and calling processInPlace would.
 */
export function processCascadePair(
  a: JoinedCascade,
  b: JoinedCascade,
  input: ArrayLike<number>,
  n: number,
  outA: Float64Array,
  outB: Float64Array,
): void {
  const l = cascadeLoop();
  if (!l || n > CASCADE_PAIR_MAX_FRAMES || !cascadesPairable(a, b)) throw new Error('processCascadePair on cascades the loop cannot run');
  const mem = l.mem;
  const sections = Math.max(a.sections, b.sections);
  a.writePair(mem, SECTIONS, STATE, 0, sections);
  b.writePair(mem, SECTIONS, STATE, 1, sections);
  if (ArrayBuffer.isView(input)) mem.set((input as unknown as Float32Array).subarray(0, n), INPUT);
  else for (let j = 0; j < n; j++) mem[INPUT + j] = input[j];
  l.run(n, sections / 4);
  a.readPairState(mem, STATE, 0);
  b.readPairState(mem, STATE, 1);
  outA.set(mem.subarray(OUT[0], OUT[0] + n));
  outB.set(mem.subarray(OUT[1], OUT[1] + n));
}
