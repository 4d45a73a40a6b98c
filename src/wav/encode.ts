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

/**
 * Interleaves `n` frames from frame `at` into `block`, quantised to the format (round to nearest,
 * half up as Math.round, saturate; NaN becomes 0, as an integer typed array would store it).
 * Clamping before rounding gives the same integers as rounding before clamping (the rails are
 * whole numbers and rounding is monotone). Rounding is Math.floor(x + 0.5): V8's Math.round was
 * measured up to five times slower (about 10 ns a sample in the CLI after a render). It equals
 * Math.round(x) here: x is a float32 times 2^15 or 2^23, at most 24 significant bits below 2^24,
 * so x + 0.5 is exact unless |x| < 2^-30, and then both give 0. Each layout has its own small loop, so the engine
 * optimises each one on its first block; stereo and mono, little-endian, write whole 16- or 32-bit
 * words through typed-array views (a 24-bit pair of stereo frames is three 32-bit words).
 */
export function encodeBlock(channels: Float32Array[], format: WavFormat, at: number, n: number, block: Uint8Array): void {
  const nc = channels.length;
  const aligned = LITTLE_ENDIAN && block.byteOffset % 4 === 0;
  if (format === 'f32') {
    if (!aligned) encodeFloatBytes(channels, at, n, block);
    else if (nc === 2) encodeFloatStereo(channels[0], channels[1], at, n, new Float32Array(block.buffer, block.byteOffset, 2 * n));
    else encodeFloat(channels, at, n, new Float32Array(block.buffer, block.byteOffset, nc * n));
  } else if (format === '16') {
    if (!aligned) encodeIntBytes(channels, 2, at, n, block);
    else if (nc === 2) encode16Stereo(channels[0], channels[1], at, n, new Int16Array(block.buffer, block.byteOffset, 2 * n));
    else encode16(channels, at, n, new Int16Array(block.buffer, block.byteOffset, nc * n));
  } else if (aligned && nc <= 2) {
    // Whole words hold four samples: two stereo frames, or four mono ones. The last one to three
    // samples that do not fill a word go byte by byte.
    const samples = nc * n;
    const whole = samples - (samples % 4);
    const words = new Int32Array(block.buffer, block.byteOffset, (3 * whole) / 4);
    if (nc === 2) encode24Stereo(channels[0], channels[1], at, whole / 4, words);
    else encode24Mono(channels[0], at, whole, words);
    const done = whole / nc;
    if (done < n) encodeIntBytes(channels, 3, at + done, n - done, block.subarray(3 * whole));
  } else encodeIntBytes(channels, 3, at, n, block);
}

function encodeFloatStereo(a: Float32Array, b: Float32Array, at: number, n: number, dst: Float32Array): void {
  for (let k = 0, j = 0; k < n; k++, j += 2) {
    dst[j] = a[at + k];
    dst[j + 1] = b[at + k];
  }
}

function encodeFloat(channels: Float32Array[], at: number, n: number, dst: Float32Array): void {
  const nc = channels.length;
  for (let c = 0; c < nc; c++) {
    const src = channels[c];
    for (let k = 0, j = c; k < n; k++, j += nc) dst[j] = src[at + k];
  }
}

function encodeFloatBytes(channels: Float32Array[], at: number, n: number, block: Uint8Array): void {
  const nc = channels.length;
  const view = new DataView(block.buffer, block.byteOffset);
  for (let c = 0; c < nc; c++) {
    const src = channels[c];
    for (let k = 0, j = 4 * c; k < n; k++, j += 4 * nc) view.setFloat32(j, src[at + k], true);
  }
}

function encode16Stereo(a: Float32Array, b: Float32Array, at: number, n: number, dst: Int16Array): void {
  for (let k = 0, j = 0; k < n; k++, j += 2) {
    let x = a[at + k] * 32768;
    x = x > 32767 ? 32767 : x < -32768 ? -32768 : x;
    dst[j] = Math.floor(x + 0.5);
    let y = b[at + k] * 32768;
    y = y > 32767 ? 32767 : y < -32768 ? -32768 : y;
    dst[j + 1] = Math.floor(y + 0.5);
  }
}

function encode16(channels: Float32Array[], at: number, n: number, dst: Int16Array): void {
  const nc = channels.length;
  for (let c = 0; c < nc; c++) {
    const src = channels[c];
    for (let k = 0, j = c; k < n; k++, j += nc) {
      let x = src[at + k] * 32768;
      x = x > 32767 ? 32767 : x < -32768 ? -32768 : x;
      dst[j] = Math.floor(x + 0.5);
    }
  }
}

/** One sample as a 24-bit integer in an int32 (NaN to 0 by `| 0`). */
function q24(s: number): number {
  const x = s * 8388608;
  return Math.floor((x > 8388607 ? 8388607 : x < -8388608 ? -8388608 : x) + 0.5) | 0;
}

/** Pairs of frames from `at`, `pairs` of them: L0 R0 L1 R1 as three little-endian words. */
function encode24Stereo(a: Float32Array, b: Float32Array, at: number, pairs: number, words: Int32Array): void {
  for (let p = 0, k = at, w = 0; p < pairs; p++, k += 2, w += 3) {
    const s0 = q24(a[k]);
    const s1 = q24(b[k]);
    const s2 = q24(a[k + 1]);
    const s3 = q24(b[k + 1]);
    words[w] = (s0 & 0xffffff) | (s1 << 24);
    words[w + 1] = ((s1 >> 8) & 0xffff) | (s2 << 16);
    words[w + 2] = ((s2 >> 16) & 0xff) | (s3 << 8);
  }
}

/** `n` mono frames from `at`, a multiple of four, three words per four samples. */
function encode24Mono(a: Float32Array, at: number, n: number, words: Int32Array): void {
  for (let k = at, w = 0, end = at + n; k < end; k += 4, w += 3) {
    const s0 = q24(a[k]);
    const s1 = q24(a[k + 1]);
    const s2 = q24(a[k + 2]);
    const s3 = q24(a[k + 3]);
    words[w] = (s0 & 0xffffff) | (s1 << 24);
    words[w + 1] = ((s1 >> 8) & 0xffff) | (s2 << 16);
    words[w + 2] = ((s2 >> 16) & 0xff) | (s3 << 8);
  }
}

/** Byte by byte, for any layout (big-endian machines, odd offsets, more than two channels of 24 bits). */
function encodeIntBytes(channels: Float32Array[], bytes: 2 | 3, at: number, n: number, block: Uint8Array): void {
  const nc = channels.length;
  const full = bytes === 3 ? 8388607 : 32767;
  const stride = bytes * nc;
  for (let c = 0; c < nc; c++) {
    const src = channels[c];
    for (let k = 0, j = bytes * c; k < n; k++, j += stride) {
      const x = src[at + k] * (full + 1);
      const v = Math.floor((x > full ? full : x < -full - 1 ? -full - 1 : x) + 0.5) | 0;
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
