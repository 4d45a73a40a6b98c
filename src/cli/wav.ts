// WAV in and out for the CLI, through typed arrays over blocks of the file's bytes. The header is
// walked and checked first (chunk by chunk, by position, so neither a huge file nor a huge declared
// chunk is ever read whole), and the decoder then uses exactly the header the check returned. Memory:
// the decoded channels plus one block. Output goes to a temporary name in the same folder and is
// renamed into place only when complete. WAV layout: the RIFF/WAVE format (Microsoft/IBM Multimedia
// Programming Interface and Data Specifications 1.0, 1991).
import { closeSync, openSync, renameSync, unlinkSync, writeSync } from 'node:fs';
import { rename, unlink, writeFile } from 'node:fs/promises';
import { dirname, basename, join } from 'node:path';
import { InputError } from './command.ts';
import { checkFloatRange } from './float-range.ts';
import { checkInputLength, openInput } from './input-file.ts';
import { newChannels } from './shared-audio.ts';

export type { WavFormat } from '../wav/encode.ts';
import { encodeBlock, FORMAT_FLOAT, FORMAT_PCM, LITTLE_ENDIAN, wavHeader, type WavFormat } from '../wav/encode.ts';

/** How the reader hands the audio over. */
export interface ReadOptions {
  /** Channels over SharedArrayBuffers (shared-audio.ts), for worker threads to read without a copy. */
  shared?: boolean;
}

export interface WavAudio {
  sampleRate: number;
  channels: Float32Array[];
  format: WavFormat;
  /** Things the user should know about the input that did not stop the reading. */
  warnings?: string[];
}

export const MAX_CHANNELS = 8;
/** Chunks before the audio: real files have a handful; a file of tiny chunks must not keep us walking. */
const MAX_CHUNKS = 10_000;
/** Bytes per read or write block: large enough for full disk speed, small beside the audio. */
const BLOCK_BYTES = 1 << 22;

const FORMAT_EXTENSIBLE = 0xfffe;

/** What the decoder needs, exactly as checked. */
export interface WavHeader {
  formatTag: typeof FORMAT_PCM | typeof FORMAT_FLOAT;
  channels: number;
  sampleRate: number;
  bits: 16 | 24 | 32;
  blockAlign: number;
  /** File offset of the first sample. */
  dataOffset: number;
  /** Whole frames only. */
  frames: number;
}

/** Random access to the bytes of a file or of a buffer. */
interface ByteSource {
  size: number;
  /** Up to `length` bytes from `offset` (fewer at the end). */
  read(offset: number, length: number): Uint8Array;
}

const printable = (s: string) => s.replace(/[^\x20-\x7e]/g, '?');

/** Walks the RIFF chunks of a WAV file; throws InputError naming what is wrong. */
function walkWavHeader(src: ByteSource, name: string): WavHeader {
  const fail = (msg: string): never => {
    throw new InputError(`${name}: ${msg}`);
  };
  const size = src.size;
  if (size === 0) fail('the file is empty');
  if (size < 12) fail(`only ${size} bytes: too short for a WAV header (12 bytes at least)`);
  const tag = (b: Uint8Array, o: number) => String.fromCharCode(b[o], b[o + 1], b[o + 2], b[o + 3]);
  const u32 = (b: Uint8Array, o: number) => (b[o] | (b[o + 1] << 8) | (b[o + 2] << 16) | (b[o + 3] << 24)) >>> 0;
  const u16 = (b: Uint8Array, o: number) => b[o] | (b[o + 1] << 8);
  const riff = src.read(0, 12);
  if (tag(riff, 0) !== 'RIFF') fail(`not a WAV file: it starts with "${printable(tag(riff, 0))}", not "RIFF"`);
  if (tag(riff, 8) !== 'WAVE') fail(`a RIFF file but not WAVE (form type "${printable(tag(riff, 8))}")`);
  let o = 12;
  let chunks = 0;
  let fmt: Omit<WavHeader, 'dataOffset' | 'frames' | 'formatTag' | 'bits'> & { formatTag: number; bits: number } = null!;
  let dataOffset = -1;
  let dataBytes = -1;
  while (o + 8 <= size) {
    if (++chunks > MAX_CHUNKS) fail(`more than ${MAX_CHUNKS} chunks before the audio: not a usable WAV file`);
    const head = src.read(o, 8);
    const id = tag(head, 0);
    const chunkSize = u32(head, 4);
    const body = o + 8;
    if (id === 'fmt ') {
      // Two descriptions of the audio would leave it to chance which one a program believes.
      if (fmt) fail('two fmt chunks: the file describes its audio twice');
      if (chunkSize < 16) fail(`the fmt chunk is ${chunkSize} bytes, at least 16 expected`);
      const b = src.read(body, Math.min(chunkSize, 40));
      if (b.length < 16) fail('truncated inside the fmt chunk');
      let formatTag = u16(b, 0);
      if (formatTag === FORMAT_EXTENSIBLE) {
        if (chunkSize < 40 || b.length < 26) fail('an extensible fmt chunk shorter than 40 bytes');
        formatTag = u16(b, 24);
      }
      fmt = { formatTag, channels: u16(b, 2), sampleRate: u32(b, 4), blockAlign: u16(b, 12), bits: u16(b, 14) };
    } else if (id === 'data') {
      if (!fmt) fail('the data chunk comes before the fmt chunk');
      if (chunkSize > size - body) fail(`truncated: the data chunk declares ${chunkSize} bytes but only ${size - body} follow`);
      dataOffset = body;
      dataBytes = chunkSize;
    }
    if (chunkSize > size - body)
      fail(`the "${printable(id)}" chunk declares ${chunkSize} bytes, more than the ${size - body} left in the file`);
    o = body + chunkSize + (chunkSize & 1);
    if (dataOffset >= 0) break;
  }
  if (!fmt) fail('no fmt chunk: not a usable WAV file');
  if (dataOffset < 0) fail('no data chunk: the file has no audio');
  // Chunks after the audio are not used, but a second description of it is still refused. Trailing
  // bytes that are not chunks end the look quietly: many writers leave some.
  for (let k = 0; o + 8 <= size && k < MAX_CHUNKS; k++) {
    const head = src.read(o, 8);
    if (tag(head, 0) === 'fmt ') fail('two fmt chunks: the file describes its audio twice');
    const chunkSize = u32(head, 4);
    if (chunkSize > size - o - 8) break;
    o += 8 + chunkSize + (chunkSize & 1);
  }
  const f = fmt;
  const supported = (f.formatTag === FORMAT_PCM && (f.bits === 16 || f.bits === 24)) || (f.formatTag === FORMAT_FLOAT && f.bits === 32);
  if (!supported) {
    const kind =
      f.formatTag === FORMAT_PCM
        ? `${f.bits}-bit PCM`
        : f.formatTag === FORMAT_FLOAT
          ? `${f.bits}-bit float`
          : `format code ${f.formatTag}`;
    fail(`${kind} is not supported: use 16- or 24-bit PCM or 32-bit float`);
  }
  if (f.channels < 1 || f.channels > MAX_CHANNELS) fail(`${f.channels} channels: 1 to ${MAX_CHANNELS} are supported`);
  if (f.sampleRate < 8000 || f.sampleRate > 384000) fail(`sample rate ${f.sampleRate} Hz is outside 8000..384000 Hz`);
  if (f.blockAlign !== (f.channels * f.bits) / 8)
    fail(`block align ${f.blockAlign} does not match ${f.channels} channels of ${f.bits} bits`);
  if (dataBytes === 0) fail('zero length: the data chunk holds no samples');
  if (dataBytes < f.blockAlign) fail(`the data chunk (${dataBytes} bytes) is shorter than one frame`);
  return {
    formatTag: f.formatTag as WavHeader['formatTag'],
    channels: f.channels,
    sampleRate: f.sampleRate,
    bits: f.bits as WavHeader['bits'],
    blockAlign: f.blockAlign,
    dataOffset,
    frames: Math.floor(dataBytes / f.blockAlign),
  };
}

/** Checks the header of a WAV file held in memory. */
export function checkWavHeader(bytes: Uint8Array, name: string): WavHeader {
  return walkWavHeader({ size: bytes.length, read: (o, n) => bytes.subarray(o, o + n) }, name);
}

/**
 * Deinterleaves `n` frames of `block` into `out` from frame `at`, as floats with full scale at 1.
 * `block` starts a whole frame at a 4-byte boundary (the reader's own buffer). As in the encoder,
 * each layout has its own small loop; stereo and mono, little-endian, read whole 16- or 32-bit
 * words (three 32-bit words hold two stereo frames of 24 bits).
 */
function decodeBlock(block: Uint8Array, n: number, h: WavHeader, out: Float32Array[], at: number): void {
  const nc = h.channels;
  const aligned = LITTLE_ENDIAN && block.byteOffset % 4 === 0;
  if (h.bits === 16) {
    if (!aligned) decodeIntBytes(block, 2, n, nc, out, at);
    else if (nc === 2) decode16Stereo(new Int16Array(block.buffer, block.byteOffset, 2 * n), n, out[0], out[1], at);
    else decode16(new Int16Array(block.buffer, block.byteOffset, nc * n), n, out, at);
  } else if (h.bits === 24) {
    if (aligned && nc <= 2) {
      const samples = nc * n;
      const whole = samples - (samples % 4);
      const words = new Int32Array(block.buffer, block.byteOffset, (3 * whole) / 4);
      if (nc === 2) decode24Stereo(words, whole / 4, out[0], out[1], at);
      else decode24Mono(words, whole, out[0], at);
      const done = whole / nc;
      if (done < n) decodeIntBytes(block.subarray(3 * whole), 3, n - done, nc, out, at + done);
    } else decodeIntBytes(block, 3, n, nc, out, at);
  } else if (aligned) {
    const src = new Float32Array(block.buffer, block.byteOffset, n * nc);
    if (nc === 2) decodeFloatStereo(src, n, out[0], out[1], at);
    else decodeFloat(src, n, out, at);
  } else {
    const view = new DataView(block.buffer, block.byteOffset);
    for (let c = 0; c < nc; c++) {
      const dst = out[c];
      for (let k = 0, j = 4 * c; k < n; k++, j += 4 * nc) dst[at + k] = view.getFloat32(j, true);
    }
  }
}

function decode16Stereo(src: Int16Array, n: number, a: Float32Array, b: Float32Array, at: number): void {
  for (let k = 0, j = 0; k < n; k++, j += 2) {
    a[at + k] = src[j] * (1 / 32768);
    b[at + k] = src[j + 1] * (1 / 32768);
  }
}

function decode16(src: Int16Array, n: number, out: Float32Array[], at: number): void {
  const nc = out.length;
  for (let c = 0; c < nc; c++) {
    const dst = out[c];
    for (let k = 0, j = c; k < n; k++, j += nc) dst[at + k] = src[j] * (1 / 32768);
  }
}

/** `pairs` pairs of stereo frames, three little-endian words each (the encoder's packing undone). */
function decode24Stereo(words: Int32Array, pairs: number, a: Float32Array, b: Float32Array, at: number): void {
  for (let p = 0, w = 0, k = at; p < pairs; p++, w += 3, k += 2) {
    const w0 = words[w];
    const w1 = words[w + 1];
    const w2 = words[w + 2];
    a[k] = ((w0 << 8) >> 8) * (1 / 8388608);
    b[k] = ((((w0 >>> 24) | (w1 << 8)) << 8) >> 8) * (1 / 8388608);
    a[k + 1] = ((((w1 >>> 16) | (w2 << 16)) << 8) >> 8) * (1 / 8388608);
    b[k + 1] = (w2 >> 8) * (1 / 8388608);
  }
}

/** `n` mono frames, a multiple of four, three words per four samples. */
function decode24Mono(words: Int32Array, n: number, a: Float32Array, at: number): void {
  for (let w = 0, k = at, end = at + n; k < end; w += 3, k += 4) {
    const w0 = words[w];
    const w1 = words[w + 1];
    const w2 = words[w + 2];
    a[k] = ((w0 << 8) >> 8) * (1 / 8388608);
    a[k + 1] = ((((w0 >>> 24) | (w1 << 8)) << 8) >> 8) * (1 / 8388608);
    a[k + 2] = ((((w1 >>> 16) | (w2 << 16)) << 8) >> 8) * (1 / 8388608);
    a[k + 3] = (w2 >> 8) * (1 / 8388608);
  }
}

function decodeFloatStereo(src: Float32Array, n: number, a: Float32Array, b: Float32Array, at: number): void {
  for (let k = 0, j = 0; k < n; k++, j += 2) {
    a[at + k] = src[j];
    b[at + k] = src[j + 1];
  }
}

function decodeFloat(src: Float32Array, n: number, out: Float32Array[], at: number): void {
  const nc = out.length;
  for (let c = 0; c < nc; c++) {
    const dst = out[c];
    for (let k = 0, j = c; k < n; k++, j += nc) dst[at + k] = src[j];
  }
}

/** Byte by byte, for any layout (big-endian machines, more than two channels of 24 bits). */
function decodeIntBytes(block: Uint8Array, bytes: 2 | 3, n: number, nc: number, out: Float32Array[], at: number): void {
  const stride = bytes * nc;
  for (let c = 0; c < nc; c++) {
    const dst = out[c];
    if (bytes === 2)
      for (let k = 0, j = 2 * c; k < n; k++, j += stride) dst[at + k] = (((block[j] | (block[j + 1] << 8)) << 16) >> 16) * (1 / 32768);
    else
      for (let k = 0, j = 3 * c; k < n; k++, j += stride)
        dst[at + k] = (((block[j] | (block[j + 1] << 8) | (block[j + 2] << 16)) << 8) >> 8) * (1 / 8388608);
  }
}

/**
 * Reads a 16/24-bit PCM or 32-bit float WAV file. `onProgress` hears the fraction read.
 * Refuses, before reading any audio, a file longer than the input limit.
 */
export async function readWav(path: string, onProgress?: (fraction: number) => void, options: ReadOptions = {}): Promise<WavAudio> {
  const file = openInput(path);
  try {
    const h = walkWavHeader(
      {
        size: file.size,
        read(o, n) {
          const b = new Uint8Array(n);
          return b.subarray(0, file.readAt(b, o));
        },
      },
      path,
    );
    checkInputLength(path, h.frames, h.channels, h.sampleRate);
    const channels = newChannels(h.channels, h.frames, options.shared);
    const framesPerBlock = Math.max(1, Math.floor(BLOCK_BYTES / h.blockAlign));
    const block = new Uint8Array(Math.min(framesPerBlock, h.frames) * h.blockAlign);
    for (let at = 0; at < h.frames; at += framesPerBlock) {
      const n = Math.min(framesPerBlock, h.frames - at);
      const want = n * h.blockAlign;
      if (file.readAt(block, h.dataOffset + at * h.blockAlign, want) < want)
        throw new InputError(`${path}: the file ended early while reading its audio (was it changed meanwhile?)`);
      decodeBlock(block, n, h, channels, at);
      onProgress?.((at + n) / h.frames);
    }
    const format: WavFormat = h.formatTag === FORMAT_FLOAT ? 'f32' : h.bits === 24 ? '24' : '16';
    const warning = format === 'f32' ? checkFloatRange(channels, path) : null;
    return { sampleRate: h.sampleRate, channels, format, ...(warning ? { warnings: [warning] } : {}) };
  } finally {
    file.close();
  }
}

/**
 * A WAV file written as its audio arrives, atomically: a temporary file in the same folder, renamed
 * when every frame the header announced has come (`finish`), removed on `abort`. The bytes are
 * those of the canonical layout (44-byte header, no pad byte after an odd-sized data chunk), the
 * layout this CLI has always written. Frames are encoded into a block of about 4 MB and written
 * when it fills.
 */
export class WavFileWriter {
  private readonly tmp: string;
  private readonly stride: number;
  private readonly block: Uint8Array;
  private fd = -1;
  /** Frames waiting in the block, and frames written so far. */
  private held = 0;
  private done = 0;

  constructor(
    readonly path: string,
    channels: number,
    sampleRate: number,
    private readonly format: WavFormat,
    private readonly frames: number,
  ) {
    this.stride = channels * (format === '16' ? 2 : format === '24' ? 3 : 4);
    if (36 + frames * this.stride > 0xffffffff)
      throw new InputError(`cannot write ${path}: the audio is too long for one WAV file (4 GiB)`);
    this.tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
    this.block = new Uint8Array(Math.max(1, Math.min(Math.floor(BLOCK_BYTES / this.stride), frames)) * this.stride);
    this.guard(() => {
      this.fd = openSync(this.tmp, 'w');
      writeSync(this.fd, wavHeader(channels, sampleRate, format, frames));
    });
  }

  /** The next frames: one array per channel, all of the same length. */
  write(channels: Float32Array[]): void {
    const n = channels[0]?.length ?? 0;
    if (this.done + this.held + n > this.frames) throw new Error('more frames than the WAV header announced');
    const capacity = this.block.length / this.stride;
    for (let at = 0; at < n; ) {
      const m = Math.min(capacity - this.held, n - at);
      encodeBlock(channels, this.format, at, m, this.block.subarray(this.held * this.stride));
      this.held += m;
      at += m;
      if (this.held === capacity) this.flush();
    }
  }

  /** Writes what is held, checks every frame came, and renames the file into place. */
  finish(): void {
    this.flush();
    if (this.done !== this.frames) throw new Error(`${this.done} of the ${this.frames} frames the WAV header announced were written`);
    this.guard(() => {
      closeSync(this.fd);
      this.fd = -1;
      renameSync(this.tmp, this.path);
    });
  }

  /** Leaves nothing behind (after a failed render or write). */
  abort(): void {
    if (this.fd >= 0) closeSync(this.fd);
    this.fd = -1;
    try {
      unlinkSync(this.tmp);
    } catch {
      // nothing was left behind
    }
  }

  private flush(): void {
    if (this.held === 0) return;
    this.guard(() => writeSync(this.fd, this.block, 0, this.held * this.stride));
    this.done += this.held;
    this.held = 0;
  }

  /** A file system failure: nothing left behind, one message naming the file and the reason. */
  private guard(action: () => void): void {
    try {
      action();
    } catch (e) {
      this.abort();
      throw new InputError(`cannot write ${this.path}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
    }
  }
}

/** Encodes and writes a whole WAV file atomically (WavFileWriter). */
export async function writeWav(path: string, channels: Float32Array[], sampleRate: number, format: WavFormat): Promise<void> {
  const writer = new WavFileWriter(path, channels.length, sampleRate, format, channels[0]?.length ?? 0);
  try {
    writer.write(channels);
    writer.finish();
  } catch (e) {
    writer.abort();
    throw e;
  }
}

/** Writes a text file atomically, like writeWav. */
export async function writeTextAtomic(path: string, text: string): Promise<void> {
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  try {
    await writeFile(tmp, text);
    await rename(tmp, path);
  } catch (e) {
    await unlink(tmp).catch(() => undefined);
    throw new InputError(`cannot write ${path}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
}
