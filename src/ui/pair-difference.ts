// What differs between the two compared designs, in the designer's words ("box volume, tuning"): the
// header says it beside the pair, so two variants with similar names are told apart by their settings.
import type { DesignDoc } from '../engine/design/document.ts';

/** Leaf paths (dot-separated) where two plain JSON values differ; objects and arrays are walked. */
export function differingPaths(a: unknown, b: unknown, path = ''): string[] {
  if (Object.is(a, b)) return [];
  const isObj = (v: unknown) => v !== null && typeof v === 'object';
  if (!isObj(a) || !isObj(b) || Array.isArray(a) !== Array.isArray(b)) return [path];
  const ra = a as Record<string, unknown>;
  const rb = b as Record<string, unknown>;
  const keys = new Set([...Object.keys(ra), ...Object.keys(rb)]);
  const out: string[] = [];
  for (const k of keys) out.push(...differingPaths(ra[k], rb[k], path ? `${path}.${k}` : k));
  return out;
}

/** Words for the part of a way a path lies in (the path after "ways.<i>."). */
function wayPart(rest: string[]): string | null {
  const [head, next] = rest;
  if (head === 'name') return null;
  if (head === 'box') {
    if (next === 'type') return 'box type';
    if (next === 'vb_l' || next === 'vb_rear_l' || next === 'vb_front_l') return 'box volume';
    if (next === 'fb_hz' || next === 'fb_front_hz' || next === 'fb_rear_hz') return 'tuning';
    if (next === 'ports') return 'port';
    if (next === 'radiator') return 'radiator';
    return 'box';
  }
  if (head === 'driver') return 'driver';
  if (head === 'filter') return 'filter';
  if (head === 'count') return 'driver count';
  if (head === 'offset_mm') return 'offset';
  if (head === 'sensitivity_db') return 'level';
  return head ?? null;
}

/** Words for a top-level part of a design. */
function designPart(parts: string[]): string | null {
  const [head, next] = parts;
  if (head === 'name' || head === 'notes' || head === 'format' || head === 'version') return null;
  if (head === 'listening') {
    if (next === 'level') return 'planned level';
    if (next === 'room') return 'room';
    return 'seat';
  }
  return head;
}

/**
 * What differs from a to b, each part named once, in the order met: a way after the first is named
 * ("tweeter filter"); a different box type stands for all of its box. Names and notes do not count.
 */
export function designDifferences(a: DesignDoc, b: DesignDoc): string[] {
  const words: string[] = [];
  const add = (w: string | null) => {
    if (w && !words.includes(w)) words.push(w);
  };
  const waysA = a.ways ?? [];
  const waysB = b.ways ?? [];
  if (waysA.length !== waysB.length) add('number of ways');
  const paths = differingPaths(a, b);
  for (const path of paths) {
    const parts = path.split('.');
    if (parts[0] !== 'ways') {
      add(designPart(parts));
      continue;
    }
    const i = Number(parts[1]);
    if (!(i < waysA.length && i < waysB.length)) continue;
    // Another box type says it all about the box: its volume, tuning and ports differ with it.
    const boxTypeDiffers = paths.includes(`ways.${i}.box.type`);
    const part = parts[2] === 'box' && boxTypeDiffers ? 'box type' : wayPart(parts.slice(2));
    // The first way is the design's main one (the woofer): the others are named.
    if (part) add(i === 0 ? part : `${waysA[i].name} ${part}`);
  }
  return words;
}
