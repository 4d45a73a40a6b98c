// Presentation mode: for showing a client on a laptop or a tablet. Large type, only A / B / the
// reference, the level and the verdict; Esc or the button in the corner leads back out.
import { useEffect, useState } from 'preact/hooks';
import { MONITOR_CONFIRM_ABOVE_DB, MONITOR_MIN_DB, requestMonitorGain } from '../../audio/levels.ts';
import type { LaneId } from '../../audio/lanes.ts';
import { useApp } from '../context.ts';
import { fixed } from '../format.ts';
import type { ScreenId } from '../store.ts';
import { useBench } from '../bench/useBench.ts';
import { useVerdict } from '../sheet/hooks.ts';
import { DEFAULT_SHEET_TITLE } from './ClientSheet.tsx';

const LANES: { id: LaneId; key: string; label: string }[] = [
  { id: 'a', key: '1', label: 'A' },
  { id: 'b', key: '2', label: 'B' },
  { id: 'ref', key: '3', label: 'Reference' },
];
const STEP_DB = 3;
/** Where Presentation mode leads back to: the Client sheet it is shown beside. */
const BACK: ScreenId = 'sheet';

let loudConfirmed = false;

export function Presentation() {
  const { state, derived, dispatch, store } = useApp();
  const { bench: audio, state: bench } = useBench(store);
  const v = useVerdict();
  const [askLoud, setAskLoud] = useState<number | null>(null);
  const leave = () => dispatch({ type: 'settings', patch: { screen: BACK } });
  const choose = (lane: LaneId) => {
    audio.selectLane(lane);
    if (!bench.playing) void audio.play();
  };
  const louder = (by: number) => {
    const d = requestMonitorGain(bench.monitorDb + by, loudConfirmed);
    if (d.needsConfirmation) setAskLoud(d.requestedDb);
    audio.setMonitorDb(d.gainDb);
  };

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const t = e.target as HTMLElement | null;
      if (t && (t.tagName === 'INPUT' || t.tagName === 'TEXTAREA' || t.tagName === 'SELECT')) return;
      if (e.key === 'Escape') leave();
      else if (e.key === ' ') bench.playing ? audio.pause() : void audio.play();
      else {
        const lane = LANES.find(
          (l) => l.key === e.key || l.label.toLowerCase() === e.key.toLowerCase() || (l.id === 'ref' && e.key.toLowerCase() === 'r'),
        );
        if (!lane) return;
        choose(lane.id);
      }
      e.preventDefault();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [bench.playing]);

  const name = (id: LaneId) => (id === 'ref' ? 'the ideal speaker: no box, no limits' : state.designs[id].name);
  const level = (id: 'a' | 'b') => {
    const lv = derived[id].system?.listening.level;
    if (!lv) return '—';
    return lv.mode === 'spl' ? `${fixed(lv.splDb, 0)} dB at the seat` : `${fixed(lv.voltsFs, 1)} V at full scale`;
  };
  const starting = bench.status === 'starting';
  const title = state.settings.sheetTitle?.trim() || DEFAULT_SHEET_TITLE;

  return (
    <div class="present" role="dialog" aria-modal="true" aria-labelledby="present-h" data-testid="presentation">
      <header class="present-top">
        <h1 id="present-h">{title}</h1>
        <button type="button" class="present-leave" onClick={leave} data-testid="present-leave">
          Leave presentation <kbd>Esc</kbd>
        </button>
      </header>
      <div class="present-lanes" role="group" aria-label="What you hear">
        {LANES.map((l) => (
          <button
            type="button"
            class={`present-lane lane-${l.id}${bench.lane === l.id && bench.playing ? ' on' : ''}`}
            aria-pressed={bench.lane === l.id}
            onClick={() => choose(l.id)}
            data-testid={`present-${l.id}`}
          >
            <span class="present-lane-label">{l.label}</span>
            <span class="present-lane-name">{name(l.id)}</span>
            <kbd>{l.key}</kbd>
          </button>
        ))}
      </div>
      <div class="present-transport">
        <button
          type="button"
          class="present-play"
          onClick={() => (bench.playing ? audio.pause() : void audio.play())}
          disabled={starting}
          data-testid="present-play"
        >
          {starting ? 'Starting…' : bench.playing ? 'Pause' : 'Play'}
        </button>
        <span class="present-track">{bench.track ? bench.track.name : 'Demo track (built in)'}</span>
      </div>
      {bench.status === 'unsupported' || bench.status === 'error' ? (
        <p class="present-ask" role="alert">
          {bench.message}
        </p>
      ) : null}
      <div class="present-level" data-testid="present-level">
        <span>
          Planned level: {(['a', 'b'] as const).map((s, i) => `${i ? ' · ' : ''}${s.toUpperCase()} ${level(s)}`).join('')}
          {bench.match ? ' · A and B matched in loudness' : ''}
        </span>
        <span class="present-monitor">
          Listening volume {fixed(bench.monitorDb, 0)} dB
          <button type="button" onClick={() => louder(-STEP_DB)} disabled={bench.monitorDb <= MONITOR_MIN_DB} aria-label="Quieter">
            −
          </button>
          <button type="button" onClick={() => louder(STEP_DB)} aria-label="Louder">
            +
          </button>
        </span>
      </div>
      {askLoud !== null ? (
        <div class="present-ask" role="alertdialog" aria-label="Louder than the caution level">
          <span>Above {MONITOR_CONFIRM_ABOVE_DB} dB the sound can be loud enough to harm hearing. Play louder?</span>
          <button
            type="button"
            onClick={() => {
              loudConfirmed = true;
              audio.setMonitorDb(requestMonitorGain(askLoud, true).gainDb);
              setAskLoud(null);
            }}
          >
            Yes, louder
          </button>
          <button type="button" class="primary" onClick={() => setAskLoud(null)}>
            Keep it here
          </button>
        </div>
      ) : null}
      <section class="present-verdict" aria-label="In plain words" data-testid="present-verdict">
        {v ? (
          <ul>
            {v.lines.map((l) => (
              <li data-line={l.id}>{l.text}</li>
            ))}
          </ul>
        ) : (
          <p>A design has errors, so no comparison is shown.</p>
        )}
      </section>
      <p class="present-fine">Model estimates, heard through your own speakers or headphones. Keep the volume comfortable.</p>
    </div>
  );
}
