// preheard sweep: f3, first limit and headroom on a track for a range of box volumes and/or tunings,
// one design variant per step, spread over every core with worker threads.
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import { EXIT_OK, InputError, parseCommandArgs, runGuarded, UsageError, type Command } from './command.ts';
import { loadDesignFile } from './design-file.ts';
import { INPUT_HELP, progressBar, readInputAudio } from './render-common.ts';
import type { SweepRow } from './sweep-step.ts';
import { sweptWayIndex, type SweepPoint } from './sweep-variant.ts';
import type { DesignDoc } from '../engine/design/document.ts';
import { LIMIT_WORDS } from '../engine/verdict/verdict.ts';
import { db, decimalNumber, moment, printable, sig, wholeNumber } from './user-text.ts';
import { sharedBuffers } from './shared-audio.ts';

/** Most design variants one sweep runs: each is a dozen renders of the whole track. */
export const MAX_SWEEP_POINTS = 400;

const HELP = `usage: preheard sweep <design.json> <in.wav> [--vb FROM:TO:STEP] [--fb FROM:TO:STEP] [--way NAME] [--json] [--threads N]

For each box volume (litres) and/or tuning (Hz, vented boxes) of one way's box in the ranges,
prints that way's f3, the whole design's highest clean level on this track (dB SPL at the seat
and amplifier volts per full scale) and the limit that arrives first. Both ranges together sweep
every combination.
${INPUT_HELP}

  --vb FROM:TO:STEP   net box volumes, litres, e.g. 20:60:5
  --fb FROM:TO:STEP   tunings, Hz (vented only), e.g. 30:50:2.5
  --way NAME          the way whose box is swept (default: the first way with a driver)
  --threads N         worker threads (default: every core)
  --json              print {steps: [...]} instead of the table
  --help              this text

exit codes: 0 ok, 1 bad input (message on stderr), 2 usage
`;

/** Parses FROM:TO:STEP into the list of values, inclusive of TO within rounding. */
export function parseRange(text: string, option: string, min: number, max: number): number[] {
  const pieces = text.split(':');
  if (pieces.length !== 3) throw new UsageError(`${option} must be FROM:TO:STEP, got "${printable(text)}"`);
  const parts = pieces.map((p) => decimalNumber(p, option));
  const [from, to, step] = parts;
  if (!(step > 0)) throw new UsageError(`${option}: STEP must be positive, got ${step}`);
  if (from < min || to > max || from > to)
    throw new UsageError(`${option}: the range must lie within ${min} to ${max} with FROM <= TO, got ${printable(text)}`);
  const count = Math.floor((to - from) / step + 1e-9) + 1;
  if (count > 200) throw new UsageError(`${option}: ${count} steps is too many (200 at most)`);
  return Array.from({ length: count }, (_, k) => Number((from + k * step).toPrecision(10)));
}

function runPool(
  design: DesignDoc,
  wayIndex: number,
  points: SweepPoint[],
  channels: Float32Array[],
  sampleRate: number,
  threads: number,
  onProgress?: (fraction: number) => void,
): Promise<SweepRow[]> {
  // The audio is shared, not copied, with every worker.
  const shared = sharedBuffers(channels);
  const rows: SweepRow[] = new Array(points.length);
  let next = 0;
  let done = 0;
  return new Promise((resolve, reject) => {
    const workers: Worker[] = [];
    const finish = (err?: Error) => {
      for (const w of workers) void w.terminate();
      if (err) reject(err);
      else resolve(rows);
    };
    for (let t = 0; t < Math.min(threads, points.length); t++) {
      const w = new Worker(new URL('./sweep-worker.mjs', import.meta.url), {
        workerData: { design, wayIndex, channels: shared, sampleRate },
      });
      workers.push(w);
      const feed = () => {
        if (next < points.length) {
          const index = next++;
          w.postMessage({ index, point: points[index] });
        }
      };
      w.on('message', (msg: { ready?: boolean; index?: number; row?: SweepRow }) => {
        if (msg.ready) return feed();
        rows[msg.index!] = msg.row!;
        done++;
        onProgress?.(done / points.length);
        if (done === points.length) finish();
        else feed();
      });
      w.on('error', (e) => finish(e));
    }
  });
}

function table(rows: SweepRow[], vented: boolean): string {
  const head = ['Vb l', ...(vented ? ['fb Hz'] : []), 'f3 Hz', 'clean dB SPL', 'clean V/FS', 'first limit'];
  const body = rows.map((r) => [
    // The steps as the user gave them (a 102.5 l step must not read 103).
    String(r.vb_l),
    ...(vented ? [String(r.fb_hz ?? '')] : []),
    sig(r.f3_hz),
    db(r.clean_spl_db),
    sig(r.clean_volts),
    r.error
      ? `(${printable(r.error)})`
      : r.first_limit
        ? `${LIMIT_WORDS[r.first_limit] ?? r.first_limit} at ${moment(r.first_limit_s ?? 0)}`
        : 'none in range',
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => (i === cells.length - 1 ? c : c.padStart(widths[i]))).join('  ');
  return [line(head), ...body.map(line)].join('\n') + '\n';
}

export const sweepCommand: Command = {
  run: (argv) =>
    runGuarded('sweep', HELP, async () => {
      const { values, positionals } = parseCommandArgs(argv, {
        vb: { type: 'string' },
        fb: { type: 'string' },
        way: { type: 'string' },
        threads: { type: 'string' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
      });
      if (values.help) {
        process.stdout.write(HELP);
        return EXIT_OK;
      }
      if (positionals.length !== 2) throw new UsageError('expects a design file and a WAV file');
      if (values.vb === undefined && values.fb === undefined) throw new UsageError('give --vb and/or --fb');
      const cores = availableParallelism();
      const threads = values.threads === undefined ? cores : wholeNumber(values.threads, '--threads');
      if (threads < 1 || threads > cores)
        throw new UsageError(`--threads must be from 1 to ${cores} (the cores of this machine), got ${threads}`);
      const { design } = await loadDesignFile(positionals[0]);
      const way = design.ways[sweptWayIndex(design, values.way)];
      if (way?.kind !== 'driver') {
        const names = design.ways.filter((w) => w.kind === 'driver').map((w) => `"${printable(w.name)}"`);
        throw new InputError(
          `${positionals[0]} has no way with a driver named "${printable(values.way ?? '')}"; its driver ways are ${names.join(', ')}`,
        );
      }
      const { box } = way;
      if (!('vb_l' in box))
        throw new InputError(
          `sweep varies one box volume; way "${printable(way.name)}" of ${positionals[0]} has a ${box.type} box with two chambers`,
        );
      if (values.fb !== undefined && box.type !== 'vented')
        throw new InputError(`--fb needs a vented box; way "${printable(way.name)}" of ${positionals[0]} is ${box.type}`);
      const vbs = values.vb === undefined ? [box.vb_l] : parseRange(values.vb, '--vb', 0.005, 20000);
      const fbs = values.fb === undefined ? [box.type === 'vented' ? box.fb_hz : null] : parseRange(values.fb, '--fb', 5, 500);
      if (vbs.length * fbs.length > MAX_SWEEP_POINTS)
        throw new UsageError(
          `${vbs.length} volumes × ${fbs.length} tunings is ${vbs.length * fbs.length} steps, more than the ${MAX_SWEEP_POINTS} a sweep runs: use a larger STEP or a narrower range`,
        );
      const points = vbs.flatMap((vb_l) => fbs.map((fb_hz) => ({ vb_l, fb_hz })));
      const audio = await readInputAudio(positionals[1]);
      const rows = await runPool(
        design,
        design.ways.indexOf(way),
        points,
        audio.channels,
        audio.sampleRate,
        threads,
        progressBar('sweeping'),
      );
      process.stdout.write(values.json ? JSON.stringify({ steps: rows }) + '\n' : table(rows, box.type === 'vented'));
      return EXIT_OK;
    }),
};
