// Audio read into SharedArrayBuffers for worker threads (readAudioInput's `shared` option,
// src/cli/shared-audio.ts): the same samples as an ordinary read, each channel spanning a whole
// SharedArrayBuffer, handed to workers without a copy; anything else is copied.
import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import { readAudioInput } from '../src/cli/audio-input.ts';
import { writeWav } from '../src/cli/wav.ts';
import { newChannels, sharedBuffers } from '../src/cli/shared-audio.ts';

const FIX = 'test/fixtures/audio';
const dir = mkdtempSync(join(tmpdir(), 'preheard-shared-'));

const bytesOf = (ch: Float32Array) => Buffer.from(ch.buffer, ch.byteOffset, ch.byteLength);

describe('shared audio input', () => {
  const wav24 = join(dir, 'three.wav');
  it('reads WAV (16/24-bit, float), FLAC and Ogg Vorbis into SharedArrayBuffers, sample for sample as an ordinary read', async () => {
    const tone = Array.from({ length: 3 }, (_, c) => Float32Array.from({ length: 4801 }, (_, k) => 0.7 * Math.sin(0.003 * (c + 1) * k)));
    await writeWav(wav24, tone, 48000, '24');
    const paths = [`${FIX}/tone.wav`, `${FIX}/tone.flac`, `${FIX}/tone.ogg`, wav24];
    for (const format of ['16', 'f32'] as const) {
      const p = join(dir, `stereo-${format}.wav`);
      await writeWav(p, tone.slice(0, 2), 44100, format);
      paths.push(p);
    }
    for (const path of paths) {
      const plain = await readAudioInput(path);
      const shared = await readAudioInput(path, undefined, { shared: true });
      expect(plain.channels[0].buffer).toBeInstanceOf(ArrayBuffer);
      expect(shared.sampleRate).toBe(plain.sampleRate);
      expect(shared.format).toBe(plain.format);
      expect(shared.channels).toHaveLength(plain.channels.length);
      for (let c = 0; c < plain.channels.length; c++) {
        const ch = shared.channels[c];
        expect(ch.buffer).toBeInstanceOf(SharedArrayBuffer);
        expect(ch.byteOffset).toBe(0);
        expect(ch.byteLength).toBe(ch.buffer.byteLength);
        expect(bytesOf(ch).equals(bytesOf(plain.channels[c]))).toBe(true);
      }
    }
  });

  it('hands shared channels on as they are and copies the others', () => {
    const shared = newChannels(2, 100, true);
    shared[1][5] = 0.25;
    const own = sharedBuffers(shared);
    expect(own[0]).toBe(shared[0].buffer);
    expect(own[1]).toBe(shared[1].buffer);
    const plain = newChannels(1, 100);
    plain[0][7] = -0.5;
    const part = shared[1].subarray(1, 51);
    const copies = sharedBuffers([plain[0], part]);
    expect(copies[0]).not.toBe(plain[0].buffer);
    expect(new Float32Array(copies[0])[7]).toBe(-0.5);
    expect(copies[1]).not.toBe(shared[1].buffer);
    expect(copies[1].byteLength).toBe(200);
    expect(new Float32Array(copies[1])[4]).toBe(0.25);
  });

  it('lets a worker thread read what the main thread wrote, through the same memory', async () => {
    const [ch] = newChannels(1, 1000, true);
    for (let k = 0; k < ch.length; k++) ch[k] = k / 1000;
    const [sab] = sharedBuffers([ch]);
    const w = new Worker(
      `const { parentPort, workerData } = require('node:worker_threads');
       const x = new Float32Array(workerData);
       let s = 0;
       for (let k = 0; k < x.length; k++) s += x[k];
       x[0] = 42;
       parentPort.postMessage(s);`,
      { eval: true, workerData: sab },
    );
    const sum = await new Promise<number>((resolve, reject) => {
      w.once('message', resolve);
      w.once('error', reject);
    });
    await w.terminate();
    let expected = 0;
    for (let k = 0; k < ch.length; k++) if (k > 0) expected += ch[k];
    expect(sum).toBeCloseTo(expected, 6);
    // The worker's write is seen here: no copy was made.
    expect(ch[0]).toBe(42);
  });
});
