// Results kept by the content they were computed from: an edit makes a new design object, but most of
// what it holds (the other ways, the listening settings) is unchanged, so what depends only on those
// is found again here instead of being computed again.

/** The last `size` results of `compute`, keyed by the JSON text of what they depend on (plain data). */
export function byContent<V>(size: number): (dependsOn: unknown, compute: () => V) => V {
  const kept = new Map<string, V>();
  return (dependsOn, compute) => {
    const key = JSON.stringify(dependsOn);
    const hit = kept.get(key);
    if (hit !== undefined) {
      // The most recently used last: the oldest goes first when the cache is full.
      kept.delete(key);
      kept.set(key, hit);
      return hit;
    }
    const value = compute();
    kept.set(key, value);
    if (kept.size > size) kept.delete(kept.keys().next().value!);
    return value;
  };
}
