// Share links: the design pair travels in the URL fragment, which browsers never send to a server.
// Format: #pair=1.<base64url of deflate-raw(JSON {a, b})>.
import type { Designs } from './store.ts';

const PREFIX = 'pair=1.';

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
  return hash.replace(/^#/, '').startsWith(PREFIX);
}

/** The two design documents of a share fragment, not yet validated; throws with a readable message. */
export async function decodeShare(hash: string): Promise<{ a: unknown; b: unknown }> {
  const frag = hash.replace(/^#/, '');
  if (!frag.startsWith(PREFIX)) throw new Error('this link carries no preheard designs');
  if (frag.length > MAX_SHARE_CHARS)
    throw new Error(`the link is ${frag.length} characters long, more than a pair of designs needs (${MAX_SHARE_CHARS} at most)`);
  let text: string;
  try {
    text = new TextDecoder().decode(
      await pipe(fromBase64Url(frag.slice(PREFIX.length)), new DecompressionStream('deflate-raw'), MAX_SHARE_BYTES),
    );
  } catch (e) {
    if (e instanceof RangeError) throw new Error(`the link is not a pair of designs: ${e.message}`);
    throw new Error('the link is damaged or cut short (its design data does not decode)');
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    throw new Error('the link is damaged (its design data is not valid JSON)');
  }
  if (value === null || typeof value !== 'object' || !('a' in value) || !('b' in value)) {
    throw new Error('the link does not hold a pair of designs A and B');
  }
  const v = value as { a: unknown; b: unknown };
  return { a: v.a, b: v.b };
}
