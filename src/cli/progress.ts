// Progress on stderr for the long commands, only when stderr is a terminal (a pipe or a log file
// gets none). Nothing is drawn for a step that ends within DELAY_MS, and redraws are spaced, so
// short runs stay quiet and long ones cost nothing measurable.
const DELAY_MS = 400;
const REDRAW_MS = 100;
const WIDTH = 30;

/** The part of a stream progress needs; process.stderr in use, a stand-in in tests. */
export interface ProgressStream {
  isTTY?: boolean;
  write(text: string): unknown;
}

function painter(stream: ProgressStream, now: () => number) {
  const start = now();
  let last = -Infinity;
  let drawn = false;
  return {
    draw(text: string, force = false) {
      const t = now();
      if (!force && (t - start < DELAY_MS || t - last < REDRAW_MS)) return;
      last = t;
      drawn = true;
      stream.write(`\r${text}`);
    },
    end(text: string) {
      if (drawn) stream.write(`\r${text}\n`);
    },
  };
}

/** A bar for a step that reports the fraction done; undefined when stderr is not a terminal. */
export function progressBar(
  label: string,
  stream: ProgressStream = process.stderr,
  now: () => number = performance.now.bind(performance),
): ((fraction: number) => void) | undefined {
  if (!stream.isTTY) return undefined;
  const p = painter(stream, now);
  const bar = (f: number) => {
    const done = Math.round(Math.min(1, Math.max(0, f)) * WIDTH);
    return `${label} [${'#'.repeat(done)}${' '.repeat(WIDTH - done)}] ${Math.round(f * 100)}%`;
  };
  return (f: number) => (f >= 1 ? p.end(bar(1)) : p.draw(bar(f)));
}

/** A counter for a step of unknown length (the renders of a headroom search); undefined when not a terminal. */
export function progressCounter(
  label: string,
  unit: string,
  stream: ProgressStream = process.stderr,
  now: () => number = performance.now.bind(performance),
): { tick(): void; done(): void } | undefined {
  if (!stream.isTTY) return undefined;
  const p = painter(stream, now);
  let n = 0;
  return {
    tick: () => p.draw(`${label}: ${unit} ${++n}`),
    done: () => p.end(`${label}: ${n} ${unit}${n === 1 ? '' : 's'}, done`),
  };
}
