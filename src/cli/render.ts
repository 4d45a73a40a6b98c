// preheard render: a WAV file through a design's large-signal model, at a calibrated level.
import { InputProblem } from '../engine/issues.ts';
import { renderWarnings, resolveVolts, startRender, type RenderResult, type RenderSummary } from '../engine/render/index.ts';
import { EXIT_OK, InputError, parseCommandArgs, runGuarded, UsageError, type Command } from './command.ts';
import { formatIssue, loadDesignFile } from './design-file.ts';
import { WavFileWriter, writeTextAtomic, type WavFormat } from './wav.ts';
import {
  checkVolts,
  INPUT_HELP,
  LEVEL_HELP,
  levelOptions,
  progressBar,
  readInputAudio,
  THREADS_HELP,
  threadsOption,
} from './render-common.ts';
import { planOutputs } from './output-files.ts';
import { count, db, duration, sig } from './user-text.ts';

const HELP = `usage: preheard render <design.json> <in.wav> -o <out.wav> [--volts V | --spl DB]
                      [--linear | --residual] [--events FILE] [--format 16|24|f32] [--threads N] [--json]

Plays an audio file through every way of the design (its filter, its own amplifier channel, its
driver in its box; a flat way as an ideal band), sums the ways at the listening seat and writes
the sound there, scaled by one calibration factor and kept under 0 dBFS by a true-peak guard.
The peaks are the first driver way's; with more than one, each way's follow.
${INPUT_HELP}

${LEVEL_HELP}
  --linear      write the linear (small-signal) version of the same design instead
  --residual    write only the difference: what the nonlinear model adds (distortion)
  --events FILE also write the stress events as a JSON array
  --format F    output sample format (default: the input's)
${THREADS_HELP}
  --json        print the summary as one JSON object
  --help        this text

Caution: the modelled overload is audible on purpose. Keep the listening volume moderate.

exit codes: 0 ok, 1 bad input (message on stderr), 2 usage
`;

export function summaryLines(s: RenderSummary): string[] {
  const lines = [
    `duration           ${duration(s.duration_s)} at ${s.sample_rate} Hz`,
    `level              ${sig(s.volts_fs)} V per full scale, ${db(s.spl_db)} dB(C) Leq at the seat`,
    `calibration        ${sig(s.pa_per_fs)} Pa per full scale`,
    `peak excursion     ${sig(s.peak_excursion_mm)} mm`,
  ];
  if (s.peak_radiator_mm !== null) lines.push(`peak radiator      ${sig(s.peak_radiator_mm)} mm`);
  if (s.peak_port_speed_m_s !== null) lines.push(`peak port speed    ${sig(s.peak_port_speed_m_s)} m/s`);
  lines.push(
    `peak coil temp     ${sig(s.peak_coil_temp_c)} °C`,
    `amplifier clipping ${duration(s.amp_clip_s)}`,
    `max compression    ${sig(s.max_compression_db)} dB (hot coil); ${sig(s.output_compression_db)} dB at the output (port, suspension)`,
    `max distortion     ${s.output_distortion_db === null ? 'not judged (too quiet)' : `${db(s.output_distortion_db)} dB against the output`}`,
    `true-peak guard    ${s.limiter_db > 0 ? `${sig(s.limiter_db)} dB of gain reduction` : 'did not act'}`,
    `realtime factor    ${sig(s.realtime_factor)}x`,
  );
  if (s.ways.length > 1) {
    for (const w of s.ways) {
      const outlet =
        w.peak_port_speed_m_s !== null
          ? `, port ${sig(w.peak_port_speed_m_s)} m/s`
          : w.peak_radiator_mm !== null
            ? `, radiator ${sig(w.peak_radiator_mm)} mm`
            : '';
      lines.push(
        `way ${w.name.padEnd(14)} ${sig(w.peak_excursion_mm)} mm${outlet}, coil ${sig(w.peak_coil_temp_c)} °C, clipping ${duration(w.amp_clip_s)}, compression ${sig(w.max_compression_db)} dB`,
      );
    }
  }
  const named = (e: RenderSummary['events'][number]) => (s.ways.length > 1 && e.way ? `${e.way}: ${e.kind}` : e.kind);
  const byKind = new Map<string, number>();
  for (const e of s.events) byKind.set(named(e), (byKind.get(named(e)) ?? 0) + 1);
  lines.push(`stress events      ${s.events.length === 0 ? 'none' : [...byKind].map(([k, n]) => `${k} ×${n}`).join(', ')}`);
  for (const e of s.events.slice(0, 12)) {
    lines.push(
      `  ${e.start_s.toFixed(3).padStart(9)}–${e.end_s.toFixed(3).padEnd(9)} ${named(e).padEnd(18)} peak ${sig(e.peak)} ${e.unit} (limit ${sig(e.limit)})`,
    );
  }
  if (s.events.length > 12) lines.push(`  ... ${s.events.length - 12} more (use --events FILE or --json)`);
  for (const w of renderWarnings(s)) lines.push(`warning: ${w}`);
  return lines;
}

/** Blocks (of 4096 frames) the render runs between two turns of the event loop: about 20 ms here. */
const STEP_BLOCKS = 16;

export const renderCommand: Command = {
  run: (argv) =>
    runGuarded('render', HELP, async () => {
      const { values, positionals } = parseCommandArgs(argv, {
        output: { type: 'string', short: 'o' },
        volts: { type: 'string' },
        spl: { type: 'string' },
        linear: { type: 'boolean' },
        residual: { type: 'boolean' },
        events: { type: 'string' },
        format: { type: 'string' },
        threads: { type: 'string' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
      });
      if (values.help) {
        process.stdout.write(HELP);
        return EXIT_OK;
      }
      if (positionals.length !== 2) throw new UsageError(`expected <design.json> <in.wav>, got ${count(positionals.length, 'argument')}`);
      if (!values.output) throw new UsageError('-o <out.wav> is required');
      if (values.linear && values.residual) throw new UsageError('give --linear or --residual, not both');
      if (values.format !== undefined && !['16', '24', 'f32'].includes(values.format))
        throw new UsageError(`--format must be 16, 24 or f32, got "${values.format}"`);
      const level = levelOptions(values);
      const helper = threadsOption(values.threads);
      const [designPath, inPath] = positionals;
      const outputs = await planOutputs([designPath, inPath], [values.output, values.events]);
      const { system, warnings } = await loadDesignFile(designPath);
      for (const w of warnings) process.stderr.write(`${formatIssue(w)}\n`);
      const audio = await readInputAudio(inPath);
      const format = (values.format as WavFormat | undefined) ?? audio.format;
      let result: RenderResult;
      let wav: WavFileWriter | null = null;
      try {
        const { volts, leqPerVoltDb } = resolveVolts(system, audio.channels, audio.sampleRate, { ...level, helper });
        checkVolts(volts, system);
        // The file is written while the render runs (no copy of the output is held). Staging it arms
        // the Ctrl-C guard (output-files.ts), whose handler runs only between tasks: the render
        // gives the event loop a turn every STEP_BLOCKS blocks, so Ctrl-C stops it there and the
        // staged file is removed.
        const out = new WavFileWriter(
          outputs.staging(values.output),
          audio.channels.length,
          audio.sampleRate,
          format,
          audio.channels[0].length,
        );
        wav = out;
        const run = startRender(system, audio.channels, audio.sampleRate, {
          voltsFs: volts,
          leqPerVoltDb,
          helper,
          mode: values.linear ? 'linear' : values.residual ? 'residual' : 'nonlinear',
          onProgress: audio.channels[0].length > audio.sampleRate * 30 ? progressBar('rendering') : undefined,
          onAudio: (frames) => out.write(frames),
        });
        while (run.step(STEP_BLOCKS)) await new Promise((turn) => setImmediate(turn));
        result = run.finish();
        out.finish();
      } catch (e) {
        wav?.abort();
        if (e instanceof InputProblem) throw new InputError(`${inPath}: ${e.message}`);
        throw e;
      }
      if (values.events) await writeTextAtomic(outputs.staging(values.events), `${JSON.stringify(result.summary.events, null, 2)}\n`);
      outputs.commit();
      if (values.json) process.stdout.write(`${JSON.stringify({ ...result.summary, warnings: renderWarnings(result.summary) })}\n`);
      else process.stdout.write(`${summaryLines(result.summary).join('\n')}\n`);
      return EXIT_OK;
    }),
};
