// MP3, FLAC and Ogg Vorbis input for the CLI, decoded by the WebAssembly builds of mpg123, libFLAC
// and libvorbis (npm: mpg123-decoder, @wasm-audio-decoders/flac, @wasm-audio-decoders/ogg-vorbis).
// The file is fed to the decoder in blocks, so the input length limit is enforced while decoding:
// an endless or enormous stream stops with a message instead of filling memory.
import { InputError } from './command.ts';
import { checkFloatRange } from './float-range.ts';
import { checkInputLength, MAX_INPUT_SAMPLES, openInput } from './input-file.ts';
import { MAX_CHANNELS, type ReadOptions, type WavAudio } from './wav.ts';
import { newChannels } from './shared-audio.ts';
import { count } from './user-text.ts';

export type Codec = 'mp3' | 'flac' | 'vorbis';

const CODEC_NAMES: Record<Codec, string> = { mp3: 'MP3', flac: 'FLAC', vorbis: 'Ogg Vorbis' };
const READ_BYTES = 1 << 20;

interface Decoded {
  channelData: Float32Array[];
  samplesDecoded: number;
  sampleRate: number;
  bitDepth?: number;
  errors: unknown[];
}

interface Decoder {
  ready: Promise<void>;
  decode(data: Uint8Array): Decoded | Promise<Decoded>;
  flush?(): Promise<Decoded>;
  free(): void;
}

const ascii = (b: Uint8Array, o: number, n: number) => String.fromCharCode(...b.subarray(o, o + n));

/**
 * Which codec the first bytes announce, or an answer naming the container when it is one we cannot
 * decode; null when the bytes are not a known compressed stream. `head` holds the file's start.
 */
export function sniffCodec(head: Uint8Array): Codec | { unsupported: string } | null {
  let o = 0;
  // An ID3v2 tag (id3.org, ID3 tag version 2.4.0 - Main Structure, section 3) may precede MP3 or FLAC audio.
  if (head.length >= 10 && ascii(head, 0, 3) === 'ID3') {
    const size = ((head[6] & 0x7f) << 21) | ((head[7] & 0x7f) << 14) | ((head[8] & 0x7f) << 7) | (head[9] & 0x7f);
    o = 10 + size + (head[5] & 0x10 ? 10 : 0);
    if (o + 4 <= head.length && ascii(head, o, 4) === 'fLaC') return 'flac';
    return 'mp3';
  }
  if (head.length >= 4 && ascii(head, 0, 4) === 'fLaC') return 'flac';
  if (head.length >= 4 && ascii(head, 0, 4) === 'OggS') {
    // The first page of an Ogg stream carries the codec's identification header (RFC 3533; Vorbis I
    // specification section 4.2.1; RFC 7845 section 5.1 for Opus).
    const text = ascii(head, 0, Math.min(head.length, 128));
    if (text.includes('\x01vorbis')) return 'vorbis';
    if (text.includes('\x7fFLAC')) return 'flac';
    if (text.includes('OpusHead')) return { unsupported: 'Ogg Opus' };
    return { unsupported: 'an Ogg stream of an unknown codec' };
  }
  // An MPEG audio frame header: 11 sync bits, then a version, and a layer other than "reserved"
  // (ISO/IEC 11172-3, section 2.4.2.3).
  if (head.length >= 2 && head[0] === 0xff && (head[1] & 0xe0) === 0xe0 && (head[1] & 0x06) !== 0) return 'mp3';
  return null;
}

async function createDecoder(codec: Codec): Promise<Decoder> {
  if (codec === 'mp3') {
    const { MPEGDecoder } = await import('mpg123-decoder');
    return new MPEGDecoder() as unknown as Decoder;
  }
  if (codec === 'flac') {
    const { FLACDecoder } = await import('@wasm-audio-decoders/flac');
    return new FLACDecoder() as unknown as Decoder;
  }
  const { OggVorbisDecoder } = await import('@wasm-audio-decoders/ogg-vorbis');
  return new OggVorbisDecoder() as unknown as Decoder;
}

/**
 * The FLAC decoder divides its integers by 2^(b-1) - 1 (seen: 96 in a 16-bit stream decodes to
 * 96/32767). The integers are recovered and divided by 2^(b-1) instead, the scale of WAV, so that a
 * FLAC file reads exactly as the WAV it was made from.
 */
function rescaleFlac(channels: Float32Array[], bitDepth: number): void {
  if (!(bitDepth >= 4 && bitDepth <= 32)) return;
  const full = 2 ** (bitDepth - 1);
  for (const ch of channels) for (let j = 0; j < ch.length; j++) ch[j] = Math.round(ch[j] * (full - 1)) / full;
}

/** Decodes a whole MP3, FLAC or Ogg Vorbis file. `onProgress` hears the fraction of the file read. */
export async function readCompressed(
  path: string,
  codec: Codec,
  onProgress?: (fraction: number) => void,
  maxSamples = MAX_INPUT_SAMPLES,
  options: ReadOptions = {},
): Promise<WavAudio> {
  const name = CODEC_NAMES[codec];
  const file = openInput(path);
  const decoder = await createDecoder(codec);
  const parts: Float32Array[][] = [];
  let frames = 0;
  let sampleRate = 0;
  let channelCount = 0;
  let bitDepth = 16;
  let damaged = 0;
  const take = (d: Decoded) => {
    damaged += d.errors.length;
    if (d.samplesDecoded === 0) return;
    if (sampleRate === 0) {
      sampleRate = d.sampleRate;
      channelCount = d.channelData.length;
      bitDepth = d.bitDepth ?? 16;
      if (channelCount < 1 || channelCount > MAX_CHANNELS)
        throw new InputError(`${path}: ${channelCount} channels: 1 to ${MAX_CHANNELS} are supported`);
      if (sampleRate < 8000 || sampleRate > 384000)
        throw new InputError(`${path}: sample rate ${sampleRate} Hz is outside 8000..384000 Hz`);
    } else if (d.sampleRate !== sampleRate || d.channelData.length !== channelCount) {
      throw new InputError(`${path}: the ${name} stream changes its sample rate or channel count part-way; convert it to WAV first`);
    }
    parts.push(d.channelData.map((c) => (c.length === d.samplesDecoded ? c : c.subarray(0, d.samplesDecoded))));
    frames += d.samplesDecoded;
    // Enforced while decoding: the stream stops here, not after it has filled memory.
    checkInputLength(path, frames, channelCount, sampleRate, maxSamples);
  };
  try {
    await decoder.ready;
    const block = new Uint8Array(Math.min(READ_BYTES, Math.max(1, file.size)));
    for (let at = 0; at < file.size; at += block.length) {
      const n = file.readAt(block, at);
      if (n === 0) break;
      // The decoders may keep a reference to what they are given, so each block is a fresh copy.
      take(await decoder.decode(block.slice(0, n)));
      onProgress?.(Math.min(1, (at + n) / file.size));
    }
    if (decoder.flush) take(await decoder.flush());
  } finally {
    decoder.free();
    file.close();
  }
  if (frames === 0) throw new InputError(`${path}: no audio could be decoded: not a valid ${name} file`);
  const channels = newChannels(channelCount, frames, options.shared);
  let at = 0;
  for (const p of parts) {
    for (let c = 0; c < channelCount; c++) channels[c].set(p[c], at);
    at += p[0].length;
  }
  parts.length = 0;
  if (codec === 'flac') rescaleFlac(channels, bitDepth);
  const warnings: string[] = [];
  if (damaged > 0) warnings.push(`${path}: ${count(damaged, 'damaged part')} of the ${name} stream skipped (short gaps)`);
  const scaled = checkFloatRange(channels, path);
  if (scaled) warnings.push(scaled);
  // Lossy streams have no bit depth of their own: 16-bit PCM is what they are usually played from.
  const format = codec === 'flac' && bitDepth > 16 ? '24' : '16';
  return { sampleRate, channels, format, ...(warnings.length ? { warnings } : {}) };
}
