// WAV encoding as pure functions over typed arrays, shared by the CLI (which streams blocks to a
// file) and the app's export (one buffer). Quantisation rounds to the nearest step and saturates at
// the rails. Layout: RIFF/WAVE (Microsoft/IBM Multimedia Programming Interface and Data
// Specifications 1.0, 1991), the canonical 44-byte header.

export type WavFormat = '16' | '24' | 'f32';

export const FORMAT_PCM = 1;
export const FORMAT_FLOAT = 3;
export const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** Bytes per sample of a format. */
export const sampleBytes = (format: WavFormat): number => (format === '16' ? 2 : format === '24' ? 3 : 4);

/** Interleaves `n` frames from frame `at` into `block`, quantised to the format (round to nearest, saturate). */
export function encodeBlock(channels: Float32Array[], format: WavFormat, at: number, n: number, block: Uint8Array): void {
  const nc = channels.length;
  if (format === 'f32') {
    if (LITTLE_ENDIAN) {
      const dst = new Float32Array(block.buffer, block.byteOffset, n * nc);
      for (let c = 0; c < nc; c++) {
        const src = channels[c];
        for (let k = 0, j = c; k < n; k++, j += nc) dst[j] = src[at + k];
      }
    } else {
      const view = new DataView(block.buffer, block.byteOffset);
      for (let c = 0; c < nc; c++) {
        const src = channels[c];
        for (let k = 0, j = 4 * c; k < n; k++, j += 4 * nc) view.setFloat32(j, src[at + k], true);
      }
    }
    return;
  }
  const bytes = format === '24' ? 3 : 2;
  const full = format === '24' ? 8388607 : 32767;
  const stride = bytes * nc;
  for (let c = 0; c < nc; c++) {
    const src = channels[c];
    for (let k = 0, j = bytes * c; k < n; k++, j += stride) {
      const r = Math.round(src[at + k] * (full + 1));
      // NaN becomes 0, as an integer typed array would store it.
      const v = r > full ? full : r < -full - 1 ? -full - 1 : r | 0;
      block[j] = v;
      block[j + 1] = v >> 8;
      if (bytes === 3) block[j + 2] = v >> 16;
    }
  }
}

/** The canonical 44-byte header: a 16-byte fmt chunk (PCM, or IEEE float for f32) and the data chunk. */
export function wavHeader(channels: number, sampleRate: number, format: WavFormat, frames: number): Uint8Array {
  const bytes = format === '16' ? 2 : format === '24' ? 3 : 4;
  const dataBytes = frames * channels * bytes;
  const b = new Uint8Array(44);
  const v = new DataView(b.buffer);
  const ascii = (o: number, s: string) => {
    for (let k = 0; k < 4; k++) b[o + k] = s.charCodeAt(k);
  };
  ascii(0, 'RIFF');
  v.setUint32(4, 36 + dataBytes, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  v.setUint32(16, 16, true);
  v.setUint16(20, format === 'f32' ? FORMAT_FLOAT : FORMAT_PCM, true);
  v.setUint16(22, channels, true);
  v.setUint32(24, sampleRate, true);
  v.setUint32(28, sampleRate * channels * bytes, true);
  v.setUint16(32, channels * bytes, true);
  v.setUint16(34, bytes * 8, true);
  ascii(36, 'data');
  v.setUint32(40, dataBytes, true);
  return b;
}

/** A whole WAV file in memory (for the app's export). */
export function encodeWavBytes(channels: Float32Array[], sampleRate: number, format: WavFormat): Uint8Array {
  const frames = channels[0]?.length ?? 0;
  const stride = channels.length * sampleBytes(format);
  const out = new Uint8Array(44 + frames * stride);
  out.set(wavHeader(channels.length, sampleRate, format, frames), 0);
  encodeBlock(channels, format, 0, frames, out.subarray(44));
  return out;
}
