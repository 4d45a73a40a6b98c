// Shared by render, compare and headroom: reading the inputs, the level options, progress.
import type { SpeakerSystem } from '../engine/system.ts';
import { InputError, parseNumberOption, UsageError } from './command.ts';
import { printable } from './user-text.ts';
import { checkReadable } from './output-files.ts';
import { INPUT_FORMATS, readAudioInput } from './audio-input.ts';
import { progressBar } from './progress.ts';
import type { WavAudio } from './wav.ts';
import type { LaneHelper } from '../engine/render/index.ts';
import { laneHelper, laneThread } from './lane-helper.ts';

export { progressBar, progressCounter } from './progress.ts';

export const INPUT_HELP = `The input may be ${INPUT_FORMATS}.`;

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

export const THREADS_HELP = `  --threads N   2 (the default where the machine has two or more cores) runs part of the work
                on a second thread, 1 keeps to one. The output is the same either way`;

/** The lane helper the --threads option asks for (none for 1). */
export function threadsOption(value: string | undefined): LaneHelper | undefined {
  if (value === undefined) return laneHelper();
  if (value !== '1' && value !== '2') throw new UsageError(`--threads must be 1 or 2, got "${printable(value)}"`);
  return value === '2' ? laneThread() : undefined;
}

/** Reads any supported audio file; its warnings go to stderr. */
export async function readInputAudio(path: string): Promise<WavAudio> {
  await checkReadable(path, 'audio file');
  // In shared memory, so the second thread and the worker threads read it without a copy.
  const audio = await readAudioInput(path, progressBar('reading'), { shared: true });
  for (const w of audio.warnings ?? []) process.stderr.write(`  warning: ${printable(w)}\n`);
  return audio;
}

/** The rendered volts must stay within what the model accepts. */
export function checkVolts(volts: number, sys: SpeakerSystem): void {
  if (!(volts > 0 && volts < 1e4)) {
    throw new InputError(
      `the level needs ${volts.toPrecision(4)} V per full scale for "${printable(sys.name)}", outside 0..10000 V: the track is too quiet for that level; choose a lower --spl or give --volts`,
    );
  }
}
