// Play / pause, the time, the lane switch (A / B / reference) and, on the bench, the listen mode,
// match levels and the monitor gain with its hearing caution. Only intents: the controller does the rest.
import { useEffect, useState } from 'preact/hooks';
import type { BenchAudio, BenchState } from '../../audio/bench.ts';
import { LOAD_LIMIT } from '../../audio/bench.ts';
import { LISTEN_MODES, LISTEN_MODE_LABEL, type LaneId, type ListenMode } from '../../audio/protocol.ts';
import { gainToDb, MONITOR_CONFIRM_ABOVE_DB, MONITOR_MAX_DB, MONITOR_MIN_DB, requestMonitorGain } from '../../audio/levels.ts';
import type { Store } from '../store.ts';
import { HearingDialog } from './HearingDialog.tsx';
import { clock } from './palette.ts';
import { useAnimationFrame } from './useBench.ts';
import { num } from '../format.ts';

/** Once per visit: the caution before the first playback, and the consent to go loud. */
const session = { heardCaution: false, loudConfirmed: false };

const LANE_TEXT: Record<LaneId, string> = { a: 'A', b: 'B', ref: 'Reference' };

function Clock({ bench, state }: { bench: BenchAudio; state: BenchState }) {
  const [, tick] = useState(0);
  useAnimationFrame(state.playing, () => tick((n) => (n + 1) % 1e6));
  const t = state.track;
  const now = t ? bench.positionNow() / t.sampleRate : 0;
  return (
    <span class="clock" data-testid="clock">
      <b>{clock(now)}</b> / {clock(t ? t.frames / t.sampleRate : 0)}
    </span>
  );
}

export function Transport(p: { bench: BenchAudio; state: BenchState; store: Store; names: Record<'a' | 'b', string>; full?: boolean }) {
  const { bench, state } = p;
  const [ask, setAsk] = useState<{ kind: 'first' | 'loud'; requestedDb: number } | null>(null);
  const ready = state.status === 'ready' && !!state.track && !!state.levels;

  const play = () => {
    if (!session.heardCaution) {
      setAsk({ kind: 'first', requestedDb: state.monitorDb });
      return;
    }
    void bench.play();
  };
  const toggle = () => (state.playing ? bench.pause() : play());
  const setGain = (db: number) => {
    const d = requestMonitorGain(db, session.loudConfirmed);
    bench.setMonitorDb(d.gainDb);
    if (d.needsConfirmation) setAsk({ kind: 'loud', requestedDb: d.requestedDb });
  };
  const persist = (patch: Partial<{ match: boolean; mode: ListenMode }>) => {
    const cur = p.store.get().settings.bench ?? { match: state.match, mode: state.mode };
    p.store.dispatch({ type: 'settings', patch: { bench: { ...cur, ...patch } } });
  };

  // Keys on the bench screens: space plays or pauses, 1 / 2 / 3 pick A, B, the reference.
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const el = e.target as HTMLElement | null;
      if (el && (el.tagName === 'INPUT' || el.tagName === 'SELECT' || el.tagName === 'TEXTAREA' || el.tagName === 'BUTTON')) return;
      if (document.querySelector('[role=dialog]')) return;
      if (e.key === ' ') toggle();
      else if (e.key === '1') bench.selectLane('a');
      else if (e.key === '2') bench.selectLane('b');
      else if (e.key === '3') bench.selectLane('ref');
      else return;
      e.preventDefault();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  const lanes: LaneId[] = ['a', 'b', 'ref'];
  return (
    <div class={`transport${p.full ? ' transport-full' : ''}`}>
      <div class="transport-main">
        <button
          type="button"
          class="primary play"
          onClick={toggle}
          disabled={!ready}
          aria-label={state.playing ? 'Pause' : 'Play'}
          data-testid="play"
        >
          <span aria-hidden="true" class={state.playing ? 'icon-pause' : 'icon-play'} />
          {state.playing ? 'Pause' : 'Play'}
        </button>
        <Clock bench={bench} state={state} />
        <div class="lanes" role="radiogroup" aria-label="What you hear">
          {lanes.map((l) => (
            <button
              type="button"
              role="radio"
              aria-checked={state.lane === l}
              class={`lane lane-${l}${state.lane === l ? ' on' : ''}`}
              onClick={() => bench.selectLane(l)}
              title={
                l === 'ref'
                  ? 'The ideal flat system at the same calibration and latency (key 3)'
                  : `Design ${LANE_TEXT[l]}: ${p.names[l]} (key ${l === 'a' ? 1 : 2})`
              }
              data-testid={`lane-${l}`}
            >
              <span class={`chip chip-${l === 'ref' ? 'ref' : l}`}>{l === 'ref' ? 'R' : LANE_TEXT[l]}</span>
              <span class="lane-name">{l === 'ref' ? 'Reference (ideal)' : p.names[l]}</span>
            </button>
          ))}
        </div>
        {state.loop && state.track ? (
          <span class="loop-tag" data-testid="loop-tag">
            Loop {clock(state.loop.startFrame / state.track.sampleRate, 2)}–{clock(state.loop.endFrame / state.track.sampleRate, 2)}
            <button type="button" class="ghost small" onClick={() => bench.setLoop(null)}>
              Clear
            </button>
          </span>
        ) : null}
      </div>
      {p.full ? (
        <div class="transport-controls">
          <label class="ctl">
            <span>Listen to</span>
            <select
              value={state.mode}
              data-testid="listen-mode"
              onChange={(e) => {
                const m = (e.currentTarget as HTMLSelectElement).value as ListenMode;
                bench.setMode(m);
                persist({ mode: m });
              }}
            >
              {LISTEN_MODES.map((m) => (
                <option value={m}>{LISTEN_MODE_LABEL[m]}</option>
              ))}
            </select>
          </label>
          <label class="ctl check-ctl">
            <input
              type="checkbox"
              checked={state.match}
              data-testid="match"
              onChange={(e) => {
                const on = (e.currentTarget as HTMLInputElement).checked;
                bench.setMatch(on);
                persist({ match: on });
              }}
            />
            <span>Match levels</span>
            {state.heard ? (
              <span class="fine" data-testid="match-gains">
                A {num(gainToDb(state.heard.gains.a), 2)} dB · B {num(gainToDb(state.heard.gains.b), 2)} dB
              </span>
            ) : null}
          </label>
          <label class="ctl monitor">
            <span>
              Monitor <b data-testid="monitor-db">{state.monitorDb.toFixed(0)} dB</b>
            </span>
            <input
              type="range"
              min={MONITOR_MIN_DB}
              max={MONITOR_MAX_DB}
              step={1}
              value={state.monitorDb}
              aria-label="Monitor gain, dB"
              data-testid="monitor"
              class={state.monitorDb > MONITOR_CONFIRM_ABOVE_DB ? 'loud' : ''}
              onInput={(e) => setGain(Number((e.currentTarget as HTMLInputElement).value))}
            />
          </label>
          {state.lastSwitch ? (
            <span
              class="fine switch-note"
              data-testid="switch-report"
              data-block-frame={state.lastSwitch.blockFrame}
              data-quantum={state.lastSwitch.quantum}
              data-fade-frames={state.lastSwitch.fadeFrames}
              data-worst-ratio={state.lastSwitch.worstRatio}
              data-max-step={state.lastSwitch.maxStep}
              data-allowed-step={state.lastSwitch.allowedStep}
              data-lane={state.lastSwitch.lane}
              title="The worklet checks every switch: it begins on a block boundary and no output step exceeds what the crossfade of the two lanes allows"
            >
              Switched to {LANE_TEXT[state.lastSwitch.lane]} at {clock(state.lastSwitch.blockFrame / (state.sampleRate || 48000), 1)},{' '}
              {((state.lastSwitch.fadeFrames / (state.sampleRate || 48000)) * 1000).toFixed(0)} ms crossfade
              {state.lastSwitch.worstRatio <= 1 ? ', clean' : ', with a step beyond the crossfade'}
            </span>
          ) : null}
          <span
            class={`load${state.struggling ? ' over' : ''}`}
            title="Time the audio engine spends per block, against the block's real time"
            data-testid="load"
          >
            Engine load <b>{state.playing || state.load > 0 ? `${(state.load * 100).toFixed(0)} %` : '—'}</b>
            <span class="load-bar" aria-hidden="true">
              <i style={{ width: `${Math.min(100, (state.load / LOAD_LIMIT) * 100)}%` }} />
            </span>
          </span>
        </div>
      ) : null}
      {ask ? (
        <HearingDialog
          kind={ask.kind}
          requestedDb={ask.requestedDb}
          onYes={() => {
            if (ask.kind === 'first') {
              session.heardCaution = true;
              void bench.play();
            } else {
              session.loudConfirmed = true;
              bench.setMonitorDb(ask.requestedDb);
            }
            setAsk(null);
          }}
          onNo={() => setAsk(null)}
        />
      ) : null}
    </div>
  );
}
