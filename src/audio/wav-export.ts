// WAV encoding of rendered audio for export (wavefile does the coding): 16-bit PCM or 32-bit float.
// Named import: the package's ES module (what Vite and Vitest load) exports the class by name.
import { WaveFile } from 'wavefile';

export type ExportFormat = '16' | 'f32';
export const EXPORT_FORMATS: readonly ExportFormat[] = ['16', 'f32'];

/** Full-scale float samples to a WAV file. 16-bit rounds to the nearest step and saturates at the rails. */
export function encodeWav(channels: Float32Array[], sampleRate: number, format: ExportFormat): Uint8Array {
  if (channels.length < 1 || channels.length > 8) throw new RangeError(`a WAV export needs 1..8 channels, got ${channels.length}`);
  if (!(Number.isInteger(sampleRate) && sampleRate >= 8000 && sampleRate <= 384000))
    throw new RangeError(`sample rate must be a whole number of Hz within 8000..384000, got ${sampleRate}`);
  if (!EXPORT_FORMATS.includes(format)) throw new RangeError(`format must be one of ${EXPORT_FORMATS.join(', ')}, got ${String(format)}`);
  const wav = new WaveFile();
  let data: (Float32Array | Int16Array)[];
  if (format === 'f32') data = channels;
  else {
    data = channels.map((c) => {
      const out = new Int16Array(c.length);
      for (let j = 0; j < c.length; j++) {
        const v = Math.round(c[j] * 32768);
        out[j] = v > 32767 ? 32767 : v < -32768 ? -32768 : v;
      }
      return out;
    });
  }
  wav.fromScratch(channels.length, sampleRate, format === 'f32' ? '32f' : '16', data as unknown as number[][]);
  return wav.toBuffer();
}
