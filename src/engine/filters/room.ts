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
