// preheard headroom: the loudest level at which a design plays this track with no stress event.
import { InputProblem } from '../engine/issues.ts';
import { findHeadroom } from '../engine/render/index.ts';
import { EXIT_OK, InputError, parseCommandArgs, runGuarded, UsageError, type Command } from './command.ts';
import { formatIssue, loadDesignFile } from './design-file.ts';
import { INPUT_HELP, progressCounter, readInputAudio, THREADS_HELP, threadsOption } from './render-common.ts';
import { count, db, moment, sig } from './user-text.ts';

const HELP = `usage: preheard headroom <design.json> <in.wav> [--threads N] [--json]

Finds the highest drive at which the design plays this track without any stress event in any
way (excursion, end stop, coil temperature, port speed, amplifier clipping, the hot coil's
compression) or in the sum (distortion over 10 %, the output's compression over 3 dB), by
bisection to 0.25 dB, and names the limit that arrives first above it
and the way it belongs to.
${INPUT_HELP}

${THREADS_HELP}
  --json        print {clean_volts, clean_spl_db, first_limit, first_limit_way, first_limit_s}
  --help        this text

clean_volts is in the sense of render --volts: peak amplifier volts per full-scale sample.
Caution: a simulation is an estimate; real drivers can fail earlier than modelled.

exit codes: 0 ok, 1 bad input (message on stderr), 2 usage
`;

export const headroomCommand: Command = {
  run: (argv) =>
    runGuarded('headroom', HELP, async () => {
      const { values, positionals } = parseCommandArgs(argv, {
        threads: { type: 'string' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
      });
      if (values.help) {
        process.stdout.write(HELP);
        return EXIT_OK;
      }
      if (positionals.length !== 2) throw new UsageError(`expected <design.json> <in.wav>, got ${count(positionals.length, 'argument')}`);
      const helper = threadsOption(values.threads);
      const [designPath, inPath] = positionals;
      const { system, warnings } = await loadDesignFile(designPath);
      for (const w of warnings) process.stderr.write(`${formatIssue(w)}\n`);
      const audio = await readInputAudio(inPath);
      let h: ReturnType<typeof findHeadroom>;
      try {
        const progress = progressCounter('finding headroom', 'render');
        h = findHeadroom(system, audio.channels, audio.sampleRate, { onRender: progress?.tick, helper });
        progress?.done();
      } catch (e) {
        if (e instanceof InputProblem) throw new InputError(`${inPath}: ${e.message}`);
        throw e;
      }
      const out = {
        clean_volts: h.clean_volts,
        clean_spl_db: h.clean_spl_db,
        first_limit: h.first_limit,
        first_limit_way: h.first_limit_way,
        first_limit_s: h.first_limit_s,
      };
      if (values.json) process.stdout.write(`${JSON.stringify(out)}\n`);
      else {
        process.stdout.write(
          `clean up to        ${sig(h.clean_volts)} V per full scale (${db(h.clean_spl_db)} dB(C) Leq at the seat)\n` +
            (h.first_limit
              ? `first limit above  ${h.first_limit}${h.first_limit_way ? ` (${h.first_limit_way})` : ''} at ${moment(h.first_limit_s ?? 0)}\n`
              : `no limit reached up to ${sig(h.clean_volts)} V per full scale, the highest drive tried\n`),
        );
      }
      return EXIT_OK;
    }),
};
