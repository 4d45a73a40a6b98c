// The CLI's WAV reader and writer (src/cli/wav.ts). References: wavefile 11.0.0, the library the CLI
// used before, both for the bytes written (old outputs stay bit-identical) and for the samples read;
// the RIFF/WAVE layout (Microsoft/IBM Multimedia Programming Interface and Data Specifications 1.0, 1991).
import { describe, expect, it } from 'vitest';
import { closeSync, mkdirSync, mkdtempSync, openSync, readdirSync, readFileSync, writeFileSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import wavefile from 'wavefile';
import { checkWavHeader, readWav, WavFileWriter, writeWav, type WavFormat } from '../src/cli/wav.ts';
import { cannotRead } from '../src/cli/input-file.ts';
import { InputError } from '../src/cli/command.ts';
import { readAudioInput } from '../src/cli/audio-input.ts';
import { encodeBlock, encodeWavBytes } from '../src/wav/encode.ts';

const dir = mkdtempSync(join(tmpdir(), 'preheard-wav-'));

/** The writer this CLI used before, through wavefile: the reference for the bytes. */
function wavefileBytes(channels: Float32Array[], sampleRate: number, format: WavFormat): Uint8Array {
  const wav = new wavefile.WaveFile();
  const data =
    format === 'f32'
      ? channels
      : channels.map((c) => {
          const full = format === '24' ? 8388607 : 32767;
          const out = format === '24' ? new Int32Array(c.length) : new Int16Array(c.length);
          for (let j = 0; j < c.length; j++) {
            const v = Math.round(c[j] * (full + 1));
            out[j] = v > full ? full : v < -full - 1 ? -full - 1 : v;
          }
          return out;
        });
  wav.fromScratch(channels.length, sampleRate, format === 'f32' ? '32f' : format, data as unknown as number[][]);
  return wav.toBuffer();
}

/** Deterministic test signal: tones, noise from a linear congruential generator, and values beyond full scale. */
function signal(channels: number, frames: number, seed = 1): Float32Array[] {
  let x = seed;
  const rnd = () => {
    x = (x * 1103515245 + 12345) % 2147483648;
    return (x / 2147483648) * 2 - 1;
  };
  return Array.from({ length: channels }, (_, c) =>
    Float32Array.from({ length: frames }, (_, k) => (k % 97 === 0 ? 1.3 * rnd() : 0.6 * Math.sin(0.01 * k * (c + 1)) + 0.3 * rnd())),
  );
}

async function written(channels: Float32Array[], rate: number, format: WavFormat): Promise<Uint8Array> {
  const path = join(dir, `w-${format}-${channels.length}-${rate}-${channels[0].length}.wav`);
  await writeWav(path, channels, rate, format);
  return new Uint8Array(readFileSync(path));
}

describe('WAV writer', () => {
  for (const format of ['16', '24', 'f32'] as const) {
    for (const [nc, rate, frames] of [
      [1, 44100, 1001],
      [2, 48000, 30000],
      [2, 96000, 7],
      [1, 8000, 1],
    ] as const) {
      it(`writes the same bytes as wavefile: ${format}, ${nc} channel(s), ${rate} Hz, ${frames} frames`, async () => {
        const ch = signal(nc, frames, frames);
        expect(Buffer.from(await written(ch, rate, format)).equals(Buffer.from(wavefileBytes(ch, rate, format)))).toBe(true);
      });
    }
  }
  it('writes blocks larger than one write block (several MB) identically', async () => {
    const ch = signal(2, 48000 * 25, 7);
    expect(Buffer.from(await written(ch, 48000, '24')).equals(Buffer.from(wavefileBytes(ch, 48000, '24')))).toBe(true);
  });
  it('writes a file fed in uneven pieces (as a render feeds it) byte for byte as one whole write, then renames it into place', () => {
    for (const format of ['16', '24', 'f32'] as const)
      for (const nc of [1, 2]) {
        const frames = 48000 * 12 + 5; // over one 4 MB block in every format
        const ch = signal(nc, frames, 3);
        const path = join(dir, `pieces-${format}-${nc}.wav`);
        const w = new WavFileWriter(path, nc, 48000, format, frames);
        let rand = 11;
        for (let at = 0; at < frames; ) {
          rand = (rand * 1103515245 + 12345) % 2147483648;
          const n = Math.min(frames - at, 1 + (rand % 9000));
          w.write(ch.map((c) => c.subarray(at, at + n)));
          at += n;
        }
        expect(readdirSync(dir)).not.toContain(`pieces-${format}-${nc}.wav`);
        w.finish();
        expect(Buffer.from(readFileSync(path)).equals(Buffer.from(wavefileBytes(ch, 48000, format)))).toBe(true);
      }
  });
  it('refuses more frames than announced, and a finish before all came; abort leaves nothing', () => {
    const path = join(dir, 'short.wav');
    const w = new WavFileWriter(path, 1, 44100, '16', 100);
    expect(() => w.write([new Float32Array(101)])).toThrow(/more frames than the WAV header announced/);
    w.write([new Float32Array(60)]);
    expect(() => w.finish()).toThrow(/60 of the 100 frames/);
    w.abort();
    expect(readdirSync(dir).filter((f) => f.includes('short.wav'))).toEqual([]);
  });
  it('reports a folder that cannot be written with a message and leaves nothing', async () => {
    const err = await writeWav(join(dir, 'no-such-folder', 'x.wav'), signal(1, 10), 44100, '16').catch((e) => e);
    expect(err).toBeInstanceOf(InputError);
    expect(err.message).toMatch(/cannot write .*x\.wav: ENOENT/);
  });
});

/**
 * Samples at the edges of the conversion: the rails and just past them, half steps (Math.round
 * rounds them up), negative zero, a subnormal, the largest floats, infinities; then noise past
 * full scale. Every length from 1 to 9 frames reaches each tail of the word-packed loops.
 */
function edges(channels: number, frames: number, seed: number): Float32Array[] {
  const at16 = (v: number) => v / 32768;
  const at24 = (v: number) => v / 8388608;
  const special = [
    0,
    -0,
    1,
    -1,
    Math.fround(1 + 2 ** -23),
    Math.fround(-1 - 2 ** -23),
    at16(32767.5),
    at16(-32768.5),
    at16(32766.5),
    at16(-32767.5),
    at16(0.5),
    at16(-0.5),
    at16(1.5),
    at16(-1.5),
    at24(8388607.5),
    at24(-8388608.5),
    at24(0.5),
    at24(-0.5),
    at24(-1.5),
    1e-40,
    -1e-40,
    3.4e38,
    -3.4e38,
    Number.POSITIVE_INFINITY,
    Number.NEGATIVE_INFINITY,
    0.999999,
    -0.999999,
  ];
  const noise = signal(channels, frames, seed);
  return noise.map((ch, c) => {
    for (let k = 0; k < frames; k++) if ((k * 7 + c * 3) % 5 !== 4) ch[k] = special[(k * channels + c) % special.length];
    return ch;
  });
}

/** wavefile's samples per channel (it gives one flat array for a mono file). */
function samplesOf(bytes: Uint8Array, channels: number): Float64Array[] {
  const s = new wavefile.WaveFile(bytes).getSamples(false, Float64Array) as unknown as Float64Array | Float64Array[];
  return channels === 1 ? [s as Float64Array] : (s as Float64Array[]);
}

describe('WAV fast paths (word-sized views) against wavefile', () => {
  for (const format of ['16', '24', 'f32'] as const) {
    for (const nc of [1, 2, 3]) {
      it(`writes and reads ${format}, ${nc} channel(s), 1 to 9 and 1001 frames, edge values, as wavefile does`, async () => {
        for (const frames of [1, 2, 3, 4, 5, 6, 7, 8, 9, 1001]) {
          const ch = edges(nc, frames, frames + nc);
          const ref = wavefileBytes(ch, 44100, format);
          // wavefile writes an extensible header for more than two channels: the audio bytes are compared there.
          const audioBytes = frames * nc * (format === '16' ? 2 : format === '24' ? 3 : 4);
          const same = (ours: Uint8Array) =>
            nc <= 2
              ? Buffer.from(ours).equals(Buffer.from(ref))
              : Buffer.from(ours.subarray(44)).equals(Buffer.from(ref.subarray(-audioBytes)));
          expect(same(await written(ch, 44100, format))).toBe(true);
          expect(same(encodeWavBytes(ch, 44100, format))).toBe(true);
          // An odd byte offset takes the byte-by-byte path: the same bytes.
          const odd = new Uint8Array(audioBytes + 1);
          encodeBlock(ch, format, 0, frames, odd.subarray(1));
          expect(Buffer.from(odd.subarray(1)).equals(Buffer.from(ref.subarray(-audioBytes)))).toBe(true);
          const path = join(dir, `edges-${format}-${nc}-${frames}.wav`);
          writeFileSync(path, ref);
          const refCh = samplesOf(ref, nc);
          const scale = format === 'f32' ? 1 : format === '24' ? 1 / 8388608 : 1 / 32768;
          // Float files hold infinities, which the reader refuses: they are read from the integer files only.
          if (format === 'f32') continue;
          const ours = await readWav(path);
          for (let c = 0; c < nc; c++)
            for (let k = 0; k < frames; k++)
              if (!Object.is(ours.channels[c][k], Math.fround(refCh[c][k] * scale)))
                throw new Error(`${frames} frames: differs at ${c}:${k}: ${ours.channels[c][k]} vs ${refCh[c][k] * scale}`);
        }
      });
    }
  }

  it('rounds as Math.round for any float32: random bit patterns of every exponent, 16 and 24 bits', async () => {
    // Random sign, exponent and mantissa: tiny magnitudes (where x + 0.5 is inexact), half steps and
    // values past the rails alike; non-finite patterns are left out (the rails and NaN are tested above).
    let x = 99;
    const bits = new Uint32Array(200_001);
    for (let k = 0; k < bits.length; k++) {
      x = (x * 1103515245 + 12345) % 2147483648;
      const exponent = 80 + (x % 80); // 2^-47 .. 2^32
      // Every third with its low mantissa bits cleared: exact half steps, where rounding is decided.
      const mantissa = (x >>> 7) & (k % 3 === 0 ? 0x7ff000 : 0x7fffff);
      bits[k] = ((x & 1) << 31) | (exponent << 23) | mantissa;
    }
    const ch = [new Float32Array(bits.buffer)];
    for (const format of ['16', '24'] as const) {
      const ref = wavefileBytes(ch, 48000, format);
      expect(Buffer.from(encodeWavBytes(ch, 48000, format)).equals(Buffer.from(ref))).toBe(true);
    }
  });

  for (const [format, nc, seconds] of [
    ['16', 2, 25],
    ['f32', 2, 12],
    ['24', 1, 30],
  ] as const) {
    it(`writes and reads ${format}, ${nc} channel(s) over several 4 MB blocks (odd frame count) as wavefile does`, async () => {
      const ch = signal(nc, seconds * 48000 + 3, 11);
      const ref = wavefileBytes(ch, 48000, format);
      expect(Buffer.from(await written(ch, 48000, format)).equals(Buffer.from(ref))).toBe(true);
      const path = join(dir, `blocks-${format}-${nc}.wav`);
      writeFileSync(path, ref);
      const ours = await readWav(path);
      const refCh = samplesOf(ref, nc);
      const scale = format === 'f32' ? 1 : format === '24' ? 1 / 8388608 : 1 / 32768;
      for (let c = 0; c < nc; c++)
        for (let k = 0; k < ch[c].length; k++)
          if (ours.channels[c][k] !== Math.fround(refCh[c][k] * scale)) throw new Error(`differs at ${c}:${k}`);
    });
  }
});

describe('WAV reader', () => {
  for (const format of ['16', '24', 'f32'] as const) {
    it(`reads what wavefile reads: ${format}, stereo`, async () => {
      const bytes = wavefileBytes(signal(2, 5000, 3), 48000, format);
      const path = join(dir, `r-${format}.wav`);
      writeFileSync(path, bytes);
      const ours = await readWav(path);
      const ref = new wavefile.WaveFile(bytes);
      const refCh = ref.getSamples(false, Float64Array) as unknown as Float64Array[];
      const scale = format === 'f32' ? 1 : format === '24' ? 1 / 8388608 : 1 / 32768;
      expect(ours.format).toBe(format);
      expect(ours.sampleRate).toBe(48000);
      expect(ours.channels).toHaveLength(2);
      for (let c = 0; c < 2; c++) {
        expect(ours.channels[c].length).toBe(5000);
        for (let k = 0; k < 5000; k++)
          if (ours.channels[c][k] !== Math.fround(refCh[c][k] * scale)) throw new Error(`differs at ${c}:${k}`);
      }
    });
  }

  it('reads an extensible (0xFFFE) header with a LIST chunk before the audio, 3 channels of 24-bit', async () => {
    const frames = 100;
    const fmt = new Uint8Array(48);
    const v = new DataView(fmt.buffer);
    fmt.set(new TextEncoder().encode('fmt '), 0);
    v.setUint32(4, 40, true);
    v.setUint16(8, 0xfffe, true);
    v.setUint16(10, 3, true);
    v.setUint32(12, 44100, true);
    v.setUint32(16, 44100 * 9, true);
    v.setUint16(20, 9, true);
    v.setUint16(22, 24, true);
    v.setUint16(24, 22, true);
    v.setUint16(26, 24, true);
    v.setUint16(32, 1, true); // sub-format GUID starts with the PCM code
    const list = new Uint8Array([...new TextEncoder().encode('LIST'), 3, 0, 0, 0, 1, 2, 3, 0]); // odd size, one pad byte
    const data = new Uint8Array(8 + frames * 9);
    const dv = new DataView(data.buffer);
    data.set(new TextEncoder().encode('data'), 0);
    dv.setUint32(4, frames * 9, true);
    for (let k = 0; k < frames; k++) for (let c = 0; c < 3; c++) dv.setInt16(8 + 9 * k + 3 * c + 1, (c + 1) * 1000 - k, true);
    const riff = new Uint8Array(12);
    riff.set(new TextEncoder().encode('RIFF'), 0);
    new DataView(riff.buffer).setUint32(4, 4 + fmt.length + list.length + data.length, true);
    riff.set(new TextEncoder().encode('WAVE'), 8);
    const path = join(dir, 'extensible.wav');
    writeFileSync(path, Buffer.concat([riff, fmt, list, data]));
    const w = await readWav(path);
    expect(w.format).toBe('24');
    expect(w.channels).toHaveLength(3);
    // Each sample is ((c+1)*1000 - k) * 256 in 24 bits, so its value is that over 2^15.
    expect(w.channels[2][5]).toBe((3000 - 5) / 32768);
    expect(w.channels[0][99]).toBe((1000 - 99) / 32768);
  });

  it('refuses two fmt chunks, before or after the audio, and reads the one it checked', () => {
    const good = wavefileBytes(signal(1, 10), 44100, '16');
    const fmtChunk = good.slice(12, 36);
    const twoBefore = Buffer.concat([good.slice(0, 36), fmtChunk, good.slice(36)]);
    const twoAfter = Buffer.concat([good, fmtChunk]);
    expect(() => checkWavHeader(twoBefore, 'x.wav')).toThrow(/two fmt chunks/);
    expect(() => checkWavHeader(twoAfter, 'x.wav')).toThrow(/two fmt chunks/);
    const h = checkWavHeader(Buffer.concat([good, new Uint8Array(5)]), 'x.wav');
    expect(h).toMatchObject({ channels: 1, sampleRate: 44100, bits: 16, frames: 10, dataOffset: 44 });
  });

  it('reads a file of exactly 2^31 bytes (audio then a long trailing chunk) without reading it all', async () => {
    const audio = wavefileBytes(signal(2, 4800), 48000, '16');
    const path = join(dir, 'exactly-2gib.wav');
    const fd = openSync(path, 'w');
    writeSync(fd, audio);
    const junk = new Uint8Array(8);
    junk.set(new TextEncoder().encode('junk'), 0);
    new DataView(junk.buffer).setUint32(4, 2 ** 31 - audio.length - 8, true);
    writeSync(fd, junk);
    writeSync(fd, new Uint8Array(1), 0, 1, 2 ** 31 - 1); // sparse: the file is 2^31 bytes long
    closeSync(fd);
    const before = process.memoryUsage().arrayBuffers;
    const w = await readWav(path);
    expect(w.channels[0].length).toBe(4800);
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(64 * 2 ** 20);
  });

  for (const size of [2 ** 31, 2 ** 31 + 4096]) {
    it(`refuses a ${size}-byte WAV of audio early, with a message and without using the memory`, async () => {
      const path = join(dir, `big-${size}.wav`);
      const header = wavefileBytes([new Float32Array(0), new Float32Array(0)], 48000, '16');
      const dv = new DataView(header.buffer, header.byteOffset);
      dv.setUint32(4, Math.min(size - 8, 0xffffffff), true);
      dv.setUint32(40, size - 44, true);
      const fd = openSync(path, 'w');
      writeSync(fd, header);
      writeSync(fd, new Uint8Array(1), 0, 1, size - 1);
      closeSync(fd);
      const before = process.memoryUsage().arrayBuffers;
      const err = await readAudioInput(path).catch((e) => e);
      expect(err).toBeInstanceOf(InputError);
      expect(err.message).toMatch(/186\.4 minutes of 2-channel audio is too long: at most 46\.6 minutes at 48000 Hz/);
      expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(64 * 2 ** 20);
    });
  }

  it('gives user messages for a missing file, a folder and a refused permission', async () => {
    await expect(readAudioInput(join(dir, 'nope.wav'))).rejects.toThrow(/cannot read .*nope\.wav: there is no such file/);
    mkdirSync(join(dir, 'folder.wav'));
    await expect(readAudioInput(join(dir, 'folder.wav'))).rejects.toThrow(/folder\.wav: it is a folder, not a file/);
    // Permissions do not stop root, who runs these tests on CI: the message for EACCES is checked directly.
    const e = cannotRead('song.wav', Object.assign(new Error('EACCES: permission denied'), { code: 'EACCES' }));
    expect(e).toBeInstanceOf(InputError);
    expect(e.message).toBe('cannot read song.wav: permission denied');
  });

  it('keeps float audio up to +24 dBFS, scales a tone at 1e15 down to full scale with a warning, refuses NaN', async () => {
    const tone = (amp: number) => [Float32Array.from({ length: 480 }, (_, k) => amp * Math.sin((2 * Math.PI * k) / 48))];
    const at = async (amp: number, name: string) => {
      const path = join(dir, name);
      writeFileSync(path, wavefileBytes(tone(amp), 48000, 'f32'));
      return readWav(path);
    };
    const loud = await at(8, 'plus18.wav');
    expect(loud.warnings).toBeUndefined();
    expect(Math.max(...loud.channels[0])).toBeCloseTo(8, 5);
    const huge = await at(1e15, 'huge.wav');
    expect(huge.warnings?.[0]).toMatch(/peaks 300\.0 dB above full scale/);
    expect(Math.max(...huge.channels[0])).toBeCloseTo(1, 6);
    expect(huge.channels[0][12]).toBeCloseTo(1, 6); // sin(pi/2): the shape is kept
    const nan = tone(0.5);
    nan[0][100] = Number.NaN;
    writeFileSync(join(dir, 'nan.wav'), wavefileBytes(nan, 48000, 'f32'));
    await expect(readWav(join(dir, 'nan.wav'))).rejects.toThrow(/sample 100 is not a finite number/);
  });
});
