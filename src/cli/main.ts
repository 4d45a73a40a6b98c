// Command dispatch. Each command is one module exporting a `Command`; add it to COMMANDS.
import { analyzeCommand } from './analyze.ts';
import { sweepCommand } from './sweep.ts';
import { EXIT_USAGE, type Command } from './command.ts';
import { renderCommand } from './render.ts';
import { compareCommand } from './compare.ts';
import { headroomCommand } from './headroom.ts';
import { fitCommand } from './fit.ts';
import { measuredCommand } from './measured.ts';
import { printable } from './user-text.ts';

const COMMANDS: Command[] = [analyzeCommand, renderCommand, compareCommand, headroomCommand, sweepCommand, fitCommand, measuredCommand];

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
  return command.run(rest);
}
