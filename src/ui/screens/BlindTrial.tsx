// Blind trial: A/B/X rounds through the listening bench's player. X is A or B by a cryptographic
// coin; what X is stays hidden until the end; levels are matched; an optional fixed loop region.
// Keys: A, B, X to listen; 1 = "X is A", 2 = "X is B"; space plays or pauses.
import { probabilityAtLeast } from '../../engine/trial/binomial.ts';
import { useEffect, useState } from 'preact/hooks';
import { LISTEN_MODE_LABEL } from '../../audio/protocol.ts';
import { clock } from '../../engine/verdict/verdict.ts';
import { useApp } from '../context.ts';
import { downloadText } from '../files.ts';
import { fileStem, fixed, num } from '../format.ts';
import { SLOTS, SLOT_LABEL } from '../store.ts';
import { useBench } from '../bench/useBench.ts';
import { useSystems } from '../sheet/hooks.ts';
import {
  answer,
  checkSettings,
  DEFAULT_ROUNDS,
  isDone,
  laneToPlay,
  listen,
  MAX_ROUNDS,
  MIN_ROUNDS,
  newTrial,
  resultSentence,
  tally,
  toCsv,
  toJson,
  TRIAL_KEYS,
  type Pick,
  type Trial,
  type TrialLane,
  type TrialSettings,
} from '../trial.ts';

/** The usual threshold for "not by guessing" (common practice, no source). */
const SIGNIFICANCE = 0.05;

/** The fewest rounds in which a perfect score reaches p < SIGNIFICANCE. */
function roundsForSignificance(): number {
  let n = 1;
  while (probabilityAtLeast(n, n) >= SIGNIFICANCE) n++;
  return n;
}

/** The trial outlives a visit to another screen. */
let kept: Trial | null = null;

export function BlindTrial() {
  const { state, dispatch, store } = useApp();
  const { bench: audio, state: bench } = useBench(store);
  const systems = useSystems();
  const [trial, setTrialState] = useState<Trial | null>(kept);
  const [problems, setProblems] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);
  const rounds = state.settings.trialRounds ?? DEFAULT_ROUNDS;
  const durationS = bench.track ? bench.track.frames / bench.track.sampleRate : null;
  const defaultLoop = () => {
    if (bench.loop && bench.track)
      return { startS: bench.loop.startFrame / bench.track.sampleRate, endS: bench.loop.endFrame / bench.track.sampleRate };
    const from = bench.track?.loudFromS ?? 0;
    return { startS: from, endS: Math.min(from + 8, durationS ?? from + 8) };
  };
  const [loopOn, setLoopOn] = useState(true);
  const [loop, setLoop] = useState(defaultLoop);
  useEffect(() => {
    if (!trial) setLoop(defaultLoop());
  }, [bench.track]);

  const setTrial = (t: Trial | null) => {
    kept = t;
    setTrialState(t);
  };

  const begin = async () => {
    setBusy(true);
    try {
      await audio.start();
      const st = audio.state;
      if (!st.track) {
        setProblems([st.message ?? 'The audio engine did not start, so there is nothing to listen to.']);
        return;
      }
      // The planned levels resolve in the bench's worker shortly after the track loads.
      for (let i = 0; i < 30 && !audio.state.levels; i++) await new Promise((r) => setTimeout(r, 100));
      const s = audio.state;
      const settings: TrialSettings = {
        rounds,
        loop: loopOn ? { ...loop } : null,
        matchLevels: true,
        listenMode: s.mode,
        track: { name: s.track!.name, durationS: s.track!.frames / s.track!.sampleRate, sampleRate: s.track!.sampleRate },
        levels: { a: s.levels?.a ?? null, b: s.levels?.b ?? null },
        monitorDb: s.monitorDb,
      };
      const c = checkSettings(settings);
      if (!c.ok) {
        setProblems(c.errors.map((e) => e.message));
        return;
      }
      setProblems([]);
      audio.setMatch(true);
      audio.setLoop(settings.loop);
      if (settings.loop) audio.seek(settings.loop.startS);
      audio.selectLane('a');
      setTrial({ ...newTrial({ a: state.designs.a.name, b: state.designs.b.name }, settings), listening: null });
    } finally {
      setBusy(false);
    }
  };

  // Keys can come faster than renders: always act on the latest trial, not the one last drawn.
  const hear = (lane: TrialLane) => {
    const t = kept;
    if (!t || isDone(t)) return;
    audio.selectLane(laneToPlay(t, lane));
    if (!audio.state.playing) void audio.play();
    setTrial(listen(t, lane));
  };
  const decide = (pick: Pick) => {
    const t = kept;
    if (!t || isDone(t)) return;
    const next = answer(t, pick);
    // The next round starts on A, a known lane, so nothing of the new X is heard by accident.
    audio.selectLane('a');
    if (isDone(next)) audio.pause();
    setTrial({ ...next, listening: isDone(next) ? null : 'a' });
  };

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const t = e.target as HTMLElement | null;
      if (t && (t.tagName === 'INPUT' || t.tagName === 'TEXTAREA' || t.tagName === 'SELECT')) return;
      if (e.ctrlKey || e.metaKey || e.altKey || !kept || isDone(kept)) return;
      if (e.key === ' ') audio.state.playing ? audio.pause() : void audio.play();
      else {
        const k = TRIAL_KEYS[e.key.toLowerCase()];
        if (!k) return;
        if (k.kind === 'listen') hear(k.lane);
        else decide(k.pick);
      }
      e.preventDefault();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  const ready = !!systems.a && !!systems.b;
  const stem = `preheard-blind-trial-${fileStem(state.designs.a.name)}-vs-${fileStem(state.designs.b.name)}`;

  return (
    <section class="sheet trial" aria-labelledby="trial-h">
      <h2 id="trial-h">Blind trial</h2>
      <p class="sheet-intro">
        A and B are the two designs; X is one of them, chosen by a cryptographic coin toss each round and not shown until the end. Listen as
        often as you like, then say which one X is. Levels are matched, so loudness gives nothing away. After the last round you see the
        score and how likely it is by guessing alone.
      </p>
      {!trial ? (
        <div class="trial-setup" data-testid="trial-setup">
          <label class="inline">
            <span>Rounds</span>
            <input
              type="number"
              min={MIN_ROUNDS}
              max={MAX_ROUNDS}
              step={1}
              value={rounds}
              data-testid="trial-rounds"
              onInput={(e) => {
                const n = Number((e.currentTarget as HTMLInputElement).value);
                if (Number.isInteger(n) && n >= MIN_ROUNDS && n <= MAX_ROUNDS) dispatch({ type: 'settings', patch: { trialRounds: n } });
              }}
            />
          </label>
          {probabilityAtLeast(rounds, rounds) >= SIGNIFICANCE ? (
            <p class="msg warning" role="status" data-testid="trial-rounds-warning">
              With {rounds} {rounds === 1 ? 'round' : 'rounds'} even a perfect score has a{' '}
              {num(100 * probabilityAtLeast(rounds, rounds), 3)} % chance by guessing, so it cannot show a difference at p &lt; 0.05: use at
              least {roundsForSignificance()} rounds.
            </p>
          ) : null}
          <label class="check">
            <input type="checkbox" checked={loopOn} onChange={(e) => setLoopOn((e.currentTarget as HTMLInputElement).checked)} /> Loop a
            fixed region
          </label>
          {loopOn ? (
            <span class="inline">
              <label class="inline">
                from
                <input
                  type="number"
                  min={0}
                  step={0.5}
                  value={fixed(loop.startS, 2)}
                  data-testid="trial-loop-start"
                  onChange={(e) => setLoop({ ...loop, startS: Number((e.currentTarget as HTMLInputElement).value) })}
                />{' '}
                s
              </label>
              <label class="inline">
                to
                <input
                  type="number"
                  min={0}
                  step={0.5}
                  value={fixed(loop.endS, 2)}
                  data-testid="trial-loop-end"
                  onChange={(e) => setLoop({ ...loop, endS: Number((e.currentTarget as HTMLInputElement).value) })}
                />{' '}
                s
              </label>
            </span>
          ) : null}
          <button type="button" class="primary" disabled={!ready || busy} onClick={() => void begin()} data-testid="trial-start">
            {busy ? 'Starting the audio…' : 'Start the trial'}
          </button>
          <p class="fine">
            Track:{' '}
            {bench.track
              ? `${bench.track.name} (${clock(Math.round(durationS!))})`
              : 'the demo track, unless you load one on the Listening bench'}
            . Heard {LISTEN_MODE_LABEL[bench.mode]}.
          </p>
          {problems.length ? (
            <ul class="problems" role="alert" data-testid="trial-problems">
              {problems.map((p) => (
                <li class="error">{p}</li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : !isDone(trial) ? (
        <Round
          trial={trial}
          playing={bench.playing}
          onHear={hear}
          onAnswer={decide}
          onPlay={() => (bench.playing ? audio.pause() : void audio.play())}
          onStop={() => (audio.pause(), setTrial({ ...trial, rounds: trial.rounds.slice(0, trial.current), current: trial.current }))}
        />
      ) : (
        <Result
          trial={trial}
          onExportCsv={() => downloadText(toCsv(trial), `${stem}.csv`, 'text/csv')}
          onExportJson={() => downloadText(toJson(trial), `${stem}.json`)}
          onAgain={() => setTrial(null)}
        />
      )}
    </section>
  );
}

function Round(p: {
  trial: Trial;
  playing: boolean;
  onHear: (l: TrialLane) => void;
  onAnswer: (x: Pick) => void;
  onPlay: () => void;
  onStop: () => void;
}) {
  const t = p.trial;
  const tl = tally(t);
  return (
    <div class="trial-round" data-testid="trial-round">
      <p class="trial-count" aria-live="polite" data-testid="trial-count">
        Round {t.current + 1} of {t.rounds.length}
      </p>
      <div class="trial-listen" role="group" aria-label="Listen">
        {(['a', 'b', 'x'] as const).map((l) => (
          <button
            type="button"
            class={`trial-lane${t.listening === l ? ' on' : ''}`}
            aria-pressed={t.listening === l}
            onClick={() => p.onHear(l)}
            data-testid={`trial-hear-${l}`}
          >
            <span class="big">{l.toUpperCase()}</span>
            <kbd>{l.toUpperCase()}</kbd>
          </button>
        ))}
        <button type="button" class="trial-play" onClick={p.onPlay}>
          {p.playing ? 'Pause' : 'Play'} <kbd>space</kbd>
        </button>
      </div>
      <div class="trial-answer" role="group" aria-label="Answer">
        <button type="button" class="primary" onClick={() => p.onAnswer('a')} data-testid="trial-x-is-a">
          X is A <kbd>1</kbd>
        </button>
        <button type="button" class="primary" onClick={() => p.onAnswer('b')} data-testid="trial-x-is-b">
          X is B <kbd>2</kbd>
        </button>
      </div>
      <p class="fine">
        {tl.answered} answered so far; the score is shown at the end.{' '}
        {t.settings.loop ? `Looping ${clock(t.settings.loop.startS)}–${clock(t.settings.loop.endS)}.` : 'Playing the whole track.'}{' '}
        <button type="button" class="small ghost" onClick={p.onStop}>
          End the trial here
        </button>
      </p>
    </div>
  );
}

function Result(p: { trial: Trial; onExportCsv: () => void; onExportJson: () => void; onAgain: () => void }) {
  const t = p.trial;
  const tl = tally(t);
  return (
    <div class="trial-result" data-testid="trial-result">
      <p class="trial-score" data-testid="trial-score">
        {resultSentence(tl)}
      </p>
      <table class="figures trial-table">
        <caption>Each round: {SLOTS.map((s) => `${SLOT_LABEL[s]} was ${t.names[s]}`).join('; ')}</caption>
        <thead>
          <tr>
            <th scope="col">Round</th>
            <th scope="col">X was</th>
            <th scope="col">You said</th>
            <th scope="col" class="n">
              Listens A / B / X
            </th>
          </tr>
        </thead>
        <tbody>
          {t.rounds.map((r, i) => (
            <tr class={r.answer === r.x ? 'right' : 'wrong'}>
              <td>{i + 1}</td>
              <td>{r.x.toUpperCase()}</td>
              <td>
                {r.answer ? r.answer.toUpperCase() : '—'} {r.answer ? (r.answer === r.x ? '✓' : '✗') : ''}
              </td>
              <td class="n">
                {r.plays.a} / {r.plays.b} / {r.plays.x}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <div class="inline">
        <button type="button" onClick={p.onExportCsv} data-testid="trial-csv">
          Export CSV
        </button>
        <button type="button" onClick={p.onExportJson} data-testid="trial-json">
          Export JSON
        </button>
        <button type="button" class="primary" onClick={p.onAgain}>
          New trial
        </button>
      </div>
    </div>
  );
}
