// Project share links: a whole project in the URL fragment. Every decoded link goes through
// readProject (each variant through parseDesign); damaged links give one readable message.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  decodeProjectShare,
  decodeShare,
  encodeProjectShare,
  encodeShare,
  MAX_LINK_CHARS,
  MAX_SHARE_BYTES,
  shareKind,
} from '../src/ui/share.ts';
import { demoPair } from '../src/ui/demo.ts';
import { addVariant, projectFromPair, readProject, type Project } from '../src/ui/project.ts';
import { FUZZ_SEED, runs } from './helpers/fuzz.ts';

/** The demo pair and two more variants (a larger box, a different tuning): four in all. */
function fourVariants(): Project {
  const pair = demoPair();
  let p = projectFromPair(pair, 'Client job');
  const bigger = structuredClone(pair.a);
  bigger.name = 'Bigger box';
  const w = bigger.ways[0];
  if (w.kind === 'driver') w.box = { ...w.box, vb_l: 30 } as typeof w.box;
  p = addVariant(p, bigger, null);
  const other = structuredClone(pair.b);
  other.name = 'Other tuning';
  p = addVariant(p, other, null);
  return p;
}

async function check(hash: string) {
  try {
    const r = readProject(await decodeProjectShare(hash));
    if (!r.ok) expect(r.errors.length).toBeGreaterThan(0);
  } catch (e) {
    expect(e).toBeInstanceOf(Error);
    expect((e as Error).message).toMatch(/link/);
  }
}

describe('project share links', () => {
  it('round-trip a four-variant project, well within the link length', async () => {
    const project = fourVariants();
    expect(project.variants).toHaveLength(4);
    const frag = await encodeProjectShare(project);
    expect(shareKind(`#${frag}`)).toBe('project');
    const r = readProject(await decodeProjectShare(`#${frag}`));
    if (!r.ok) throw new Error(r.errors.map((e) => e.message).join());
    expect(r.kind).toBe('project');
    expect(r.project).toEqual(JSON.parse(JSON.stringify(project)));
    // Variants that differ in a field or two compress together: four cost far less than four pairs.
    const pairLink = await encodeShare(demoPair());
    expect(frag.length).toBeLessThan(MAX_LINK_CHARS);
    expect(frag.length).toBeLessThan(2 * pairLink.length);
  });

  it('are not pair links, and pair links are not project links', async () => {
    const frag = await encodeProjectShare(fourVariants());
    await expect(decodeShare(`#${frag}`)).rejects.toThrow('this link carries no preheard designs');
    await expect(decodeProjectShare(`#${await encodeShare(demoPair())}`)).rejects.toThrow('this link carries no preheard project');
    expect(shareKind('#elsewhere')).toBeNull();
  });

  it('survive truncation and mutation (every outcome a project, a list of problems or one readable message)', async () => {
    const good = await encodeProjectShare(fourVariants());
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 0, max: good.length }),
        fc.array(fc.tuple(fc.nat(), fc.constantFrom(...'AZaz09-_=+/.%#'.split(''))), { maxLength: 5 }),
        async (cut, edits) => {
          const chars = good.slice(0, cut).split('');
          for (const [at, c] of edits) if (chars.length) chars[at % chars.length] = c;
          await check(`#${chars.join('')}`);
        },
      ),
      { seed: FUZZ_SEED, numRuns: runs(300), timeout: 2000 },
    );
  });

  it('survive arbitrary JSON in a well-formed link: readProject names the problems', async () => {
    const pack = async (value: unknown) => {
      const body = new Blob([JSON.stringify(value)]).stream().pipeThrough(new CompressionStream('deflate-raw'));
      const bytes = new Uint8Array(await new Response(body).arrayBuffer());
      let bin = '';
      for (const b of bytes) bin += String.fromCharCode(b);
      return `#project=1.${btoa(bin).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '')}`;
    };
    await fc.assert(
      fc.asyncProperty(fc.jsonValue({ maxDepth: 4 }), async (v) => check(await pack(v))),
      { seed: FUZZ_SEED, numRuns: runs(200), timeout: 2000 },
    );
    const tooMany = JSON.parse(JSON.stringify({ format: 'preheard-project', version: 1, name: 'x', variants: [], compared: {} }));
    const r = readProject(await decodeProjectShare(await pack(tooMany)));
    expect(r.ok ? '' : r.errors[0].message).toBe('a project needs at least one variant');
  });

  it('refuse a small link that inflates past the limit', async () => {
    const zeros = new Uint8Array(50_000_000).fill(0x20);
    const body = new Blob([zeros]).stream().pipeThrough(new CompressionStream('deflate-raw'));
    const packed = new Uint8Array(await new Response(body).arrayBuffer());
    let bin = '';
    for (const b of packed) bin += String.fromCharCode(b);
    const hash = `#project=1.${btoa(bin).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '')}`;
    await expect(decodeProjectShare(hash)).rejects.toThrow(new RegExp(`inflates past ${MAX_SHARE_BYTES}`));
  });
});
