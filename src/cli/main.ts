// Command dispatch. Each command is one module exporting a `Command`; add it to COMMANDS with the
// line the usage shows for it.
import { EXIT_USAGE, type Command } from './command.ts';
import { printable } from './user-text.ts';

/**
 * A command's name, its line in the usage, and its module, loaded only when the command runs: the
 * usage and a mistyped command answer without loading the engine (in the bundle, a chunk of its own).
 */
interface CommandEntry {
  name: string;
  summary: string;
  load: () => Promise<Command>;
}

const COMMANDS: CommandEntry[] = [
  {
    name: 'analyze',
    summary: 'small-signal figures and curves of a design',
    load: async () => (await import('./analyze.ts')).analyzeCommand,
  },
  {
    name: 'render',
    summary: 'play an audio file through a design at a calibrated level',
    load: async () => (await import('./render.ts')).renderCommand,
  },
  {
    name: 'compare',
    summary: 'two designs on one track, same calibration, levels matched',
    load: async () => (await import('./compare.ts')).compareCommand,
  },
  {
    name: 'headroom',
    summary: 'the loudest clean level of a design on a track, and its first limit',
    load: async () => (await import('./headroom.ts')).headroomCommand,
  },
  {
    name: 'sweep',
    summary: 'f3, first limit and headroom on a track across box volumes and tunings',
    load: async () => (await import('./sweep.ts')).sweepCommand,
  },
  { name: 'fit', summary: 'driver parameters from measured impedance sweeps', load: async () => (await import('./fit.ts')).fitCommand },
  {
    name: 'measured',
    summary: 'attach a measured frequency response to a way (writes a new design file)',
    load: async () => (await import('./measured.ts')).measuredCommand,
  },
];

function usage(): string {
  const lines = COMMANDS.map((c) => `  ${c.name.padEnd(10)} ${c.summary}`);
  return `preheard: hear a loudspeaker design before building it\n\nusage: preheard <command> [options]\n\ncommands:\n${lines.join('\n')}\n\nRun "preheard <command> --help" for a command's options.\n`;
}

export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    process.stdout.write(usage());
    return name === undefined ? EXIT_USAGE : 0;
  }
  const command = COMMANDS.find((c) => c.name === name);
  if (!command) {
    process.stderr.write(`preheard: unknown command "${printable(name)}"\n\n${usage()}`);
    return EXIT_USAGE;
  }
  return (await command.load()).run(rest);
}
