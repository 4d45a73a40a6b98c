import type { Air } from '../system.ts';
import { bulkModulus } from '../air.ts';

/** Acoustic compliance of the box air, m^3/Pa. */
export const boxCompliance = (vb: number, air: Air): number => vb / bulkModulus(air);

/**
 * Parallel leakage resistance from Small's QL = wb·Cab·Ral (Small, JAES 1973), Pa·s/m^3.
 * `null` means lossless (Infinity).
 */
export function leakageResistance(ql: number | null, wTuning: number, cab: number): number {
  return ql === null ? Infinity : ql / (wTuning * cab);
}

/** Small's usual starting point for the leakage loss of a vented or radiator box (Small, JAES 1973). */
export const DEFAULT_QL = 7;
