// Variant names as the designer tells them apart: the words every name shares at its start (the
// client or the job, "Living-room monitor, ") are left out, so narrow places show what differs.

/** Separators after which a shared beginning may be cut: a name's parts are written "job, variant". */
const CUT_AFTER = /[,:;–—-]\s+|\s+[–—-]\s+|\s\/\s/g;

/** Lengths at which a name may be cut (after a separator and its spaces), shortest first. */
function cutPoints(name: string): number[] {
  const out: number[] = [];
  for (const m of name.matchAll(CUT_AFTER)) out.push((m.index ?? 0) + m[0].length);
  return out;
}

/**
 * The names without the beginning all of them share, cut only after a separator and only when every
 * name keeps some text. One name, or names with nothing in common, come back unchanged.
 */
export function distinctNames(names: readonly string[]): string[] {
  if (names.length < 2) return [...names];
  let cut = 0;
  for (const point of cutPoints(names[0])) {
    const prefix = names[0].slice(0, point);
    if (names.every((n) => n.startsWith(prefix) && n.slice(point).trim() !== '')) cut = point;
    else break;
  }
  return names.map((n) => n.slice(cut).trim());
}

/** The shared beginning distinctNames leaves out ("Living-room monitor"), or '' when none. */
export function sharedBeginning(names: readonly string[]): string {
  if (names.length < 2) return '';
  const short = distinctNames(names)[0];
  return names[0].slice(0, names[0].length - short.length).replace(/[\s,:;–—/-]+$/, '');
}
