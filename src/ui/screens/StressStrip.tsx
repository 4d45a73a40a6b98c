// Stress strip: where in the track, and why, each design overloads. One lane of stress events per
// way of each design under the waveform (the kinds told apart by colour), a legend, hover for cause / peak / limit, click to jump there and
// listen, drag to loop, and the engine's traces following the playhead.
import { useEffect, useMemo, useState } from 'preact/hooks';
import type { StressEvent, EventKind } from '../../engine/render/index.ts';
import { EVENT_KINDS } from '../../engine/render/index.ts';
import type { DesignSlot } from '../../audio/protocol.ts';
import { useApp } from '../context.ts';
import { SLOTS, SLOT_LABEL } from '../store.ts';
import { num } from '../format.ts';
import { useBench } from '../bench/useBench.ts';
import { Transport } from '../bench/Transport.tsx';
import { Overview } from '../bench/Overview.tsx';
import { TraceCharts } from '../bench/TraceChart.tsx';
import { clock, colourOf, KIND_LABEL, KIND_MEANING } from '../bench/palette.ts';
import { BenchNotices, OfflineProgress } from './ListeningBench.tsx';
import { eventLanes, wayOfEvent } from '../bench/event-lanes.ts';
import { summarizeEvents } from '../bench/event-summary.ts';
import { binWidth, densityLane } from '../bench/event-density.ts';
import { plural } from '../format.ts';
import '../bench/bench.css';

/** Most bins a density lane draws (1 s each up to this many seconds of track). */
const DENSITY_BINS = 600;
/** Tracks up to this long are rendered offline by themselves when the strip opens, s. */
const AUTO_RENDER_S = 180;
const LIST_LIMIT = 60;

export function StressStrip({ theme }: { theme: string }) {
  const { state: app, store, derived } = useApp();
  const { bench, state } = useBench(store);
  const names = { a: app.designs.a.name, b: app.designs.b.name };
  const systems = { a: derived.a.parse.ok ? derived.a.parse.system : null, b: derived.b.parse.ok ? derived.b.parse.system : null };
  const fresh = bench.offlineFresh();
  const o = state.offline;
  const events: Record<DesignSlot, StressEvent[]> =
    fresh && o.results ? { a: o.results.a.summary.events, b: o.results.b.summary.events } : state.liveEvents;
  const dur = state.track ? state.track.frames / state.track.sampleRate : 0;
  // The ways that can be stressed: each design's driver ways, the first one first (events that name
  // no way are the first driver way's).
  const wayNames = (s: DesignSlot) => app.designs[s].ways.filter((w) => w.kind === 'driver').map((w) => w.name);
  const wa = wayNames('a').join('\u0000');
  const wb = wayNames('b').join('\u0000');
  const lanes = useMemo(() => eventLanes(events, { a: wayNames('a'), b: wayNames('b') }), [events, wa, wb]);
  const density = useMemo(() => {
    if (!dur || !(events.a.length + events.b.length)) return null;
    const binS = binWidth(dur, DENSITY_BINS);
    return SLOTS.map((s) => densityLane(s, events[s], dur, binS));
  }, [events, dur]);
  const firstWay = (s: DesignSlot) => wayNames(s)[0] ?? '';
  const multiWay = wayNames('a').length > 1 || wayNames('b').length > 1;

  // A short track is rendered offline as soon as the strip opens, and again after design edits.
  useEffect(() => {
    if (!state.track || !state.levels || fresh || o.status === 'running' || o.status === 'error' || o.status === 'cancelled') return;
    if (dur > AUTO_RENDER_S || state.designsMissing.length) return;
    const id = setTimeout(() => void bench.renderOffline(), 500);
    return () => clearTimeout(id);
  }, [state.track, state.levels, fresh, o.status, systems.a, systems.b]);

  const kinds = useMemo(() => {
    const present = new Set<EventKind>();
    for (const s of SLOTS) for (const e of events[s]) present.add(e.kind);
    return present;
  }, [events]);
  // Kinds the user has hidden from the list (the summary always counts every kind).
  const [hidden, setHidden] = useState<ReadonlySet<EventKind>>(new Set());
  const shown = useMemo(() => SLOTS.flatMap((s) => events[s].filter((e) => !hidden.has(e.kind)).map((e) => ({ s, e }))), [events, hidden]);
  const list = useMemo(() => [...shown].sort((x, y) => x.e.start_s - y.e.start_s).slice(0, LIST_LIMIT), [shown]);
  const groups = useMemo(() => summarizeEvents(events, firstWay), [events, wa, wb]);
  const hear = (s: DesignSlot, e: StressEvent) => (bench.seek(Math.max(0, e.start_s - 0.5)), bench.selectLane(s));
  const total = events.a.length + events.b.length;
  const source = fresh ? 'offline render of the whole track' : state.playing || total ? 'live listening so far' : null;

  return (
    <section class="sheet strip" aria-labelledby="strip-title" data-testid="strip">
      <div class="strip-head">
        <div>
          <h2 id="strip-title">Stress strip</h2>
          <p class="sheet-intro">
            Where each design runs out of travel, heat, port or amplifier on this track, at its planned level. Hover a mark for its cause,
            click it to hear that moment. The lowest lanes show how much of each second each design spends in each kind of event.
          </p>
        </div>
        <div class="strip-render">
          <button
            type="button"
            onClick={() => void bench.renderOffline()}
            disabled={!state.track || !state.levels || o.status === 'running' || state.designsMissing.length > 0}
            data-testid="strip-render"
          >
            {fresh ? 'Render again' : 'Render offline'}
          </button>
          <OfflineProgress bench={bench} state={state} />
        </div>
      </div>
      <BenchNotices bench={bench} state={state} />
      <div class="bench-card player">
        <Transport bench={bench} state={state} store={store} names={names} />
        <Overview bench={bench} state={state} theme={theme} height={76} events={lanes} density={density} names={names} />
        <div class="strip-foot">
          <span class="fine" data-testid="strip-source">
            {source ? `Events from the ${source}.` : 'No events yet: play the track or render it offline.'}
            {state.track ? ` ${state.track.name}, ${clock(dur)}.` : ''}
          </span>
          <ul class="legend" aria-label="Legend of stress events">
            {EVENT_KINDS.filter((k) => k !== 'radiator-excursion' || kinds.has(k)).map((k) => (
              <li class={kinds.has(k) ? 'on' : ''} title={KIND_MEANING[k]}>
                <i style={{ background: colourOf(k, theme) }} />
                {KIND_LABEL[k]}
              </li>
            ))}
          </ul>
        </div>
      </div>
      <div class="bench-card">
        <TraceCharts bench={bench} state={state} theme={theme} systems={systems} />
      </div>
      <div class="bench-card">
        <h3>
          Events{' '}
          <span class="fine">
            {total
              ? `${plural(events.a.length, 'event')} in A, ${events.b.length} in B${shown.length > LIST_LIMIT ? `; the first ${LIST_LIMIT} of the ${shown.length} chosen below are listed` : ''}`
              : 'none so far'}
          </span>
        </h3>
        {groups.length ? (
          <table class="figures bench-table events-summary" data-testid="event-summary">
            <caption class="visually-hidden">Events per design, kind and way, with the worst of each</caption>
            <thead>
              <tr>
                <th scope="col">Design</th>
                {multiWay ? <th scope="col">Way</th> : null}
                <th scope="col">What</th>
                <th scope="col" class="n">
                  How many
                </th>
                <th scope="col" class="n">
                  Time in it
                </th>
                <th scope="col" class="n">
                  Worst
                </th>
                <th scope="col">
                  <span class="visually-hidden">Hear the worst</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {groups.map((g) => (
                <tr data-kind={g.kind} data-slot={g.slot} data-count={g.count}>
                  <td>
                    <span class={`chip chip-${g.slot}`}>{SLOT_LABEL[g.slot]}</span>
                  </td>
                  {multiWay ? <td>{g.way}</td> : null}
                  <td>
                    <i class="swatch" style={{ background: colourOf(g.kind, theme) }} /> {KIND_LABEL[g.kind]}
                  </td>
                  <td class="n">{g.count}</td>
                  <td class="n">{num(g.seconds, 3)} s</td>
                  <td class="n">
                    {num(g.worst.peak, 3)} {g.worst.unit} at {clock(g.worst.start_s, 1)}
                  </td>
                  <td>
                    <button
                      type="button"
                      class="small"
                      onClick={() => hear(g.slot, g.worst)}
                      aria-label={`Hear the worst: ${KIND_LABEL[g.kind]} in design ${SLOT_LABEL[g.slot]} at ${clock(g.worst.start_s, 2)}`}
                    >
                      Hear the worst
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : null}
        {kinds.size > 1 ? (
          <fieldset class="kind-filter" data-testid="kind-filter">
            <legend>List these kinds</legend>
            {EVENT_KINDS.filter((k) => kinds.has(k)).map((k) => (
              <label class="check">
                <input
                  type="checkbox"
                  checked={!hidden.has(k)}
                  onChange={(e) => {
                    const next = new Set(hidden);
                    if ((e.currentTarget as HTMLInputElement).checked) next.delete(k);
                    else next.add(k);
                    setHidden(next);
                  }}
                />{' '}
                {KIND_LABEL[k]}
              </label>
            ))}
          </fieldset>
        ) : null}
        {list.length ? (
          <table class="figures bench-table events-table" data-testid="event-list">
            <thead>
              <tr>
                <th>Design</th>
                {multiWay ? <th>Way</th> : null}
                <th>What</th>
                <th class="n">At</th>
                <th class="n">For</th>
                <th class="n">Peak</th>
                <th class="n">Limit</th>
                <th />
              </tr>
            </thead>
            <tbody>
              {list.map(({ s, e }) => (
                <tr data-kind={e.kind} data-slot={s} data-way={wayOfEvent(e, firstWay(s))} data-start={e.start_s}>
                  <td>
                    <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span>
                  </td>
                  {multiWay ? <td>{wayOfEvent(e, firstWay(s))}</td> : null}
                  <td>
                    <i class="swatch" style={{ background: colourOf(e.kind, theme) }} /> {KIND_LABEL[e.kind]}
                  </td>
                  <td class="n">{clock(e.start_s, 2)}</td>
                  <td class="n">
                    {e.end_s - e.start_s < 1
                      ? `${Math.max(1, Math.round((e.end_s - e.start_s) * 1000))} ms`
                      : `${num(e.end_s - e.start_s, 3)} s`}
                  </td>
                  <td class="n">
                    {num(e.peak, 3)} {e.unit}
                  </td>
                  <td class="n">
                    {num(e.limit, 3)} {e.unit}
                  </td>
                  <td>
                    <button
                      type="button"
                      class="small"
                      onClick={() => hear(s, e)}
                      aria-label={`Hear it: ${KIND_LABEL[e.kind]} in design ${SLOT_LABEL[s]} at ${clock(e.start_s, 2)}`}
                    >
                      Hear it
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : (
          <p class="fine">{fresh ? 'Neither design meets a limit on this track at its planned level.' : 'Nothing yet.'}</p>
        )}
      </div>
    </section>
  );
}
