// Reading and immutably writing a design document by field path ("box.ports.0.diameter_cm").

export function getAt(obj: unknown, path: string): unknown {
  let cur: unknown = obj;
  for (const key of path.split('.')) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string, unknown>)[key];
  }
  return cur;
}

/** A copy of obj with the value at path replaced; `undefined` removes the key. Only the path is copied. */
export function setAt<T>(obj: T, path: string, value: unknown): T {
  const keys = path.split('.');
  const write = (node: unknown, i: number): unknown => {
    const key = keys[i];
    const isIndex = /^\d+$/.test(key);
    const base: Record<string, unknown> | unknown[] = Array.isArray(node)
      ? [...node]
      : node !== null && typeof node === 'object'
        ? { ...(node as Record<string, unknown>) }
        : isIndex
          ? []
          : {};
    const rec = base as Record<string, unknown>;
    if (i === keys.length - 1) {
      if (value === undefined && !Array.isArray(base)) delete rec[key];
      else rec[key] = value;
    } else {
      rec[key] = write(rec[key], i + 1);
    }
    return base;
  };
  return write(obj, 0) as T;
}

/** True when an issue's path is this field or lies inside it ("box.ports" matches "box.ports.0.count"). */
export function pathMatches(issuePath: string, fieldPath: string): boolean {
  const p = normalizePath(issuePath);
  const f = normalizePath(fieldPath);
  return p === f || p.startsWith(f + '.');
}

/** "box.ports[0].count" and "box.ports.0.count" name the same field. */
export function normalizePath(path: string): string {
  return path.replace(/\[(\d+)\]/g, '.$1').replace(/^\./, '');
}
