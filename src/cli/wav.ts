// WAV in and out for the CLI (wavefile does the coding). The header is checked here first, so a
// bad file gives a clear message instead of a crash, a hang or a huge allocation. Output goes to a
// temporary name in the same folder and is renamed into place only when complete.
import { readFile, rename, unlink, writeFile, stat } from 'node:fs/promises';
import { dirname, basename, join } from 'node:path';
import wavefile from 'wavefile';
import { InputError } from './command.ts';

export type WavFormat = '16' | '24' | 'f32';

export interface WavAudio {
  sampleRate: number;
  channels: Float32Array[];
  format: WavFormat;
}

/** Longest input accepted: 4 GiB is the RIFF limit anyway; we stop at 2 GiB (a 3-hour 96 kHz stereo float file). */
export const MAX_WAV_BYTES = 2 ** 31;
export const MAX_CHANNELS = 8;

const FORMAT_PCM = 1;
const FORMAT_FLOAT = 3;
const FORMAT_EXTENSIBLE = 0xfffe;

interface Header {
  formatTag: number;
  channels: number;
  sampleRate: number;
  bits: number;
  blockAlign: number;
  dataBytes: number;
  /** Offset just past the data chunk: later chunks are not needed and not trusted. */
  dataEnd: number;
}

/** Walks the RIFF chunks; throws InputError naming what is wrong. */
export function checkWavHeader(bytes: Uint8Array, name: string): Header {
  const fail = (msg: string): never => {
    throw new InputError(`${name}: ${msg}`);
  };
  if (bytes.length === 0) fail('the file is empty');
  if (bytes.length < 12) fail(`only ${bytes.length} bytes: too short for a WAV header (12 bytes at least)`);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const tag = (o: number) => String.fromCharCode(bytes[o], bytes[o + 1], bytes[o + 2], bytes[o + 3]);
  if (tag(0) !== 'RIFF') fail(`not a WAV file: it starts with "${tag(0).replace(/[^\x20-\x7e]/g, '?')}", not "RIFF"`);
  if (tag(8) !== 'WAVE') fail(`a RIFF file but not WAVE (form type "${tag(8).replace(/[^\x20-\x7e]/g, '?')}")`);
  let o = 12;
  let fmt: Omit<Header, 'dataBytes' | 'dataEnd'> | null = null;
  let dataBytes = -1;
  while (o + 8 <= bytes.length) {
    const id = tag(o);
    const size = view.getUint32(o + 4, true);
    const body = o + 8;
    if (id === 'fmt ') {
      if (size < 16) fail(`the fmt chunk is ${size} bytes, at least 16 expected`);
      if (body + 16 > bytes.length) fail('truncated inside the fmt chunk');
      let formatTag = view.getUint16(body, true);
      const channels = view.getUint16(body + 2, true);
      const sampleRate = view.getUint32(body + 4, true);
      const blockAlign = view.getUint16(body + 12, true);
      const bits = view.getUint16(body + 14, true);
      if (formatTag === FORMAT_EXTENSIBLE) {
        if (size < 40 || body + 26 > bytes.length) fail('an extensible fmt chunk shorter than 40 bytes');
        formatTag = view.getUint16(body + 24, true);
      }
      fmt = { formatTag, channels, sampleRate, bits, blockAlign };
    } else if (id === 'data') {
      if (!fmt) fail('the data chunk comes before the fmt chunk');
      dataBytes = size;
      if (body + size > bytes.length) {
        fail(`truncated: the data chunk declares ${size} bytes but only ${bytes.length - body} follow`);
      }
      break;
    }
    if (size > bytes.length - body)
      fail(`the "${id.replace(/[^\x20-\x7e]/g, '?')}" chunk declares ${size} bytes, more than the ${bytes.length - body} left in the file`);
    o = body + size + (size & 1);
  }
  if (!fmt) fail('no fmt chunk: not a usable WAV file');
  if (dataBytes < 0) fail('no data chunk: the file has no audio');
  const f = fmt!;
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
  return { ...f, dataBytes: dataBytes - (dataBytes % f.blockAlign), dataEnd: o + 8 + dataBytes };
}

export async function readWav(path: string): Promise<WavAudio> {
  let info: Awaited<ReturnType<typeof stat>>;
  try {
    info = await stat(path);
  } catch (e) {
    throw new InputError(`cannot read ${path}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
  if (!info.isFile()) throw new InputError(`${path} is not a file`);
  if (info.size > MAX_WAV_BYTES) throw new InputError(`${path}: ${info.size} bytes is larger than the ${MAX_WAV_BYTES} bytes accepted`);
  const bytes = new Uint8Array(await readFile(path));
  const h = checkWavHeader(bytes, path);
  let wav: InstanceType<typeof wavefile.WaveFile>;
  try {
    wav = new wavefile.WaveFile(bytes.subarray(0, h.dataEnd));
  } catch (e) {
    throw new InputError(`${path}: cannot decode: ${(e as Error).message}`);
  }
  const raw = wav.getSamples(false, Float32Array) as unknown as Float32Array | Float32Array[];
  const chans = h.channels === 1 ? [raw as Float32Array] : (raw as Float32Array[]);
  const frames = h.dataBytes / h.blockAlign;
  const scale = h.formatTag === FORMAT_FLOAT ? 1 : 1 / 2 ** (h.bits - 1);
  const channels = chans.map((c) => {
    const out = c.length === frames ? c : c.subarray(0, frames);
    if (scale !== 1) for (let j = 0; j < out.length; j++) out[j] *= scale;
    return out;
  });
  for (const c of channels) {
    for (let j = 0; j < c.length; j++) {
      if (!Number.isFinite(c[j])) throw new InputError(`${path}: sample ${j} is not a finite number`);
    }
  }
  return { sampleRate: h.sampleRate, channels, format: h.formatTag === FORMAT_FLOAT ? 'f32' : h.bits === 24 ? '24' : '16' };
}

/** Encodes and writes atomically: a temporary file in the same folder, renamed when complete. */
export async function writeWav(path: string, channels: Float32Array[], sampleRate: number, format: WavFormat): Promise<void> {
  const wav = new wavefile.WaveFile();
  let data: (Float32Array | Int32Array | Int16Array)[];
  let code: string;
  if (format === 'f32') {
    data = channels;
    code = '32f';
  } else {
    const full = format === '24' ? 8388607 : 32767;
    data = channels.map((c) => {
      const out = format === '24' ? new Int32Array(c.length) : new Int16Array(c.length);
      for (let j = 0; j < c.length; j++) {
        const v = Math.round(c[j] * (full + 1));
        out[j] = v > full ? full : v < -full - 1 ? -full - 1 : v;
      }
      return out;
    });
    code = format;
  }
  wav.fromScratch(channels.length, sampleRate, code, data as unknown as number[][]);
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  try {
    await writeFile(tmp, wav.toBuffer());
    await rename(tmp, path);
  } catch (e) {
    await unlink(tmp).catch(() => undefined);
    throw new InputError(`cannot write ${path}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
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
