// Floating-point audio can hold values beyond full scale. A little over is normal (float masters,
// decoded MP3s of loud masters) and is kept: with --volts it drives the amplifier past its rail, as a
// real DAC and amplifier would be driven. Far over is a mis-scaled file (integer values stored as
// float, or garbage): it is scaled down to peak at full scale, with a warning naming the gain,
// rather than refused, so that a file with usable music in it still plays. Not-a-number and
// infinite samples are refused.
import { InputError } from './command.ts';

/** Peaks up to this many times full scale are kept as they are (+24 dBFS). */
export const MAX_KEPT_PEAK = 16;

/** Checks float samples in place; returns a warning when it scaled them, else null. */
export function checkFloatRange(channels: Float32Array[], path: string): string | null {
  let peak = 0;
  for (const ch of channels) {
    for (let j = 0; j < ch.length; j++) {
      const a = Math.abs(ch[j]);
      if (!(a <= peak)) {
        if (!(a < Infinity)) throw new InputError(`${path}: sample ${j} is not a finite number`);
        peak = a;
      }
    }
  }
  if (peak <= MAX_KEPT_PEAK) return null;
  const gain = 1 / peak;
  for (const ch of channels) for (let j = 0; j < ch.length; j++) ch[j] *= gain;
  return `${path}: the audio peaks ${(20 * Math.log10(peak)).toFixed(1)} dB above full scale, so its scale is wrong; it was scaled down by that much to peak at full scale`;
}
