import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdtempSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readWav, writeWav } from '../src/cli/wav.ts';
import { InputError } from '../src/cli/command.ts';
import { FUZZ_SEED, runs } from './helpers/fuzz.ts';

const dir = mkdtempSync(join(tmpdir(), 'preheard-fuzz-wav-'));
const seeds: Uint8Array[] = [];

async function seed(format: '16' | '24' | 'f32', channels: number) {
  const data = Array.from({ length: channels }, (_, c) => Float32Array.from({ length: 300 }, (_, k) => 0.5 * Math.sin(0.05 * k * (c + 1))));
  const path = join(dir, `seed-${format}-${channels}.wav`);
  await writeWav(path, data, 44100, format);
  seeds.push(new Uint8Array(readFileSync(path)));
}

/** The reader's promise: audio with finite samples, or an InputError that names the file. Never another throw. */
async function checkBytes(bytes: Uint8Array, n: number) {
  const path = join(dir, `case-${n}.wav`);
  writeFileSync(path, bytes);
  try {
    const wav = await readWav(path);
    expect(wav.channels.length).toBeGreaterThan(0);
    const len = wav.channels[0].length;
    for (const ch of wav.channels) {
      expect(ch.length).toBe(len);
      for (let k = 0; k < ch.length; k++) if (!Number.isFinite(ch[k])) throw new Error('non-finite sample');
    }
    expect(wav.sampleRate).toBeGreaterThan(0);
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    expect(e.message).toContain(path);
  }
}

describe('WAV reader fuzz (fast-check, seeded; each case bounded to 2 s)', () => {
  let n = 0;
  it('survives truncation, byte flips and overwritten header fields', async () => {
    await seed('16', 1);
    await seed('24', 2);
    await seed('f32', 2);
    const mutation = fc.record({
      seedIndex: fc.integer({ min: 0, max: seeds.length - 1 }),
      cut: fc.option(fc.integer({ min: 0, max: 2000 }), { nil: undefined }),
      flips: fc.array(fc.tuple(fc.integer({ min: 0, max: 80 }), fc.integer({ min: 0, max: 255 })), { maxLength: 6 }),
      word: fc.option(fc.tuple(fc.constantFrom(4, 16, 22, 24, 28, 32, 34, 40), fc.constantFrom(0, 1, 0xffffffff, 0x7fffffff, 0x10000)), {
        nil: undefined,
      }),
    });
    await fc.assert(
      fc.asyncProperty(mutation, async ({ seedIndex, cut, flips, word }) => {
        const bytes = Uint8Array.from(seeds[seedIndex]);
        for (const [at, v] of flips) if (at < bytes.length) bytes[at] = v;
        if (word && word[0] + 4 <= bytes.length) new DataView(bytes.buffer).setUint32(word[0], word[1], true);
        await checkBytes(cut === undefined ? bytes : bytes.subarray(0, cut), n++);
      }),
      { seed: FUZZ_SEED, numRuns: runs(300), timeout: 2000 },
    );
  });

  it('survives arbitrary bytes, with and without a RIFF/WAVE prefix', async () => {
    const prefix = new TextEncoder().encode('RIFF\x24\x00\x00\x00WAVEfmt ');
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ maxLength: 200 }), fc.boolean(), async (body, withPrefix) => {
        const bytes = withPrefix ? Uint8Array.from([...prefix, ...body]) : body;
        await checkBytes(bytes, n++);
      }),
      { seed: FUZZ_SEED, numRuns: runs(300), timeout: 2000 },
    );
  });
});
