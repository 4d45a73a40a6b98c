// The blind A/B/X trial as plain data: rounds, the hidden identity of X, answers, the tally and the
// chance of doing as well by guessing, and the exports. No DOM and no audio: the screen plays the
// lanes through the listening bench's player and only hands intents to these functions.
import { probabilityAtLeast } from '../engine/trial/binomial.ts';

export type Pick = 'a' | 'b';
/** What the listener can ask to hear during a round. */
export type TrialLane = 'a' | 'b' | 'x';

export const MIN_ROUNDS = 1;
export const MAX_ROUNDS = 100;
/** Common practice, no source: 16 rounds is the usual short ABX session (12 right gives p < 0.05). */
export const DEFAULT_ROUNDS = 16;

export interface TrialSettings {
  rounds: number;
  /** A fixed loop region in track seconds, or null for the whole track. */
  loop: { startS: number; endS: number } | null;
  matchLevels: boolean;
  /** What is heard of each design (the bench's listen mode). */
  listenMode: string;
  /** The track the rounds play, by name, with its length. */
  track: { name: string; durationS: number; sampleRate: number };
  /** Planned level of each design, as the physics ran it. */
  levels: Record<Pick, { splDb: number; voltsFs: number } | null>;
  monitorDb: number | null;
}

export interface TrialRound {
  /** The design X plays, hidden until the trial ends. */
  x: Pick;
  answer: Pick | null;
  /** Times each lane was chosen during this round. */
  plays: Record<TrialLane, number>;
  answeredAtMs: number | null;
}

export interface Trial {
  format: 'preheard-blind-trial';
  version: 1;
  startedAt: string;
  names: Record<Pick, string>;
  settings: TrialSettings;
  rounds: TrialRound[];
  /** Index of the round being played; equal to rounds.length once every round is answered. */
  current: number;
  /** The lane heard now (what the player was told to play). */
  listening: TrialLane | null;
}

export interface Tally {
  answered: number;
  correct: number;
  rounds: number;
  /** P(at least `correct` right of `answered`) by guessing (exact binomial tail, p = 1/2). */
  pGuess: number;
  done: boolean;
}

/** Fills `bytes` with cryptographically strong random values (crypto.getRandomValues). */
export type RandomBytes = (bytes: Uint8Array) => Uint8Array;

export const cryptoRandom: RandomBytes = (bytes) => {
  const c = (globalThis as { crypto?: Crypto }).crypto;
  if (!c || typeof c.getRandomValues !== 'function')
    throw new Error('this browser offers no cryptographic random source (crypto.getRandomValues), which a blind trial needs');
  return c.getRandomValues(bytes);
};

export type Checked<T> = { ok: true; value: T } | { ok: false; errors: { path: string; message: string }[] };

/** Checks trial settings; every message names the field, the value and what is allowed. */
export function checkSettings(s: TrialSettings): Checked<TrialSettings> {
  const errors: { path: string; message: string }[] = [];
  if (!Number.isInteger(s.rounds) || s.rounds < MIN_ROUNDS || s.rounds > MAX_ROUNDS) {
    errors.push({ path: 'rounds', message: `rounds must be a whole number from ${MIN_ROUNDS} to ${MAX_ROUNDS}, got ${s.rounds}` });
  }
  if (s.loop) {
    const { startS, endS } = s.loop;
    const dur = s.track.durationS;
    if (!Number.isFinite(startS) || startS < 0 || startS >= dur)
      errors.push({
        path: 'loop.startS',
        message: `loop start must be from 0 s to under the track length ${dur.toFixed(2)} s, got ${startS}`,
      });
    if (!Number.isFinite(endS) || endS > dur + 1e-9)
      errors.push({ path: 'loop.endS', message: `loop end must be at most the track length ${dur.toFixed(2)} s, got ${endS}` });
    else if (endS - startS < 0.25)
      errors.push({ path: 'loop.endS', message: `loop end must be at least 0.25 s after its start (${startS} s), got ${endS}` });
  }
  return errors.length ? { ok: false, errors } : { ok: true, value: s };
}

/**
 * A new trial: X of every round is drawn now, one random byte per round (the low bit; 256 is even,
 * so A and B are exactly equally likely).
 */
export function newTrial(
  names: Record<Pick, string>,
  settings: TrialSettings,
  random: RandomBytes = cryptoRandom,
  now: Date = new Date(),
): Trial {
  const c = checkSettings(settings);
  if (!c.ok) throw new RangeError(c.errors.map((e) => e.message).join('; '));
  const bytes = random(new Uint8Array(settings.rounds));
  const rounds: TrialRound[] = Array.from(bytes, (b) => ({
    x: (b & 1) === 0 ? 'a' : 'b',
    answer: null,
    plays: { a: 0, b: 0, x: 0 },
    answeredAtMs: null,
  }));
  return {
    format: 'preheard-blind-trial',
    version: 1,
    startedAt: now.toISOString(),
    names: { ...names },
    settings: structuredClone(settings),
    rounds,
    current: 0,
    listening: null,
  };
}

/** The design the player must play for a requested lane in the current round. */
export function laneToPlay(t: Trial, lane: TrialLane): Pick {
  if (lane !== 'x') return lane;
  const r = t.rounds[Math.min(t.current, t.rounds.length - 1)];
  return r.x;
}

export function listen(t: Trial, lane: TrialLane): Trial {
  if (isDone(t)) return t;
  const rounds = t.rounds.slice();
  const r = rounds[t.current];
  rounds[t.current] = { ...r, plays: { ...r.plays, [lane]: r.plays[lane] + 1 } };
  return { ...t, rounds, listening: lane };
}

/** The listener's answer for the current round ("X is A" or "X is B"); moves on to the next round. */
export function answer(t: Trial, pick: Pick, atMs: number = Date.now() - Date.parse(t.startedAt)): Trial {
  if (isDone(t)) return t;
  const rounds = t.rounds.slice();
  rounds[t.current] = { ...rounds[t.current], answer: pick, answeredAtMs: Math.max(0, Math.round(atMs)) };
  return { ...t, rounds, current: t.current + 1, listening: null };
}

export function isDone(t: Trial): boolean {
  return t.current >= t.rounds.length;
}

export function tally(t: Trial): Tally {
  let answered = 0;
  let correct = 0;
  for (const r of t.rounds) {
    if (r.answer === null) continue;
    answered++;
    if (r.answer === r.x) correct++;
  }
  return { answered, correct, rounds: t.rounds.length, pGuess: probabilityAtLeast(correct, answered), done: isDone(t) };
}

/** The probability as people read it: "1 in 26" beside the number. */
export function describeProbability(p: number): string {
  if (p >= 0.5) return `${(p * 100).toFixed(0)} %: as likely as not by guessing`;
  const oneIn = 1 / p;
  const pct = p < 0.001 ? p.toExponential(1) : p < 0.01 ? p.toFixed(4) : p.toFixed(3);
  return `${pct} (about 1 in ${oneIn < 100 ? oneIn.toFixed(0) : Number(oneIn.toPrecision(2)).toLocaleString('en')})`;
}

/** One line of the result, as the screen shows it at the end. */
export function resultSentence(t: Tally): string {
  const p = t.pGuess;
  const base = `${t.correct} of ${t.answered} right. The chance of scoring at least this well by guessing is ${describeProbability(p)}.`;
  if (t.answered === 0) return 'No round answered yet.';
  if (p < 0.05) return `${base} That is unlikely to be luck: the difference was heard.`;
  return `${base} That is not enough to say the difference was heard (common practice asks for under 0.05).`;
}

/** RFC 4180 field: quoted when it holds a comma, a quote or a line break; quotes doubled. */
export function csvField(v: string | number | null): string {
  if (v === null) return '';
  const s = String(v);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

const CSV_EOL = '\r\n';

/**
 * The results as CSV: a header block of `# key,value` settings lines is avoided (spreadsheets treat
 * it as data); instead every row carries the trial's settings beside the round, so one file is
 * self-describing and sorts and filters cleanly.
 */
export function toCsv(t: Trial): string {
  const s = t.settings;
  const tl = tally(t);
  const head = [
    'round',
    'x_is',
    'answer',
    'correct',
    'plays_a',
    'plays_b',
    'plays_x',
    'answered_at_s',
    'design_a',
    'design_b',
    'track',
    'loop_start_s',
    'loop_end_s',
    'match_levels',
    'listen_mode',
    'planned_spl_a_db',
    'planned_spl_b_db',
    'volts_fs_a',
    'volts_fs_b',
    'monitor_db',
    'started_at',
    'total_correct',
    'total_answered',
    'p_guess',
  ];
  const lines = [head.join(',')];
  t.rounds.forEach((r, i) => {
    const row: (string | number | null)[] = [
      // X of a round not yet answered stays hidden, even in an export made mid-trial.
      i + 1,
      r.answer === null ? null : r.x.toUpperCase(),
      r.answer ? r.answer.toUpperCase() : null,
      r.answer === null ? null : r.answer === r.x ? 1 : 0,
      r.plays.a,
      r.plays.b,
      r.plays.x,
      r.answeredAtMs === null ? null : (r.answeredAtMs / 1000).toFixed(2),
      t.names.a,
      t.names.b,
      s.track.name,
      s.loop ? s.loop.startS.toFixed(3) : null,
      s.loop ? s.loop.endS.toFixed(3) : null,
      s.matchLevels ? 'yes' : 'no',
      s.listenMode,
      s.levels.a ? s.levels.a.splDb.toFixed(2) : null,
      s.levels.b ? s.levels.b.splDb.toFixed(2) : null,
      s.levels.a ? s.levels.a.voltsFs.toPrecision(5) : null,
      s.levels.b ? s.levels.b.voltsFs.toPrecision(5) : null,
      s.monitorDb === null ? null : s.monitorDb.toFixed(1),
      t.startedAt,
      tl.correct,
      tl.answered,
      tl.pGuess.toPrecision(6),
    ];
    lines.push(row.map(csvField).join(','));
  });
  return lines.join(CSV_EOL) + CSV_EOL;
}

/** The results as JSON: the whole trial (settings, names, every round) and the tally. */
export function toJson(t: Trial): string {
  const tl = tally(t);
  return (
    JSON.stringify(
      {
        ...t,
        listening: undefined,
        rounds: t.rounds.map((r) => (r.answer === null ? { ...r, x: null } : r)),
        tally: { correct: tl.correct, answered: tl.answered, rounds: tl.rounds, p_guess: tl.pGuess },
      },
      null,
      2,
    ) + '\n'
  );
}

/** Keys of the trial screen: listen to A, B, X; answer with 1 ("X is A") or 2 ("X is B"). */
export const TRIAL_KEYS: Record<string, { kind: 'listen'; lane: TrialLane } | { kind: 'answer'; pick: Pick }> = {
  a: { kind: 'listen', lane: 'a' },
  b: { kind: 'listen', lane: 'b' },
  x: { kind: 'listen', lane: 'x' },
  '1': { kind: 'answer', pick: 'a' },
  '2': { kind: 'answer', pick: 'b' },
};
