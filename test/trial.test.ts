// The blind A/B/X trial's logic: hidden X drawn from crypto.getRandomValues, the tally, the exact
// binomial chance of guessing, the exports and the settings checks.
import { describe, expect, it } from 'vitest';
import {
  answer,
  checkSettings,
  csvField,
  describeProbability,
  isDone,
  laneToPlay,
  listen,
  newTrial,
  resultSentence,
  tally,
  toCsv,
  toJson,
  cryptoRandom,
  type Trial,
  type TrialSettings,
} from '../src/ui/trial.ts';

const SETTINGS: TrialSettings = {
  rounds: 16,
  loop: { startS: 16, endS: 24 },
  matchLevels: true,
  listenMode: 'nonlinear',
  track: { name: 'demo track', durationS: 32, sampleRate: 48000 },
  levels: { a: { splDb: 85, voltsFs: 12.3 }, b: { splDb: 85, voltsFs: 8.1 } },
  monitorDb: -24,
};
const NAMES = { a: 'Living room, sealed', b: 'Living room, "vented", 2 ports' };

/** A fixed byte sequence in place of the random source, so the rounds are known to the test. */
const fixedBytes = (values: number[]) => (b: Uint8Array) => {
  b.set(values.slice(0, b.length));
  return b;
};

/** Answers every round: right for the first `right` rounds, wrong after. */
function play(t: Trial, right: number): Trial {
  for (let i = 0; i < t.rounds.length; i++) {
    const x = t.rounds[t.current].x;
    t = answer(listen(listen(t, 'x'), 'a'), i < right ? x : x === 'a' ? 'b' : 'a', 1000 * (i + 1));
  }
  return t;
}

/** Minimal RFC 4180 reader (quoted fields, doubled quotes, CRLF rows) to read the export back. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let f = '';
  let q = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (q) {
      if (c === '"' && text[i + 1] === '"') (f += '"'), i++;
      else if (c === '"') q = false;
      else f += c;
    } else if (c === '"') q = true;
    else if (c === ',') row.push(f), (f = '');
    else if (c === '\r' && text[i + 1] === '\n') row.push(f), rows.push(row), (row = []), (f = ''), i++;
    else f += c;
  }
  return rows;
}

describe('blind trial rounds', () => {
  it('draws X from the low bit of each random byte and plays the hidden design for X', () => {
    const t = newTrial(NAMES, { ...SETTINGS, rounds: 4 }, fixedBytes([0, 1, 254, 255]));
    expect(t.rounds.map((r) => r.x)).toEqual(['a', 'b', 'a', 'b']);
    expect(laneToPlay(t, 'a')).toBe('a');
    expect(laneToPlay(t, 'b')).toBe('b');
    expect(laneToPlay(t, 'x')).toBe('a');
    const t2 = answer(t, 'a', 500);
    expect(laneToPlay(t2, 'x')).toBe('b');
  });

  it('with crypto.getRandomValues, X is A about half the time (2000 rounds, within 5 sigma)', () => {
    // Binomial(2000, 1/2): mean 1000, sigma = sqrt(2000)/2 = 22.4; a fair source lands within 112.
    let a = 0;
    for (let k = 0; k < 20; k++) a += newTrial(NAMES, { ...SETTINGS, rounds: 100 }, cryptoRandom).rounds.filter((r) => r.x === 'a').length;
    expect(Math.abs(a - 1000)).toBeLessThan(112);
  });

  it('counts listens per lane and moves on after each answer', () => {
    let t = newTrial(NAMES, { ...SETTINGS, rounds: 2 }, fixedBytes([1, 0]));
    t = listen(listen(listen(t, 'x'), 'x'), 'b');
    expect(t.rounds[0].plays).toEqual({ a: 0, b: 1, x: 2 });
    expect(t.listening).toBe('b');
    t = answer(t, 'b', 2500);
    expect(t.current).toBe(1);
    expect(t.listening).toBeNull();
    t = answer(t, 'b', 4000);
    expect(isDone(t)).toBe(true);
    // Answers after the end change nothing.
    expect(answer(t, 'a')).toBe(t);
    expect(tally(t)).toMatchObject({ answered: 2, correct: 1, rounds: 2, done: true });
  });
});

describe('tally and the chance of guessing', () => {
  it('12 of 16 right: P = 2517/65536 = 0.0384 (binomial coefficients of 16; the usual ABX table threshold for p < 0.05)', () => {
    const t = play(newTrial(NAMES, SETTINGS, cryptoRandom), 12);
    const tl = tally(t);
    expect(tl.correct).toBe(12);
    expect(tl.answered).toBe(16);
    expect(tl.pGuess).toBeCloseTo(2517 / 65536, 10);
    expect(resultSentence(tl)).toMatch(/^12 of 16 right\. .* 0\.038 \(about 1 in 26\)\. That is unlikely to be luck/);
  });

  it('11 of 16 right is not enough: P = 6885/65536 = 0.105', () => {
    // C(16,11..16) = 4368 + 1820 + 560 + 120 + 16 + 1 = 6885
    const tl = tally(play(newTrial(NAMES, SETTINGS, cryptoRandom), 11));
    expect(tl.pGuess).toBeCloseTo(6885 / 65536, 10);
    expect(resultSentence(tl)).toMatch(/not enough/);
  });

  it('a partial trial is scored on the answered rounds only', () => {
    let t = newTrial(NAMES, SETTINGS, fixedBytes(new Array(16).fill(0)));
    for (let i = 0; i < 5; i++) t = answer(t, 'a', i);
    // 5 of 5: P = 1/32
    expect(tally(t)).toMatchObject({ answered: 5, correct: 5, done: false });
    expect(tally(t).pGuess).toBeCloseTo(1 / 32, 12);
  });

  it('says probabilities in plain words', () => {
    expect(describeProbability(0.5)).toMatch(/as likely as not/);
    expect(describeProbability(1 / 65536)).toBe('1.5e-5 (about 1 in 66,000)');
  });
});

describe('exports', () => {
  it('CSV: one RFC 4180 row per round with the design names and the settings', () => {
    const t = play(newTrial(NAMES, SETTINGS, fixedBytes([0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1])), 12);
    const text = toCsv(t);
    expect(text.endsWith('\r\n')).toBe(true);
    const rows = parseCsv(text);
    expect(rows.length).toBe(17);
    const h = rows[0];
    const col = (name: string) => h.indexOf(name);
    for (const name of ['round', 'x_is', 'answer', 'correct', 'design_a', 'design_b', 'loop_start_s', 'match_levels', 'p_guess'])
      expect(col(name)).toBeGreaterThanOrEqual(0);
    for (const r of rows.slice(1)) expect(r.length).toBe(h.length);
    expect(rows[1][col('design_b')]).toBe(NAMES.b); // the comma and the quotes survive
    expect(rows[2][col('x_is')]).toBe('B');
    expect(rows.slice(1).filter((r) => r[col('correct')] === '1').length).toBe(12);
    expect(rows[1][col('loop_start_s')]).toBe('16.000');
    expect(rows[1][col('loop_end_s')]).toBe('24.000');
    expect(Number(rows[1][col('p_guess')])).toBeCloseTo(2517 / 65536, 6);
    expect(rows[16][col('answered_at_s')]).toBe('16.00');
  });

  it('CSV quoting follows RFC 4180 section 2 (rules 6 and 7)', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvField(null)).toBe('');
  });

  it('JSON: the whole trial with names, settings, rounds and the tally; unanswered X stays hidden', () => {
    let t = newTrial(NAMES, SETTINGS, fixedBytes(new Array(16).fill(1)));
    t = answer(t, 'b', 1200);
    const j = JSON.parse(toJson(t));
    expect(j.format).toBe('preheard-blind-trial');
    expect(j.names).toEqual(NAMES);
    expect(j.settings.loop).toEqual({ startS: 16, endS: 24 });
    expect(j.settings.levels.b.voltsFs).toBe(8.1);
    expect(j.rounds[0]).toMatchObject({ x: 'b', answer: 'b', answeredAtMs: 1200 });
    expect(j.rounds[1].x).toBeNull();
    expect(j.tally).toMatchObject({ correct: 1, answered: 1, rounds: 16 });
    expect(j.tally.p_guess).toBeCloseTo(0.5, 12);
    const csv = parseCsv(toCsv(t));
    expect(csv[2][csv[0].indexOf('x_is')]).toBe('');
  });
});

describe('settings checks name the field, the value and the range', () => {
  it('rejects bad round counts and loops', () => {
    const bad = checkSettings({ ...SETTINGS, rounds: 0, loop: { startS: 40, endS: 41 } });
    expect(bad.ok).toBe(false);
    if (bad.ok) return;
    expect(bad.errors.map((e) => e.path)).toEqual(['rounds', 'loop.startS', 'loop.endS']);
    expect(bad.errors[0].message).toMatch(/1 to 100, got 0/);
    expect(bad.errors[1].message).toMatch(/32\.00 s, got 40/);
    const short = checkSettings({ ...SETTINGS, loop: { startS: 3, endS: 3.1 } });
    expect(short.ok ? '' : short.errors[0].message).toMatch(/at least 0\.25 s after its start \(3 s\), got 3\.1/);
    expect(() => newTrial(NAMES, { ...SETTINGS, rounds: 2.5 })).toThrow(/got 2\.5/);
    expect(checkSettings({ ...SETTINGS, loop: null }).ok).toBe(true);
  });
});
