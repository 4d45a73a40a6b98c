// Share links: the design pair, or a whole project, travels in the URL fragment, which browsers
// never send to a server. Formats: #pair=1.<base64url of deflate-raw(JSON {a, b})> and
// #project=1.<base64url of deflate-raw(the project file's JSON)>. Compression is the browser's own
// CompressionStream (deflate-raw): no library needed, and variants that differ in a few fields
// compress to little more than one design.
import type { Designs } from './store.ts';
import { projectFileText, type Project } from './project.ts';

const PREFIX = 'pair=1.';
const PROJECT_PREFIX = 'project=1.';

/**
 * Longest link the app makes, characters of the fragment: mail and chat programs and some browsers'
 * address bars cut longer links (common practice, no source). A larger project goes as a file.
 */
export const MAX_LINK_CHARS = 32_000;

function toBase64Url(bytes: Uint8Array): string {
  let bin = '';
  for (let i = 0; i < bytes.length; i++) bin += String.fromCharCode(bytes[i]);
  return btoa(bin).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

function fromBase64Url(text: string): Uint8Array {
  const b64 = text.replace(/-/g, '+').replace(/_/g, '/');
  const bin = atob(b64 + '='.repeat((4 - (b64.length % 4)) % 4));
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

/** Longest fragment accepted, characters; a real pair of designs is about 1-2 kB. */
export const MAX_SHARE_CHARS = 200_000;
/** Largest decoded pair, bytes: stops a small link that inflates to gigabytes. */
export const MAX_SHARE_BYTES = 2_000_000;

async function pipe(bytes: Uint8Array, stream: CompressionStream | DecompressionStream, limit = Infinity): Promise<Uint8Array> {
  const reader = new Blob([bytes as BlobPart]).stream().pipeThrough(stream).getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.length;
    if (total > limit) {
      await reader.cancel();
      throw new RangeError(`the link's design data inflates past ${limit} bytes`);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}

export async function encodeShare(designs: Designs): Promise<string> {
  const json = new TextEncoder().encode(JSON.stringify({ a: designs.a, b: designs.b }));
  return PREFIX + toBase64Url(await pipe(json, new CompressionStream('deflate-raw')));
}

export function shareUrl(base: string, fragment: string): string {
  return base.replace(/#.*$/, '') + '#' + fragment;
}

export function hasShare(hash: string): boolean {
  return shareKind(hash) !== null;
}

/** What a fragment carries: a pair of designs, a project, or nothing of ours. */
export function shareKind(hash: string): 'pair' | 'project' | null {
  const frag = hash.replace(/^#/, '');
  return frag.startsWith(PREFIX) ? 'pair' : frag.startsWith(PROJECT_PREFIX) ? 'project' : null;
}

/** A project link's fragment: the project file's JSON, compact. */
export async function encodeProjectShare(project: Project): Promise<string> {
  const json = new TextEncoder().encode(JSON.stringify(JSON.parse(projectFileText(project))));
  return PROJECT_PREFIX + toBase64Url(await pipe(json, new CompressionStream('deflate-raw')));
}

/** The project file of a project link, not yet validated (readProject does that); throws with a readable message. */
export async function decodeProjectShare(hash: string): Promise<unknown> {
  const frag = hash.replace(/^#/, '');
  if (!frag.startsWith(PROJECT_PREFIX)) throw new Error('this link carries no preheard project');
  return decodeJson(frag, PROJECT_PREFIX, 'a project');
}

async function decodeJson(frag: string, prefix: string, what: string): Promise<unknown> {
  if (frag.length > MAX_SHARE_CHARS)
    throw new Error(`the link is ${frag.length} characters long, more than ${what} needs (${MAX_SHARE_CHARS} at most)`);
  let text: string;
  try {
    text = new TextDecoder().decode(
      await pipe(fromBase64Url(frag.slice(prefix.length)), new DecompressionStream('deflate-raw'), MAX_SHARE_BYTES),
    );
  } catch (e) {
    if (e instanceof RangeError) throw new Error(`the link is not ${what}: ${e.message}`);
    throw new Error('the link is damaged or cut short (its design data does not decode)');
  }
  try {
    return JSON.parse(text);
  } catch {
    throw new Error('the link is damaged (its design data is not valid JSON)');
  }
}

/** The two design documents of a share fragment, not yet validated; throws with a readable message. */
export async function decodeShare(hash: string): Promise<{ a: unknown; b: unknown }> {
  const frag = hash.replace(/^#/, '');
  if (!frag.startsWith(PREFIX)) throw new Error('this link carries no preheard designs');
  const value = await decodeJson(frag, PREFIX, 'a pair of designs');
  if (value === null || typeof value !== 'object' || !('a' in value) || !('b' in value)) {
    throw new Error('the link does not hold a pair of designs A and B');
  }
  const v = value as { a: unknown; b: unknown };
  return { a: v.a, b: v.b };
}
