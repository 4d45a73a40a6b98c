// The sample rate a file was stored at, from its own header (the fixtures are 32 kHz, made by sox:
// test/fixtures/audio/make.sh; the MP3 is encoded here at 22.05 kHz by @breezystack/lamejs, an
// encoder independent of the parser under test).
import { readFileSync } from 'node:fs';
import { Mp3Encoder } from '@breezystack/lamejs';
import { describe, expect, it } from 'vitest';
import { fileSampleRate } from '../src/audio/file-rate.ts';

const FIX = 'test/fixtures/audio';
const blob = (bytes: Uint8Array) => new Blob([new Uint8Array(bytes)]);

function mp3(rate: number, id3Bytes = 0): Uint8Array {
  const enc = new Mp3Encoder(1, rate, 64);
  const tone = Int16Array.from({ length: rate / 2 }, (_, k) => Math.round(8000 * Math.sin((2 * Math.PI * 440 * k) / rate)));
  const parts = [enc.encodeBuffer(tone), enc.flush()].map((b) => new Uint8Array(b.buffer, b.byteOffset, b.byteLength));
  // An ID3v2.4 tag of the given size in front (synchsafe size), as cover art would make it.
  const tag = new Uint8Array(id3Bytes ? 10 + id3Bytes : 0);
  if (id3Bytes) {
    tag.set([0x49, 0x44, 0x33, 4, 0, 0]);
    tag.set([(id3Bytes >> 21) & 0x7f, (id3Bytes >> 14) & 0x7f, (id3Bytes >> 7) & 0x7f, id3Bytes & 0x7f], 6);
  }
  const out = new Uint8Array(tag.length + parts.reduce((n, p) => n + p.length, 0));
  out.set(tag);
  let at = tag.length;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}

describe("a file's own sample rate", () => {
  it('reads WAV, FLAC and Ogg Vorbis headers', async () => {
    for (const name of ['tone.wav', 'tone.flac', 'tone.ogg']) {
      expect(await fileSampleRate(blob(readFileSync(`${FIX}/${name}`))), name).toBe(32000);
    }
  });

  it('reads an MP3 at 22.05 kHz, also behind a large ID3 tag', async () => {
    expect(await fileSampleRate(blob(mp3(22050)))).toBe(22050);
    expect(await fileSampleRate(blob(mp3(48000)))).toBe(48000);
    expect(await fileSampleRate(blob(mp3(22050, 200_000)))).toBe(22050);
  });

  it('gives null for what it does not read', async () => {
    expect(await fileSampleRate(blob(new Uint8Array(0)))).toBeNull();
    expect(await fileSampleRate(blob(new TextEncoder().encode('{"not": "audio"}')))).toBeNull();
  });
});
