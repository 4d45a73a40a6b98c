// preheard compare: two designs through the same calibration, passband levels matched.
import { InputProblem } from '../engine/issues.ts';
import { analyze } from '../engine/response/analyze.ts';
import { findHeadroom, passbandPaPerV, renderBuffer, resolveVolts, type RenderSummary } from '../engine/render/index.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import { EXIT_OK, InputError, parseCommandArgs, runGuarded, UsageError, type Command } from './command.ts';
import { formatIssue, loadDesignFile } from './design-file.ts';
import { writeWav } from './wav.ts';
import { checkVolts, INPUT_HELP, LEVEL_HELP, levelOptions, progressBar, progressCounter, readInputAudio } from './render-common.ts';
import { planOutputs } from './output-files.ts';
import { printable } from './user-text.ts';

const HELP = `usage: preheard compare <a.json> <b.json> <in.wav> -o <prefix> [--volts V | --spl DB] [--no-match] [--json]

Renders the track through both designs with one calibration and writes <prefix>-a.wav and
<prefix>-b.wav. By default B's output is scaled so both passbands play equally loud, so the ear
judges bass and overload rather than loudness. Prints what differs: f3, bass at 30/40/50 Hz,
the first limit and when, stress events per design and each design's headroom on this track.
${INPUT_HELP}

${LEVEL_HELP}
  --no-match  keep B at its own level (same calibration factor as A)
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
  headroom: ReturnType<typeof findHeadroom>;
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
  name: 'compare',
  summary: 'two designs on one track, same calibration, levels matched',
  run: (argv) =>
    runGuarded('compare', HELP, async () => {
      const { values, positionals } = parseCommandArgs(argv, {
        output: { type: 'string', short: 'o' },
        volts: { type: 'string' },
        spl: { type: 'string' },
        'no-match': { type: 'boolean' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
      });
      if (values.help) {
        process.stdout.write(HELP);
        return EXIT_OK;
      }
      if (positionals.length !== 3) throw new UsageError(`expected <a.json> <b.json> <in.wav>, got ${positionals.length} argument(s)`);
      if (!values.output) throw new UsageError('-o <prefix> is required');
      const level = levelOptions(values);
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
        const va = resolveVolts(A.system, channels, sampleRate, level).volts;
        const vb = resolveVolts(B.system, channels, sampleRate, level).volts;
        checkVolts(va, A.system);
        checkVolts(vb, B.system);
        const passA = passbandPaPerV(A.system) * va;
        const passB = passbandPaPerV(B.system) * vb;
        // One calibration: A's default; matching scales B so the passbands come out equal.
        const paA = 2 * passA;
        const paB = values['no-match'] ? paA : paA * (passB / passA);
        matchDb = r2(20 * Math.log10(paA / paB));
        const long = channels[0].length > sampleRate * 30;
        for (const [d, v, pa, tag] of [
          [A, va, paA, 'a'],
          [B, vb, paB, 'b'],
        ] as const) {
          const res = renderBuffer(d.system, channels, sampleRate, {
            voltsFs: v,
            paPerFs: pa,
            onProgress: long ? progressBar(`rendering ${tag}`) : undefined,
          });
          rendered.push(res.audio);
          const fig = bassRelative(d.system);
          const progress = progressCounter(`finding headroom ${tag}`, 'render');
          const headroom = findHeadroom(d.system, channels, sampleRate, { onRender: progress?.tick });
          progress?.done();
          sides.push({ name: d.system.name, summary: res.summary, ...fig, headroom });
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
      const row = (label: string, fa: string, fb: string) => `${label.padEnd(22)}${fa.padEnd(36)}${fb}\n`;
      const first = (s: Side) => (s.summary.events[0] ? `${s.summary.events[0].kind} at ${s.summary.events[0].start_s} s` : 'none');
      const counts = (s: Side) => {
        const m = new Map<string, number>();
        for (const e of s.summary.events) m.set(e.kind, (m.get(e.kind) ?? 0) + 1);
        return m.size === 0 ? 'none' : [...m].map(([k, n]) => `${k} ×${n}`).join(', ');
      };
      let out = row('', `A: ${printable(a.name)}`, `B: ${printable(b.name)}`);
      out += row('f3', `${a.f3Hz} Hz`, `${b.f3Hz} Hz`);
      for (let k = 0; k < 3; k++) out += row(`bass at ${a.bass[k].hz} Hz`, `${a.bass[k].db} dB`, `${b.bass[k].db} dB`);
      out += row('drive', `${a.summary.volts_fs} V/FS`, `${b.summary.volts_fs} V/FS`);
      out += row('peak excursion', `${a.summary.peak_excursion_mm} mm`, `${b.summary.peak_excursion_mm} mm`);
      out += row('first limit', first(a), first(b));
      out += row('stress events', counts(a), counts(b));
      out += row('headroom (clean to)', `${a.headroom.clean_spl_db} dB(C)`, `${b.headroom.clean_spl_db} dB(C)`);
      out += row('limit above that', a.headroom.first_limit ?? 'none', b.headroom.first_limit ?? 'none');
      out += `\nlevels ${values['no-match'] ? 'not matched' : `matched: B played ${matchDb >= 0 ? '+' : ''}${matchDb} dB`}; wrote ${values.output}-a.wav and ${values.output}-b.wav\n`;
      process.stdout.write(out);
      return EXIT_OK;
    }),
};
