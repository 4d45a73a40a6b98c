import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decodeShare, encodeShare, MAX_SHARE_BYTES } from '../src/ui/share.ts';
import { demoPair } from '../src/ui/demo.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { FUZZ_SEED, runs } from './helpers/fuzz.ts';

/** The decoder's promise: a pair that then goes through parseDesign, or one readable Error. */
async function check(hash: string) {
  try {
    const pair = await decodeShare(hash);
    for (const d of [pair.a, pair.b]) {
      const r = parseDesign(d);
      if (!r.ok) expect(r.errors.length).toBeGreaterThan(0);
    }
  } catch (e) {
    expect(e).toBeInstanceOf(Error);
    expect((e as Error).message).toMatch(/link/);
  }
}

describe('share-link decoder fuzz (fast-check, seeded; each case bounded to 2 s)', () => {
  it('round-trips the demo pair', async () => {
    const pair = await decodeShare('#' + (await encodeShare(demoPair())));
    expect(pair).toEqual(JSON.parse(JSON.stringify(demoPair())));
  });

  it('survives truncated and mutated links', async () => {
    const good = await encodeShare(demoPair());
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 0, max: good.length }),
        fc.array(fc.tuple(fc.nat(), fc.constantFrom(...'AZaz09-_=+/.%#'.split(''))), { maxLength: 5 }),
        async (cut, edits) => {
          const chars = good.slice(0, cut).split('');
          for (const [at, c] of edits) if (chars.length) chars[at % chars.length] = c;
          await check('#' + chars.join(''));
        },
      ),
      { seed: FUZZ_SEED, numRuns: runs(300), timeout: 2000 },
    );
  });

  it('survives arbitrary fragments', async () => {
    await fc.assert(
      fc.asyncProperty(fc.string({ maxLength: 300 }), async (s) => check('#pair=1.' + s)),
      { seed: FUZZ_SEED, numRuns: runs(300), timeout: 2000 },
    );
  });

  it('refuses a small link that inflates to gigabytes', async () => {
    // 50 MB of one character deflates to about 50 kB: far past the decoded-size limit.
    const zeros = new Uint8Array(50_000_000).fill(0x20);
    const body = new Blob([zeros]).stream().pipeThrough(new CompressionStream('deflate-raw'));
    const packed = new Uint8Array(await new Response(body).arrayBuffer());
    let bin = '';
    for (const b of packed) bin += String.fromCharCode(b);
    const hash = '#pair=1.' + btoa(bin).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
    await expect(decodeShare(hash)).rejects.toThrow(new RegExp(`inflates past ${MAX_SHARE_BYTES}`));
  });
});
