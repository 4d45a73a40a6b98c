// WAV encoding of rendered audio for export: 16-bit PCM or 32-bit float, by the same coder as the CLI's.
import { encodeWavBytes } from '../wav/encode.ts';

export type ExportFormat = '16' | 'f32';
export const EXPORT_FORMATS: readonly ExportFormat[] = ['16', 'f32'];

/** Full-scale float samples to a WAV file. 16-bit rounds to the nearest step and saturates at the rails. */
export function encodeWav(channels: Float32Array[], sampleRate: number, format: ExportFormat): Uint8Array {
  if (channels.length < 1 || channels.length > 8) throw new RangeError(`a WAV export needs 1..8 channels, got ${channels.length}`);
  if (!(Number.isInteger(sampleRate) && sampleRate >= 8000 && sampleRate <= 384000))
    throw new RangeError(`sample rate must be a whole number of Hz within 8000..384000, got ${sampleRate}`);
  if (!EXPORT_FORMATS.includes(format)) throw new RangeError(`format must be one of ${EXPORT_FORMATS.join(', ')}, got ${String(format)}`);
  return encodeWavBytes(channels, sampleRate, format);
}
