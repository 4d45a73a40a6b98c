// Room or cabin gain as a filter: |H| = sqrt(1 + (fc/f)^4), the 12 dB/octave rise below the corner
// that the small-signal curves use (common practice, no source). H(s) = (s^2 + sqrt2·wc·s + wc^2)/s^2
// has exactly that magnitude; its double pole at DC is moved to fc/10 (Butterworth) so the filter
// stays stable: the magnitude differs by under 0.11 dB down to fc/4.
import { bilinearK, bilinearSection } from './biquad.ts';

export const ROOM_POLE_RATIO = 0.1;

export function roomGainSection(cornerHz: number, sampleRate: number): Float64Array | null {
  if (!(cornerHz > 0)) return null;
  const wc = 2 * Math.PI * cornerHz;
  const we = wc * ROOM_POLE_RATIO;
  return bilinearSection({ b: [wc * wc, Math.SQRT2 * wc, 1], a: [we * we, Math.SQRT2 * we, 1] }, bilinearK(sampleRate));
}

/**
 * Centre of the baffle step, Hz: about 115 / baffle width in metres (common practice, from memory:
 * the diffraction of a flat baffle turns 4 pi radiation into 2 pi around the wavelength of its width).
 */
export const baffleStepHz = (widthM: number): number => 115 / widthM;

/** Analog poles of the step (1 + s/wz)/(1 + s/wp): +6.02 dB from low to high, +3.01 dB at the centre. */
export function baffleStepCorners(widthM: number): { wz: number; wp: number } {
  const wb = 2 * Math.PI * baffleStepHz(widthM);
  return { wz: wb / Math.SQRT2, wp: wb * Math.SQRT2 };
}

/** The baffle step as a first-order section (bilinear, prewarped at its centre); null when off. */
export function baffleStepSection(widthM: number, sampleRate: number): Float64Array | null {
  if (!(widthM > 0)) return null;
  const { wz, wp } = baffleStepCorners(widthM);
  // Kept first order on purpose: the generic biquad transform would add a pole-zero pair at z = -1.
  const k = bilinearK(sampleRate, Math.min(baffleStepHz(widthM), 0.45 * sampleRate));
  const n0 = 1 + k / wz;
  const n1 = 1 - k / wz;
  const d0 = 1 + k / wp;
  const d1 = 1 - k / wp;
  return Float64Array.of(n0 / d0, n1 / d0, 0, d1 / d0, 0);
}
