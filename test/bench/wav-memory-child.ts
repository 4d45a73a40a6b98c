// Child process of the CLI benchmark: reads one WAV file and reports the growth of peak resident
// memory over the process's own baseline, against the size of the decoded audio. The peak is
// /proc/self/status VmHWM, which starts afresh at exec; getrusage's maxRSS would carry over the
// parent's peak on Linux (getrusage(2): ru_maxrss is kept across execve). A second argument
// `shared` reads into SharedArrayBuffers (readWav's `shared` option).
import { readFileSync } from 'node:fs';
import { readWav } from '../../src/cli/wav.ts';

const hwm = () => {
  const m = /VmHWM:\s+(\d+) kB/.exec(readFileSync('/proc/self/status', 'utf8'));
  return m ? Number(m[1]) * 1024 : process.resourceUsage().maxRSS * 1024;
};
const base = hwm();
const wav = await readWav(process.argv[2], undefined, { shared: process.argv[3] === 'shared' });
const peak = hwm();
const decoded = wav.channels.reduce((s, c) => s + c.byteLength, 0);
process.stdout.write(`${JSON.stringify({ ratio: (peak - base) / decoded, decodedMb: decoded / 2 ** 20, peakMb: peak / 2 ** 20 })}\n`);
