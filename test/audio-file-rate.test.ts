// A file's own sample rate, read from its header: WAV written by wavefile, FLAC and Ogg Vorbis made
// by sox (test/fixtures/audio/make.sh, 32 kHz), MP3 encoded here by @breezystack/lamejs at 22.05 kHz
// (independent encoders of the reader under test).
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { Mp3Encoder } from '@breezystack/lamejs';
import wavefile from 'wavefile';
import { fileSampleRate } from '../src/audio/file-rate.ts';

function mp3(rate: number, withId3 = false): Uint8Array {
  const n = rate;
  const x = Int16Array.from({ length: n }, (_, k) => Math.round(8000 * Math.sin((2 * Math.PI * 440 * k) / rate)));
  const enc = new Mp3Encoder(1, rate, 64);
  const parts = [enc.encodeBuffer(x), enc.flush()].map((b) => new Uint8Array(b.buffer, b.byteOffset, b.byteLength));
  // An ID3v2 header with a 300-byte tag (size as four 7-bit bytes; ID3v2.4 structure).
  const id3 = withId3 ? [new Uint8Array([0x49, 0x44, 0x33, 4, 0, 0, 0, 0, 2, 44]), new Uint8Array(300)] : [];
  return Buffer.concat([...id3, ...parts]);
}

describe("a file's own sample rate", () => {
  it('WAV, from its fmt chunk', () => {
    for (const rate of [22050, 44100, 96000]) {
      const w = new wavefile.WaveFile();
      w.fromScratch(2, rate, '16', [new Int16Array(100), new Int16Array(100)]);
      expect(fileSampleRate(w.toBuffer())).toBe(rate);
    }
  });

  it('MP3 (with and without an ID3 tag), FLAC and Ogg Vorbis, from their first frame', () => {
    expect(fileSampleRate(mp3(22050))).toBe(22050);
    expect(fileSampleRate(mp3(44100, true))).toBe(44100);
    expect(fileSampleRate(readFileSync('test/fixtures/audio/tone.flac'))).toBe(32000);
    expect(fileSampleRate(readFileSync('test/fixtures/audio/tone.ogg'))).toBe(32000);
  });

  it('nothing for what it cannot read', () => {
    expect(fileSampleRate(new Uint8Array(0))).toBeNull();
    expect(fileSampleRate(new TextEncoder().encode('not audio at all'))).toBeNull();
    expect(fileSampleRate(new Uint8Array([0x52, 0x49, 0x46, 0x46, 0, 0, 0, 0, 0x57, 0x41, 0x56, 0x45]))).toBeNull();
    expect(fileSampleRate(mp3(22050).subarray(0, 3))).toBeNull();
  });
});
