// How deeply a parsed JSON value nests, measured without recursion: a design is four levels deep,
// and a value nested thousands of levels deep would overflow the stack of any recursive reader.

/** Deepest nesting a design document may have; the real format needs 6 (design.ways[0].filter.ladder[0]). */
export const MAX_DESIGN_DEPTH = 16;

/** True when `value` holds objects or arrays nested more than `limit` levels deep. */
export function nestedDeeperThan(value: unknown, limit: number): boolean {
  const stack: [unknown, number][] = [[value, 0]];
  while (stack.length > 0) {
    const [v, depth] = stack.pop()!;
    if (v === null || typeof v !== 'object') continue;
    if (depth + 1 > limit) return true;
    for (const child of Object.values(v)) if (child !== null && typeof child === 'object') stack.push([child, depth + 1]);
  }
  return false;
}
