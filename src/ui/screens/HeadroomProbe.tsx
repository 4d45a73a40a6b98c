// Headroom probe: for each design and the loaded track, the highest planned level with no stress
// event and the limit that arrives first, in dB SPL at the seat and in volts, with the time it bites.
import { benchAudio } from '../../audio/bench.ts';
import { LIMIT_WORDS, clock } from '../../engine/verdict/verdict.ts';
import { useApp } from '../context.ts';
import { fixed, num } from '../format.ts';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';
import { useBench, useProbe, useSystems, useVerdict } from '../sheet/hooks.ts';
import { currentTrack, currentTrackKey, DEMO_RATE, headroomProbe } from '../sheet/probe.ts';

/** Length of the built-in demo track, s (16 bars at 120 BPM). */
const DEMO_S = 32;

export function HeadroomProbe() {
  const { state } = useApp();
  const probe = useProbe();
  const bench = useBench();
  const systems = useSystems();
  const runner = headroomProbe();
  const v = useVerdict();
  const running = probe.status === 'running';
  const ready = !!systems.a && !!systems.b;
  const trackName = bench.track?.name ?? 'Demo track (built in)';
  const trackS = bench.track ? bench.track.frames / bench.track.sampleRate : null;
  const stale =
    probe.status === 'done' && (probe.systems?.a !== systems.a || probe.systems?.b !== systems.b || probe.track?.key !== currentTrackKey());
  const pct = Math.round(runner.progress() * 100);
  const start = async () => {
    if (!systems.a || !systems.b) return;
    // Measure what the bench plays (its demo or the user's file), so the finding holds for the
    // presentation too; without Web Audio the built-in demo track is used.
    await benchAudio().start();
    runner.start({ a: systems.a, b: systems.b }, currentTrack());
  };
  const headroomLine = v?.lines.find((l) => l.id === 'headroom');

  return (
    <section class="sheet probe" aria-labelledby="probe-h">
      <h2 id="probe-h">Headroom probe</h2>
      <p class="sheet-intro">
        For each design, the loudest level at which it plays this track with no stress event at all — cone travel, the suspension limit,
        coil heat, port air speed, amplifier clipping, power compression or distortion — and the limit that arrives first just above it.
        Each level is a full render of the track; the search narrows to 0.25 dB.
      </p>
      <div class="probe-bar">
        <span class="probe-track" data-testid="probe-track" data-rate={bench.track?.sampleRate ?? DEMO_RATE}>
          Track: <strong>{trackName}</strong>
          {` (${clock(Math.round(trackS ?? DEMO_S))}, ${fixed((bench.track?.sampleRate ?? DEMO_RATE) / 1000, 1)} kHz)`}
          {bench.track ? '' : ' — load your own on the Listening bench.'}
        </span>
        {running ? (
          <button type="button" onClick={() => runner.cancel()}>
            Cancel
          </button>
        ) : (
          <button type="button" class="primary" disabled={!ready} onClick={() => void start()} data-testid="probe-run">
            {probe.status === 'done' ? 'Search again' : 'Find the headroom'}
          </button>
        )}
      </div>
      {running ? (
        <div class="probe-progress" role="status" aria-live="polite">
          <progress max={100} value={pct} data-testid="probe-progress" />
          <span>
            {SLOTS.map(
              (s) => `${SLOT_LABEL[s]}: ${num(probe.slots[s].passes, 2)} of about ${probe.slots[s].estimate} runs through the track`,
            ).join(' · ')}
          </span>
        </div>
      ) : null}
      {probe.status === 'cancelled' ? <p class="fine">Cancelled; nothing was kept.</p> : null}
      {SLOTS.some((s) => probe.slots[s].status === 'error') ? (
        <p class="msg error" role="alert">
          {SLOTS.filter((s) => probe.slots[s].status === 'error')
            .map((s) => `Design ${SLOT_LABEL[s]}: ${probe.slots[s].message}`)
            .join(' ')}
        </p>
      ) : null}
      {probe.status === 'done' || probe.status === 'error' ? (
        <>
          {stale ? (
            <p class="banner-inline">The designs or the track changed since this search: search again for current numbers.</p>
          ) : null}
          <table
            class="figures probe-table"
            data-testid="probe-results"
            data-threads={Math.max(...SLOTS.map((s) => probe.slots[s].result?.threads ?? 1))}
            data-exact={JSON.stringify(
              SLOTS.map((s) => {
                const r = probe.slots[s].result;
                return (
                  r && {
                    clean_volts: r.clean_volts,
                    clean_spl_db: r.clean_spl_db,
                    first_limit: r.first_limit,
                    first_limit_s: r.first_limit_s,
                    first_limit_way: r.first_limit_way ?? null,
                  }
                );
              }),
            )}
          >
            <caption>
              On “{probe.track?.name}”,{' '}
              {probe.restored
                ? 'kept from your last visit (same designs, same track)'
                : `searched in ${fixed(probe.elapsedMs / 1000, 1)} s`}
            </caption>
            <thead>
              <tr>
                <th scope="col">Finding</th>
                {SLOTS.map((s) => (
                  <th scope="col" class="n">
                    <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span> <span class="th-name">{state.designs[s].name}</span>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              <ResultRow
                label="Clean up to, at the seat (Leq, C-weighted)"
                id="spl"
                cell={(s) => withUnit(probe.slots[s].result?.clean_spl_db, 1, 'dB SPL')}
              />
              <ResultRow
                label="Amplifier drive (peak volts at digital full scale)"
                id="volts"
                cell={(s) => withUnit(probe.slots[s].result?.clean_volts, 1, 'V')}
              />
              <ResultRow
                label="Against the planned level"
                id="margin"
                cell={(s) => {
                  const r = probe.slots[s].result;
                  const lv = probe.systems?.[s].listening.level;
                  if (!r || !lv || lv.mode !== 'spl') return '—';
                  const d = r.clean_spl_db - lv.splDb;
                  return `${fixed(Math.abs(d), 1)} dB ${d >= 0 ? 'above' : 'below'} the planned ${fixed(lv.splDb, 0)} dB`;
                }}
              />
              <ResultRow label="First limit above it" id="limit" cell={(s) => limitText(probe.slots[s].result?.first_limit)} />
              <ResultRow
                label="Where it first bites"
                id="time"
                cell={(s) => {
                  const t = probe.slots[s].result?.first_limit_s;
                  return t === null || t === undefined ? '—' : `${clock(t)} (${fixed(t, 2)} s)`;
                }}
              />
              <ResultRow label="Renders" id="renders" cell={(s) => String(probe.slots[s].result?.renders ?? '—')} />
            </tbody>
          </table>
          {headroomLine && !stale ? (
            <p class="verdict-line" data-testid="probe-verdict">
              {headroomLine.text}
            </p>
          ) : null}
        </>
      ) : null}
      <p class="fine">
        A model estimate: real drivers can fail earlier than modelled, so treat these levels as limits, not targets. The clean level is the
        track's long-term average at the seat; its peaks are far higher.
      </p>
    </section>
  );
}

function withUnit(v: number | null | undefined, decimals: number, unit: string): string {
  return v === null || v === undefined ? '—' : `${fixed(v, decimals)} ${unit}`;
}

function limitText(kind: string | null | undefined): string {
  if (kind === undefined) return '—';
  if (kind === null) return 'none reached in the search range';
  return LIMIT_WORDS[kind] ?? kind;
}

function ResultRow(p: { label: string; id: string; cell: (s: Slot) => string }) {
  return (
    <tr>
      <th scope="row">{p.label}</th>
      {SLOTS.map((s) => (
        <td class="n" data-testid={`probe-${s}-${p.id}`}>
          {p.cell(s)}
        </td>
      ))}
    </tr>
  );
}
