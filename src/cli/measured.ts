// preheard measured: a new design file with a measured frequency response attached to one way.
import { lstat, writeFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { parseResponseTable } from '../engine/fir/response-table.ts';
import { parseDesign } from '../engine/design/validate.ts';
import { measuredCorrection } from '../engine/response/frequency.ts';
import type { DriverWay } from '../engine/system.ts';
import { fmt } from '../engine/issues.ts';
import { EXIT_OK, InputError, parseCommandArgs, parseNumberOption, runGuarded, UsageError, type Command } from './command.ts';
import { formatIssue, loadDesignFile, MAX_DESIGN_BYTES, readSmallText } from './design-file.ts';
import { planOutputs } from './output-files.ts';
import { printable } from './user-text.ts';
import { splDb } from '../engine/units.ts';

/**
 * The level shift in words: the shift is in dB of the model's pressure (re 1 Pa per volt at the
 * seat) against the table's dB; in SPL it says how far the table sits from the model at 1 V.
 */
function tableAgainstModel(offsetDb: number): string {
  const db = -(offsetDb + splDb(1));
  if (Math.abs(db) < 0.05) return "the table's level equals the model's at 1 V at the seat";
  return `the table's level sits ${Math.abs(db).toFixed(1)} dB ${db > 0 ? 'above' : 'below'} the model's at 1 V at the seat`;
}

const HELP = `usage: preheard measured <design.json> <response.txt> --blend-hz F --out <new.json>
                          [--way NAME] [--json]

Writes a new design file: the design with a measured frequency response attached to one of its
driver ways (the first, or the one named by --way). Above the blend frequency the way plays the
measurement instead of the model's upper response; below it the model holds; over the octave
around it (half an octave either side) the two are crossfaded. The measured level is matched to
the model over that octave, so a table in any dB reference will do. Without a phase column the
way takes the minimum phase of the measured level; with one, the measured phase is used, less
the measurement's time of flight (the way's offset sets where it sits).

A response is a text table of frequency (Hz), SPL (dB) and, optionally, phase (degrees), in any
column order with a header, with comment lines (#, *, ;) and decimal points or commas. It must
start half an octave below the blend and reach an octave and a half above it. analyze, render,
compare and headroom use it from the design file (the field "measured_response" of the way).

  --blend-hz F   the blend frequency, Hz
  --out FILE     the new design file (never an existing file)
  --way NAME     the driver way to attach it to (default: the first way with a driver)
  --json         print one JSON object instead of the summary
  --help         this text

exit codes: 0 ok, 1 bad input (message on stderr), 2 usage
`;

const TABLE_KIND = { noun: 'response table', maxBytes: 8 << 20, sizeWords: '8 MiB', typical: 'a response is a few hundred kB at most' };

export const measuredCommand: Command = {
  run: (argv) =>
    runGuarded('measured', HELP, async () => {
      const { values, positionals } = parseCommandArgs(argv, {
        'blend-hz': { type: 'string' },
        out: { type: 'string' },
        way: { type: 'string' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
      });
      if (values.help) {
        process.stdout.write(HELP);
        return EXIT_OK;
      }
      if (positionals.length !== 2) throw new UsageError(`expected a design file and a response table, got ${positionals.length} files`);
      const blendHz = parseNumberOption(values['blend-hz'], '--blend-hz', 10, 20000);
      if (blendHz === undefined)
        throw new UsageError('--blend-hz is required: the frequency the way blends from the model to the measurement');
      if (!values.out) throw new UsageError('--out is required: the new design file');
      const out = values.out;
      // Nothing the user has is overwritten: the design with the table is always a new file.
      if (
        await lstat(out).then(
          () => true,
          () => false,
        )
      )
        throw new InputError(`${printable(out)} already exists: give a new file name for the design with the measured response`);
      const [designPath, tablePath] = positionals;
      const plan = await planOutputs([designPath, tablePath], [out]);
      const { design } = await loadDesignFile(designPath);
      const table = parseResponseTable(await readSmallText(tablePath, TABLE_KIND));
      if (!table.ok) throw new InputError(`${printable(tablePath)}, line ${table.line}: ${table.message}`);
      const index = design.ways.findIndex((w) => w.kind === 'driver' && (values.way === undefined || w.name === values.way));
      if (index < 0) {
        const names = design.ways.filter((w) => w.kind === 'driver').map((w) => `"${printable(w.name)}"`);
        throw new InputError(
          `${printable(designPath)} has no way with a driver named "${printable(values.way ?? '')}"; its driver ways are ${names.join(', ')}`,
        );
      }
      const next = structuredClone(design);
      const way = next.ways[index];
      if (way.kind !== 'driver') throw new InputError('that way has no driver');
      way.measured_response = {
        blend_hz: blendHz,
        freq_hz: table.table.freqHz,
        spl_db: table.table.splDb,
        ...(table.table.phaseDeg ? { phase_deg: table.table.phaseDeg } : {}),
        source: basename(tablePath).slice(0, 200),
      };
      const parsed = parseDesign(next);
      if (!parsed.ok) {
        const problems = parsed.errors.map(formatIssue).join('\n');
        throw new InputError(`the response cannot be used on way "${printable(way.name)}":\n${problems}`);
      }
      const correction = measuredCorrection(parsed.system, parsed.system.ways[index] as DriverWay)!;
      // The lists of numbers one to a line would make a long table's file huge: each list on one line.
      const text = `${JSON.stringify(next, null, 2).replace(/\[\s+([-+\d.eE,\s]+?)\s+\]/g, (_, inner: string) => `[${inner.replace(/,\s+/g, ', ')}]`)}\n`;
      if (text.length > MAX_DESIGN_BYTES)
        throw new InputError(
          `the design with this table would be ${(text.length / 2 ** 20).toFixed(1)} MiB, over the 1 MiB a design file may have: use a table with fewer points`,
        );
      await writeFile(plan.staging(out), text);
      plan.commit();
      const summary = {
        out,
        way: way.name,
        points: table.table.freqHz.length,
        blend_hz: blendHz,
        phase: table.table.phaseDeg ? 'measured' : 'minimum',
        level_offset_db: correction.curve.levelOffsetDb,
        removed_delay_ms: correction.curve.removedDelayS * 1000,
      };
      if (values.json) process.stdout.write(`${JSON.stringify(summary)}\n`);
      else
        process.stdout.write(
          `${printable(out)}: way "${printable(way.name)}" plays the measured response (${summary.points} points, ` +
            `${table.table.phaseDeg ? 'measured phase' : 'minimum phase'}) above ${fmt(blendHz)} Hz, ` +
            `crossfaded from ${fmt(blendHz / Math.SQRT2)} to ${fmt(blendHz * Math.SQRT2)} Hz; ` +
            `${tableAgainstModel(summary.level_offset_db)} (matched over the blend octave)` +
            (table.table.phaseDeg ? `, and ${summary.removed_delay_ms.toFixed(3)} ms of time of flight taken out of its phase` : '') +
            '.\n',
        );
      return EXIT_OK;
    }),
};
