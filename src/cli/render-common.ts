// Shared by render, compare and headroom: reading the inputs, the level options, progress.
import type { SpeakerSystem } from '../engine/system.ts';
import { InputError, parseNumberOption, UsageError } from './command.ts';
import { readWav, type WavAudio } from './wav.ts';
import { printable } from './user-text.ts';
import { checkReadable } from './output-files.ts';

export const LEVEL_HELP = `  --volts V   amplifier peak volts for a digital full-scale sample (0.01 to 5000)
  --spl DB    long-term average C-weighted SPL at the design's listening seat (40 to 140 dB)
              (default: the design's planned level, listening.level)`;

export function levelOptions(values: { volts?: string; spl?: string }): { voltsFs?: number; splDb?: number } {
  if (values.volts !== undefined && values.spl !== undefined) throw new UsageError('give --volts or --spl, not both');
  return {
    voltsFs: parseNumberOption(values.volts, '--volts', 0.01, 5000),
    splDb: parseNumberOption(values.spl, '--spl', 40, 140),
  };
}

export async function readInputAudio(path: string): Promise<WavAudio> {
  await checkReadable(path, 'audio file');
  return readWav(path);
}

/** A progress bar on stderr, only when stderr is a terminal. */
export function progressBar(label: string): ((fraction: number) => void) | undefined {
  if (!process.stderr.isTTY) return undefined;
  return (f: number) => {
    const width = 30;
    const done = Math.round(f * width);
    process.stderr.write(`\r${label} [${'#'.repeat(done)}${' '.repeat(width - done)}] ${Math.round(f * 100)}%${f >= 1 ? '\n' : ''}`);
  };
}

/** The rendered volts must stay within what the model accepts. */
export function checkVolts(volts: number, sys: SpeakerSystem): void {
  if (!(volts > 0 && volts < 1e4)) {
    throw new InputError(
      `the level needs ${volts.toPrecision(4)} V per full scale for "${printable(sys.name)}", outside 0..10000 V: the track is too quiet for that level; choose a lower --spl or give --volts`,
    );
  }
}
