// preheard compare: two designs through the same calibration, passband levels matched.
import { InputProblem } from '../engine/issues.ts';
import { analyze } from '../engine/response/analyze.ts';
import { Worker } from 'node:worker_threads';
import { passbandPaPerV, resolveVolts, type Headroom, type RenderSummary } from '../engine/render/index.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import { commonPaPerFs, laneGains } from '../engine/level/matching.ts';
import { EXIT_OK, InputError, parseCommandArgs, runGuarded, UsageError, type Command } from './command.ts';
import { formatIssue, loadDesignFile } from './design-file.ts';
import { writeWav } from './wav.ts';
import {
  checkVolts,
  INPUT_HELP,
  LEVEL_HELP,
  levelOptions,
  progressBar,
  progressCounter,
  readInputAudio,
  THREADS_HELP,
  threadsOption,
} from './render-common.ts';
import { planOutputs } from './output-files.ts';
import { count, db, moment, printable, sig } from './user-text.ts';
import { renderSide, type SideLevel, type SideResult } from './compare-side.ts';
import { sharedBuffers } from './shared-audio.ts';

const HELP = `usage: preheard compare <a.json> <b.json> <in.wav> -o <prefix> [--volts V | --spl DB] [--no-match]
                       [--threads N] [--json]

Renders the track through both designs with one calibration and writes <prefix>-a.wav and
<prefix>-b.wav. Levels follow the listening bench's policy: the louder design's full-scale
passband lands at -6 dBFS, and by default the louder design is brought down to the quieter one's
passband, so the ear judges bass and overload rather than loudness. Prints what differs: f3, bass at 30/40/50 Hz,
the first limit and when, stress events per design and each design's headroom on this track.
${INPUT_HELP}

${LEVEL_HELP}
  --no-match  keep each design at its own level (one calibration factor for both)
${THREADS_HELP}
              (compare renders the two designs on two threads in any case)
  --json      one object: {a, b, match_db}, a and b in the form of render --json plus figures
  --help      this text

Caution: the modelled overload is audible on purpose. Keep the listening volume moderate.

exit codes: 0 ok, 1 bad input (message on stderr), 2 usage
`;

interface Side {
  name: string;
  summary: RenderSummary;
  f3Hz: number;
  bass: { hz: number; db: number }[];
  headroom: Headroom;
}

const r2 = (v: number) => Number(v.toFixed(2));

function bassRelative(sys: SpeakerSystem) {
  const a = analyze(sys);
  const f = a.figures;
  return {
    f3Hz: r2(f.f3Hz),
    bass: [
      { hz: 30, db: r2(f.spl30Db - f.passbandSplDb) },
      { hz: 40, db: r2(f.spl40Db - f.passbandSplDb) },
      { hz: 50, db: r2(f.spl50Db - f.passbandSplDb) },
    ],
  };
}

/** Design B's side in a worker thread over the shared audio; an InputProblem comes back as one. */
function sideInWorker(
  designPath: string,
  channels: Float32Array[],
  sampleRate: number,
  level: SideLevel,
): { result: Promise<SideResult>; cancel: () => void } {
  const shared = sharedBuffers(channels);
  const w = new Worker(new URL('./compare-worker.mjs', import.meta.url), {
    workerData: { designPath, channels: shared, sampleRate, level },
  });
  const result = new Promise<SideResult>((resolve, reject) => {
    w.once('message', (msg: { side?: SideResult; error?: string; problem?: boolean }) => {
      void w.terminate();
      if (msg.side) resolve(msg.side);
      else reject(msg.problem ? new InputProblem(msg.error) : new Error(msg.error));
    });
    w.once('error', reject);
  });
  // Awaited only when A succeeds: a failure of B meanwhile must not go unhandled.
  result.catch(() => undefined);
  return { result, cancel: () => void w.terminate() };
}

function sideJson(s: Side) {
  return {
    ...s.summary,
    name: s.name,
    f3_hz: s.f3Hz,
    bass_db: Object.fromEntries(s.bass.map((b) => [`${b.hz}_hz`, b.db])),
    first_limit: s.summary.events[0]?.kind ?? null,
    first_limit_s: s.summary.events[0]?.start_s ?? null,
    headroom: {
      clean_volts: s.headroom.clean_volts,
      clean_spl_db: s.headroom.clean_spl_db,
      first_limit: s.headroom.first_limit,
      first_limit_s: s.headroom.first_limit_s,
    },
  };
}

export const compareCommand: Command = {
  run: (argv) =>
    runGuarded('compare', HELP, async () => {
      const { values, positionals } = parseCommandArgs(argv, {
        output: { type: 'string', short: 'o' },
        volts: { type: 'string' },
        spl: { type: 'string' },
        'no-match': { type: 'boolean' },
        threads: { type: 'string' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
      });
      if (values.help) {
        process.stdout.write(HELP);
        return EXIT_OK;
      }
      if (positionals.length !== 3)
        throw new UsageError(`expected <a.json> <b.json> <in.wav>, got ${count(positionals.length, 'argument')}`);
      if (!values.output) throw new UsageError('-o <prefix> is required');
      const level = levelOptions(values);
      const helper = threadsOption(values.threads);
      const [aPath, bPath, inPath] = positionals;
      const [outA, outB] = [`${values.output}-a.wav`, `${values.output}-b.wav`];
      const outputs = await planOutputs([aPath, bPath, inPath], [outA, outB]);
      const A = await loadDesignFile(aPath);
      const B = await loadDesignFile(bPath);
      for (const w of [...A.warnings, ...B.warnings]) process.stderr.write(`${formatIssue(w)}\n`);
      const audio = await readInputAudio(inPath);
      const { channels, sampleRate } = audio;
      const sides: Side[] = [];
      const rendered: Float32Array[][] = [];
      let matchDb = 0;
      try {
        // The two calibration passes use both cores (lane-helper.ts); the sides below do too.
        const la = resolveVolts(A.system, channels, sampleRate, { ...level, helper });
        const lb = resolveVolts(B.system, channels, sampleRate, { ...level, helper });
        const va = la.volts,
          vb = lb.volts;
        checkVolts(va, A.system);
        checkVolts(vb, B.system);
        // The bench's policy (engine/level/matching.ts): one calibration, the louder passband at
        // -6 dBFS; matching brings the louder design down to the quieter one's passband.
        const laneA = { passbandPaPerV: passbandPaPerV(A.system), voltsFs: va };
        const laneB = { passbandPaPerV: passbandPaPerV(B.system), voltsFs: vb };
        const common = commonPaPerFs(laneA, laneB);
        const { gains } = laneGains(laneA, laneB, !values['no-match']);
        // A lane's gain g plays its output g times louder: the same as a calibration of common/g.
        const paA = common / gains.a;
        const paB = common / gains.b;
        matchDb = r2(20 * Math.log10(gains.b / gains.a));
        const long = channels[0].length > sampleRate * 30;
        // B in a worker thread on the other core while A runs here.
        const sideB = sideInWorker(bPath, channels, sampleRate, { voltsFs: vb, paPerFs: paB, leqPerVoltDb: lb.leqPerVoltDb });
        const progress = progressCounter('finding headroom a', 'render');
        let sideA: SideResult;
        try {
          sideA = renderSide(
            A.system,
            channels,
            sampleRate,
            { voltsFs: va, paPerFs: paA, leqPerVoltDb: la.leqPerVoltDb },
            { render: long ? progressBar('rendering a') : undefined, headroomTick: progress?.tick },
          );
        } catch (e) {
          sideB.cancel();
          throw e;
        }
        progress?.done();
        const b = await sideB.result;
        for (const [d, side] of [
          [A, sideA],
          [B, b],
        ] as const) {
          rendered.push(side.audio);
          sides.push({ name: d.system.name, summary: side.summary, ...bassRelative(d.system), headroom: side.headroom });
        }
      } catch (e) {
        if (e instanceof InputProblem) throw new InputError(`${inPath}: ${e.message}`);
        throw e;
      }
      // Both files are written only when both designs rendered, and put in place together.
      await writeWav(outputs.staging(outA), rendered[0], sampleRate, audio.format);
      await writeWav(outputs.staging(outB), rendered[1], sampleRate, audio.format);
      outputs.commit();
      const [a, b] = sides;
      if (values.json) {
        process.stdout.write(`${JSON.stringify({ a: sideJson(a), b: sideJson(b), match_db: matchDb })}\n`);
        return EXIT_OK;
      }
      const first = (s: Side) => (s.summary.events[0] ? `${s.summary.events[0].kind} at ${moment(s.summary.events[0].start_s)}` : 'none');
      const counts = (s: Side) => {
        const m = new Map<string, number>();
        for (const e of s.summary.events) m.set(e.kind, (m.get(e.kind) ?? 0) + 1);
        return m.size === 0 ? 'none' : [...m].map(([k, n]) => `${k} ×${n}`).join(', ');
      };
      const rows: [string, string, string][] = [
        ['', `A: ${printable(a.name)}`, `B: ${printable(b.name)}`],
        ['f3', `${sig(a.f3Hz)} Hz`, `${sig(b.f3Hz)} Hz`],
        ...a.bass.map((x, k): [string, string, string] => [`bass at ${x.hz} Hz`, `${db(x.db)} dB`, `${db(b.bass[k].db)} dB`]),
        ['drive', `${sig(a.summary.volts_fs)} V/FS`, `${sig(b.summary.volts_fs)} V/FS`],
        ['peak excursion', `${sig(a.summary.peak_excursion_mm)} mm`, `${sig(b.summary.peak_excursion_mm)} mm`],
        ['first limit', first(a), first(b)],
        ['stress events', counts(a), counts(b)],
        ['headroom (clean to)', `${db(a.headroom.clean_spl_db)} dB(C)`, `${db(b.headroom.clean_spl_db)} dB(C)`],
        ['limit above that', a.headroom.first_limit ?? 'none', b.headroom.first_limit ?? 'none'],
      ];
      // Columns as wide as their longest cell (a long design name must not run into B's column).
      const wl = Math.max(...rows.map((r) => r[0].length)) + 2;
      const wa = Math.max(...rows.map((r) => r[1].length)) + 2;
      let out = rows.map(([l, fa, fb]) => `${l.padEnd(wl)}${fa.padEnd(wa)}${fb}\n`).join('');
      out += `\nlevels ${values['no-match'] ? 'not matched' : `matched: B played ${db(matchDb).startsWith('-') ? '' : '+'}${db(matchDb)} dB against A`}; wrote ${values.output}-a.wav and ${values.output}-b.wav\n`;
      process.stdout.write(out);
      return EXIT_OK;
    }),
};
