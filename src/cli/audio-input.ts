// Every audio input of the CLI: WAV read directly, MP3, FLAC and Ogg Vorbis through their decoders,
// told apart by the file's first bytes rather than its name.
import { InputError } from './command.ts';
import { readCompressed, sniffCodec } from './compressed-input.ts';
import { MAX_INPUT_SAMPLES, openInput } from './input-file.ts';
import { readWav, type ReadOptions, type WavAudio } from './wav.ts';

export const INPUT_FORMATS = 'WAV (16/24-bit PCM, 32-bit float), FLAC, MP3 or Ogg Vorbis';
const SNIFF_BYTES = 1 << 16;

/** Reads any supported audio file; `options.shared` puts the channels in SharedArrayBuffers. */
export async function readAudioInput(path: string, onProgress?: (fraction: number) => void, options: ReadOptions = {}): Promise<WavAudio> {
  const file = openInput(path);
  const head = new Uint8Array(Math.min(SNIFF_BYTES, file.size));
  try {
    file.readAt(head, 0);
  } finally {
    file.close();
  }
  if (head.length < 4 || String.fromCharCode(...head.subarray(0, 4)) === 'RIFF') return readWav(path, onProgress, options);
  const codec = sniffCodec(head);
  if (codec === null) {
    const start = String.fromCharCode(...head.subarray(0, 4)).replace(/[^\x20-\x7e]/g, '?');
    throw new InputError(`${path}: not a WAV file nor another known audio file (it starts with "${start}"): use ${INPUT_FORMATS}`);
  }
  if (typeof codec === 'object') throw new InputError(`${path}: ${codec.unsupported} is not supported: use ${INPUT_FORMATS}`);
  return readCompressed(path, codec, onProgress, MAX_INPUT_SAMPLES, options);
}
