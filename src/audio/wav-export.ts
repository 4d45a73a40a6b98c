// WAV encoding of rendered audio for export: 16-bit PCM or 32-bit float, by the same coder as the CLI's.
import { encodeBlock, encodeWavBytes, sampleBytes, wavHeader } from '../wav/encode.ts';

export type ExportFormat = '16' | 'f32';
export const EXPORT_FORMATS: readonly ExportFormat[] = ['16', 'f32'];

/** Refuses what a WAV export cannot hold, with the reason. */
function checkExport(channels: number, sampleRate: number, format: ExportFormat): void {
  if (channels < 1 || channels > 8) throw new RangeError(`a WAV export needs 1..8 channels, got ${channels}`);
  if (!(Number.isInteger(sampleRate) && sampleRate >= 8000 && sampleRate <= 384000))
    throw new RangeError(`sample rate must be a whole number of Hz within 8000..384000, got ${sampleRate}`);
  if (!EXPORT_FORMATS.includes(format)) throw new RangeError(`format must be one of ${EXPORT_FORMATS.join(', ')}, got ${String(format)}`);
}

/** Full-scale float samples to a WAV file. 16-bit rounds to the nearest step and saturates at the rails. */
export function encodeWav(channels: Float32Array[], sampleRate: number, format: ExportFormat): Uint8Array {
  checkExport(channels.length, sampleRate, format);
  return encodeWavBytes(channels, sampleRate, format);
}

/**
 * A WAV file of `frames` frames filled as its audio arrives (a render's `onAudio`), so the float
 * samples are never held whole: `write(views, at)` encodes frames from frame `at` on. The same
 * bytes as encodeWav on the whole audio.
 */
export function wavFiller(channels: number, sampleRate: number, format: ExportFormat, frames: number) {
  checkExport(channels, sampleRate, format);
  const stride = channels * sampleBytes(format);
  const bytes = new Uint8Array(44 + frames * stride);
  bytes.set(wavHeader(channels, sampleRate, format, frames), 0);
  return {
    bytes,
    write(views: Float32Array[], at: number): void {
      encodeBlock(views, format, 0, views[0].length, bytes.subarray(44 + at * stride));
    },
  };
}
