// Compressed inputs of the CLI (src/cli/audio-input.ts, compressed-input.ts). The fixtures in
// test/fixtures/audio were made by Debian's sox (make.sh there): tone.wav and tone.flac hold the same
// 16-bit samples (FLAC is lossless), tone.ogg is Vorbis at quality 3. The MP3 is encoded here from
// tone.wav with @breezystack/lamejs, an encoder independent of the decoder under test.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Mp3Encoder } from '@breezystack/lamejs';
import { readAudioInput } from '../src/cli/audio-input.ts';
import { readCompressed, sniffCodec } from '../src/cli/compressed-input.ts';
import { readWav } from '../src/cli/wav.ts';
import { progressBar, progressCounter } from '../src/cli/progress.ts';
import { runCli } from './helpers/cli.ts';

const FIX = 'test/fixtures/audio';
const dir = mkdtempSync(join(tmpdir(), 'preheard-input-'));

/** Level in dB relative to full scale (RMS) and the frequency from zero crossings, over [from, to). */
function toneOf(x: Float32Array, rate: number, from: number, to: number) {
  let s = 0,
    crossings = 0;
  for (let k = from; k < to; k++) {
    s += x[k] * x[k];
    if (k > from && x[k - 1] < 0 && x[k] >= 0) crossings++;
  }
  return { rmsDb: 10 * Math.log10(s / (to - from)), hz: (crossings * rate) / (to - from) };
}

// sox's sine at "vol 0.5": peak 0.5, RMS 0.5/sqrt(2) = -9.03 dBFS.
const TONE_RMS_DB = 20 * Math.log10(0.5 / Math.SQRT2);

function encodeMp3(left: Float32Array, right: Float32Array, rate: number): Uint8Array {
  const toInt = (x: Float32Array) => Int16Array.from(x, (v) => Math.round(v * 32767));
  // 320 kbit/s: at 128 this encoder loses about 0.45 dB on a pure tone (measured here), at 320 none.
  const enc = new Mp3Encoder(2, rate, 320);
  const bytes = (b: ArrayBufferView) => new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  return Buffer.concat([bytes(enc.encodeBuffer(toInt(left), toInt(right))), bytes(enc.flush())]);
}

describe('compressed input', () => {
  it('FLAC decodes to exactly the samples of the WAV it was made from', async () => {
    const wav = await readWav(`${FIX}/tone.wav`);
    const flac = await readAudioInput(`${FIX}/tone.flac`);
    expect(flac.sampleRate).toBe(32000);
    expect(flac.format).toBe('16');
    expect(flac.channels).toHaveLength(2);
    expect(flac.channels[0].length).toBe(16000);
    for (let c = 0; c < 2; c++) expect(Buffer.from(flac.channels[c].buffer).equals(Buffer.from(wav.channels[c].buffer))).toBe(true);
    const left = toneOf(flac.channels[0], 32000, 0, 16000);
    expect(left.hz).toBeCloseTo(440, -1);
    expect(left.rmsDb).toBeCloseTo(TONE_RMS_DB, 1);
  });

  it('Ogg Vorbis decodes to the tones at their level (lossy: within 0.3 dB and 2 %)', async () => {
    const ogg = await readAudioInput(`${FIX}/tone.ogg`);
    expect(ogg.sampleRate).toBe(32000);
    expect(ogg.channels).toHaveLength(2);
    expect(Math.abs(ogg.channels[0].length - 16000)).toBeLessThan(64);
    for (const [c, hz] of [
      [0, 440],
      [1, 660],
    ]) {
      const t = toneOf(ogg.channels[c], 32000, 1000, 15000);
      expect(Math.abs(t.hz - hz) / hz).toBeLessThan(0.02);
      expect(Math.abs(t.rmsDb - TONE_RMS_DB)).toBeLessThan(0.3);
    }
  });

  it('MP3 decodes to the tones at their level, and is found by its bytes whatever its name', async () => {
    const wav = await readWav(`${FIX}/tone.wav`);
    const path = join(dir, 'tone.dat');
    writeFileSync(path, encodeMp3(wav.channels[0], wav.channels[1], 32000));
    expect(sniffCodec(new Uint8Array(readFileSync(path)))).toBe('mp3');
    const mp3 = await readAudioInput(path);
    expect(mp3.sampleRate).toBe(32000);
    expect(mp3.format).toBe('16');
    // MP3 adds the encoder's delay and pads the last frame: a little longer than the source.
    expect(mp3.channels[0].length).toBeGreaterThanOrEqual(16000);
    expect(mp3.channels[0].length).toBeLessThan(16000 + 4 * 1152);
    for (const [c, hz] of [
      [0, 440],
      [1, 660],
    ]) {
      const t = toneOf(mp3.channels[c], 32000, 3000, 14000);
      expect(Math.abs(t.hz - hz) / hz).toBeLessThan(0.02);
      expect(Math.abs(t.rmsDb - TONE_RMS_DB)).toBeLessThan(0.3);
    }
  });

  it('enforces the length limit while decoding, with a message', async () => {
    await expect(readCompressed(`${FIX}/tone.flac`, 'flac', undefined, 2 * 4000)).rejects.toThrow(
      /tone\.flac: 0\.\d s of 2-channel audio is too long: at most 0\.1 s at 32000 Hz/,
    );
  });

  it('names what it cannot read: damaged streams, Opus, unknown bytes', async () => {
    const flac = new Uint8Array(readFileSync(`${FIX}/tone.flac`));
    const cut = join(dir, 'header-only.flac');
    writeFileSync(cut, flac.subarray(0, 60));
    await expect(readAudioInput(cut)).rejects.toThrow(/no audio could be decoded: not a valid FLAC file/);
    const opus = new Uint8Array(200);
    opus.set(new TextEncoder().encode('OggS'), 0);
    opus.set(new TextEncoder().encode('OpusHead'), 28);
    writeFileSync(join(dir, 'x.opus'), opus);
    await expect(readAudioInput(join(dir, 'x.opus'))).rejects.toThrow(/Ogg Opus is not supported: use WAV .*FLAC, MP3 or Ogg Vorbis/);
    writeFileSync(join(dir, 'x.txt'), 'hello, this is text');
    await expect(readAudioInput(join(dir, 'x.txt'))).rejects.toThrow(
      /not a WAV file nor another known audio file \(it starts with "hell"\)/,
    );
  });

  it('renders an MP3 through the CLI, writing 16-bit WAV by default', async () => {
    const wav = await readWav(`${FIX}/tone.wav`);
    const input = join(dir, 'song.mp3');
    writeFileSync(input, encodeMp3(wav.channels[0], wav.channels[1], 32000));
    const out = join(dir, 'song-out.wav');
    const r = await runCli('render', 'public/examples/living-room-sealed.json', input, '-o', out, '--json');
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).sample_rate).toBe(32000);
    const written = await readWav(out);
    expect(written.format).toBe('16');
    expect(written.channels[0].length).toBeGreaterThanOrEqual(16000);
  });
});

describe('progress', () => {
  const stream = (isTTY: boolean) => {
    const text: string[] = [];
    return { isTTY, write: (s: string) => text.push(s), text };
  };
  it('draws nothing when stderr is not a terminal', () => {
    expect(progressBar('rendering', stream(false))).toBeUndefined();
    expect(progressCounter('finding headroom', 'render', stream(false))).toBeUndefined();
  });
  it('stays quiet for a short step, then draws at most every 100 ms and ends the line', () => {
    let t = 0;
    const s = stream(true);
    const bar = progressBar('rendering', s, () => t)!;
    bar(0.1);
    t = 300;
    bar(0.2);
    expect(s.text).toEqual([]);
    t = 500;
    bar(0.5);
    t = 550;
    bar(0.6);
    t = 700;
    bar(0.7);
    bar(1);
    expect(s.text).toHaveLength(3);
    expect(s.text[0]).toBe(`\rrendering [${'#'.repeat(15)}${' '.repeat(15)}] 50%`);
    expect(s.text[2]).toBe(`\rrendering [${'#'.repeat(30)}] 100%\n`);
  });
  it('a quick step leaves no line behind; a counter counts', () => {
    let t = 0;
    const quiet = stream(true);
    const bar = progressBar('reading', quiet, () => t)!;
    bar(0.5);
    bar(1);
    expect(quiet.text).toEqual([]);
    const s = stream(true);
    const c = progressCounter('finding headroom', 'render', s, () => t)!;
    t = 1000;
    c.tick();
    t = 2000;
    c.tick();
    c.done();
    expect(s.text).toEqual(['\rfinding headroom: render 1', '\rfinding headroom: render 2', '\rfinding headroom: 2 renders, done\n']);
  });
});
