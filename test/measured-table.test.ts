// Reading measured frequency-response tables: the layouts a measurement program writes, and a
// message naming the line for each kind of bad table; the same checks on a design file's field.
import { describe, expect, it } from 'vitest';
import { parseResponseTable } from '../src/engine/fir/response-table.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { logSpaced, sealedDoc } from './helpers/measured.ts';

const freqs = logSpaced(20, 20000, 30);
const rows = (fmt: (f: number, i: number) => string) => freqs.map(fmt).join('\n');

describe('parseResponseTable', () => {
  it('reads frequency, SPL and phase in any order from a header, with comments and decimal commas', () => {
    const text = `# measured at 1 m\n; gated\nPhase [deg]\tSPL [dB]\tFreq [Hz]\n${rows((f, i) => `${-i * 3},5\t${(80 + i / 10).toFixed(2).replace('.', ',')}\t${f.toFixed(2).replace('.', ',')}`)}`;
    const r = parseResponseTable(text);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.table.freqHz[0]).toBeCloseTo(20, 2);
    expect(r.table.splDb[3]).toBeCloseTo(80.3, 6);
    expect(r.table.phaseDeg![2]).toBeCloseTo(-6.5, 6);
  });

  it('without a header takes frequency (the rising column), SPL, phase; phase is optional', () => {
    const r = parseResponseTable(rows((f) => `${f}, -3.5`));
    expect(r.ok && r.table.phaseDeg === null && r.table.splDb[0] === -3.5).toBe(true);
  });

  const bad: [string, string, number, RegExp][] = [
    ['a word among the numbers', `Hz dB\n20 80\n30 eighty\n`, 3, /"eighty" is not a number/],
    ['a missing column', `Hz dB\n20 80\n30\n`, 3, /at least two columns: frequency and SPL/],
    ['a ragged row', `20 80 10\n30 81\n`, 2, /has 2 columns where the lines before have 3/],
    [
      'frequencies out of order',
      `Hz dB\n${rows((f, i) => (i === 12 ? `${freqs[10]} 80` : `${f} 80`))}`,
      14,
      /does not rise from the point before/,
    ],
    ['too few points', `Hz dB\n20 80\n40 81\n80 82\n`, 4, /the table has 3 points; a measured response needs at least 10/],
    ['a frequency of zero', `Hz dB\n0 80\n${rows((f) => `${f} 80`)}`, 2, /frequency 0 Hz must be from 1 to 100000 Hz/],
    ['a level far out of range', `Hz dB\n${rows((f, i) => `${f} ${i === 5 ? 1e6 : 80}`)}`, 7, /SPL 1000000 dB must be from -250 to 250 dB/],
    ['an empty file', ``, 1, /no rows of numbers/],
    ['only comments', `# nothing\n* here\n`, 3, /no rows of numbers/],
    ['a number too large', `Hz dB\n20 1e999\n`, 2, /too large/],
  ];
  for (const [what, text, line, message] of bad)
    it(`names the line of ${what}`, () => {
      const r = parseResponseTable(text);
      expect(r.ok).toBe(false);
      if (r.ok) return;
      expect(r.line).toBe(line);
      expect(r.message).toMatch(message);
    });
});

describe('measured_response in a design file', () => {
  const withField = (field: unknown) => {
    const doc = sealedDoc() as unknown as { ways: Record<string, unknown>[] };
    doc.ways[0].measured_response = field;
    return parseDesign(doc);
  };
  const good = { blend_hz: 500, freq_hz: freqs, spl_db: freqs.map(() => 85) };

  it('a design without the field is read as before; with it the way carries the table', () => {
    const r = withField(good);
    expect(r.ok).toBe(true);
    if (r.ok && r.system.ways[0].kind === 'driver') expect(r.system.ways[0].measured?.blendHz).toBe(500);
  });

  const cases: [string, unknown, string, RegExp][] = [
    ['lists of different lengths', { ...good, spl_db: [80, 81] }, 'ways[0].measured_response.freq_hz', /30 frequencies but 2 SPL values/],
    [
      'a frequency out of order',
      { ...good, freq_hz: freqs.map((f, i) => (i === 4 ? freqs[2] : f)) },
      'ways[0].measured_response.freq_hz[4]',
      /does not rise/,
    ],
    [
      'a blend below the table',
      { ...good, blend_hz: 20 },
      'ways[0].measured_response.blend_hz',
      /starts at 20 Hz: .* must start at 14.14 Hz or lower/,
    ],
    ['a blend too near its top', { ...good, blend_hz: 10000 }, 'ways[0].measured_response.blend_hz', /must reach 28280 Hz/],
    [
      'a level that is not a number',
      { ...good, spl_db: freqs.map(() => 'loud') },
      'ways[0].measured_response.spl_db[0]',
      /must be a number/,
    ],
    ['an unknown field', { ...good, gain: 1 }, 'ways[0].measured_response.gain', /is not a field/],
  ];
  for (const [what, field, path, message] of cases)
    it(`refuses ${what} with a message at ${path}`, () => {
      const r = withField(field);
      expect(r.ok).toBe(false);
      if (r.ok) return;
      const e = r.errors.find((x) => x.path === path);
      expect(e?.message, JSON.stringify(r.errors)).toMatch(message);
    });
});
