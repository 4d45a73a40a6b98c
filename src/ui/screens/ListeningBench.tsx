// Listening bench: the user's own audio (decoded here, never uploaded) or the built-in demo track,
// played through A, B and the ideal reference with instant switching; levels; offline render and export.
import { VariantSwitch } from '../bench/VariantSwitch.tsx';
import { useRef, useState } from 'preact/hooks';
import type { BenchAudio, BenchState } from '../../audio/bench.ts';
import { MAX_KEPT_TRACK_BYTES } from '../../audio/bench.ts';
import { LISTEN_MODES, LISTEN_MODE_LABEL, type DesignSlot, type ListenMode } from '../../audio/protocol.ts';
import { fullScaleSineSplDb, gainToDb } from '../../audio/levels.ts';
import type { ExportFormat } from '../../audio/wav-export.ts';
import { useApp } from '../context.ts';
import { distinctNames } from '../pair-names.ts';
import { SLOTS, SLOT_LABEL } from '../store.ts';
import { kHz, num } from '../format.ts';
import { useBench } from '../bench/useBench.ts';
import { Transport } from '../bench/Transport.tsx';
import { Overview } from '../bench/Overview.tsx';
import { clock, KIND_LABEL } from '../bench/palette.ts';
import type { DesignDoc } from '../../engine/design/document.ts';
import '../bench/bench.css';

function plannedText(d: DesignDoc): string {
  const l = d.listening;
  const lv = l.level;
  const space = { full: 'free field', half: 'half space', quarter: 'quarter space', eighth: 'eighth space' }[l.space];
  if (!lv) return `default level, ${num(l.distance_m, 3)} m, ${space}`;
  return lv.mode === 'spl'
    ? `${num(lv.spl_db, 3)} dB(C) Leq at ${num(l.distance_m, 3)} m, ${space}`
    : `${num(lv.volts_fs, 3)} V peak at full scale`;
}

/** The rate the track plays at, and the file's own when the browser resampled it. */
function rateText(t: { sampleRate: number; fileSampleRate?: number }): string {
  return t.fileSampleRate && t.fileSampleRate !== t.sampleRate
    ? `${kHz(t.fileSampleRate)} file, played at ${kHz(t.sampleRate)}`
    : kHz(t.sampleRate);
}

function TrackCard(p: { bench: BenchAudio; state: BenchState }) {
  const input = useRef<HTMLInputElement>(null);
  const [over, setOver] = useState(false);
  const t = p.state.track;
  const open = async (file: File | undefined) => {
    if (file) await p.bench.loadFile(file);
  };
  return (
    <div
      class={`bench-card track-card${over ? ' drop' : ''}`}
      onDragOver={(e) => {
        e.preventDefault();
        setOver(true);
      }}
      onDragLeave={() => setOver(false)}
      onDrop={(e) => {
        e.preventDefault();
        setOver(false);
        void open(e.dataTransfer?.files?.[0]);
      }}
      data-testid="drop-zone"
    >
      <div class="track-info">
        <h3>Track</h3>
        {t ? (
          <p class="track-line" data-testid="track-name" data-rate={t.sampleRate} data-file-rate={t.fileSampleRate} data-frames={t.frames}>
            <b>{t.name}</b>
            <span class="fine">
              {clock(t.frames / t.sampleRate)} · {rateText(t)} · {t.channels === 1 ? 'mono' : 'stereo'}
              {t.loudnessLufs !== undefined && Number.isFinite(t.loudnessLufs) ? (
                <span title="Integrated loudness of the file itself (ITU-R BS.1770)">
                  {' '}
                  · {t.loudnessLufs.toFixed(1).replace('-', '\u2212')} LUFS
                </span>
              ) : null}
              {t.droppedChannels ? ` (first 2 of ${t.channels + t.droppedChannels} channels)` : ''}
            </span>
          </p>
        ) : (
          <p class="fine">{p.state.status === 'starting' ? 'Starting the audio engine…' : 'No track yet.'}</p>
        )}
        {t?.kept ? (
          <p class="fine" data-testid="track-kept">
            {t.kept === 'restored'
              ? 'Brought back from your last visit (kept on this device only).'
              : t.kept === 'kept'
                ? `Kept on this device for your next visit (files up to ${MAX_KEPT_TRACK_BYTES / 2 ** 20} MB), with its offline render while the designs stay the same.`
                : `Not kept for your next visit: larger than ${MAX_KEPT_TRACK_BYTES / 2 ** 20} MB.`}
          </p>
        ) : null}
        {t?.truncated ? (
          <p class="fine notice-warn" role="status" data-testid="track-truncated">
            This file ends early: its header announces {clock(t.truncated.statedS)} of audio, but only {clock(t.truncated.presentS)} is in
            the file (a download or copy that was cut off?). The bench plays what was read.
          </p>
        ) : null}
        {p.state.loading ? (
          <p class="fine" aria-live="polite">
            {p.state.loading}
          </p>
        ) : null}
        {p.state.fileError ? (
          <p class="msg error" role="alert" data-testid="file-error">
            {p.state.fileError}
          </p>
        ) : null}
      </div>
      <div class="track-actions">
        <button type="button" onClick={() => input.current?.click()} disabled={p.state.status !== 'ready'}>
          Open audio file…
        </button>
        <button type="button" onClick={() => void p.bench.loadDemo()} disabled={p.state.status !== 'ready' || t?.source === 'demo'}>
          Demo track
        </button>
        <span class="fine drop-hint">or drop a file here · WAV, FLAC, MP3, Ogg, AAC · decoded on this machine, never uploaded</span>
      </div>
      <input
        ref={input}
        type="file"
        accept="audio/*,.wav,.flac,.mp3,.ogg,.oga,.opus,.m4a,.aac"
        class="visually-hidden"
        tabIndex={-1}
        aria-hidden="true"
        data-testid="audio-file"
        onChange={(e) => {
          const el = e.currentTarget as HTMLInputElement;
          const f = el.files?.[0];
          el.value = '';
          void open(f);
        }}
      />
    </div>
  );
}

function LevelsCard(p: { state: BenchState; docs: Record<DesignSlot, DesignDoc> }) {
  const { levels, heard } = p.state;
  return (
    <div class="bench-card">
      <h3>Levels</h3>
      <p class="fine">
        The planned level sets each design's drive and so its physics; the monitor gain above only sets how loud you listen.
      </p>
      <table class="figures bench-table" data-testid="levels">
        <thead>
          <tr>
            <th />
            {SLOTS.map((s) => (
              <th>
                <span class="slot-head">
                  <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span>
                </span>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          <tr>
            <th>Planned level</th>
            {SLOTS.map((s) => (
              <td>{plannedText(p.docs[s])}</td>
            ))}
          </tr>
          <tr>
            <th>Drive for this track</th>
            {SLOTS.map((s) => (
              <td class="n" data-testid={`volts-${s}`}>
                {levels ? `${num(levels[s].voltsFs, 3)} V at full scale` : '—'}
              </td>
            ))}
          </tr>
          <tr>
            <th>Track at the seat</th>
            {SLOTS.map((s) => (
              <td class="n">{levels ? `${num(levels[s].splDb, 3)} dB(C) Leq` : '—'}</td>
            ))}
          </tr>
          <tr>
            <th>Full-scale sine, passband</th>
            {SLOTS.map((s) => (
              <td class="n">{heard ? `${num(fullScaleSineSplDb(heard.passbandPa[s]), 3)} dB SPL` : '—'}</td>
            ))}
          </tr>
          <tr>
            <th>Heard with</th>
            {SLOTS.map((s) => (
              <td class="n">{heard ? `${num(gainToDb(heard.gains[s]), 2)} dB${p.state.match ? ' (matched)' : ''}` : '—'}</td>
            ))}
          </tr>
        </tbody>
      </table>
    </div>
  );
}

export function OfflineProgress(p: { bench: BenchAudio; state: BenchState }) {
  const o = p.state.offline;
  if (o.status !== 'running')
    return o.message ? (
      <p class="fine" aria-live="polite" data-testid="offline-message">
        {o.message}
      </p>
    ) : null;
  return (
    <div class="progress-row">
      <span class="fine">{o.job === 'export' ? 'Exporting…' : 'Rendering A and B…'}</span>
      <progress max={1} value={o.progress} data-testid="offline-progress" aria-label="Offline progress" />
      <span class="fine">{Math.round(o.progress * 100)} %</span>
      <button type="button" class="small" onClick={() => p.bench.cancelOffline()} data-testid="offline-cancel">
        Cancel
      </button>
    </div>
  );
}

function OfflineCard(p: { bench: BenchAudio; state: BenchState }) {
  const o = p.state.offline;
  const [slot, setSlot] = useState<DesignSlot>('a');
  const [mode, setMode] = useState<ListenMode>('nonlinear');
  const [format, setFormat] = useState<ExportFormat>('16');
  const fresh = p.bench.offlineFresh();
  const r = o.results;
  const busy = o.status === 'running';
  const can = !!p.state.track && !!p.state.levels && p.state.designsMissing.length === 0;
  const rows: { label: string; get: (s: DesignSlot) => string }[] = r
    ? [
        { label: 'Peak excursion', get: (s) => `${num(r[s].summary.peak_excursion_mm, 3)} mm` },
        { label: 'Peak coil temperature', get: (s) => `${num(r[s].summary.peak_coil_temp_c, 3)} °C` },
        {
          label: 'Peak port air speed',
          get: (s) => (r[s].summary.peak_port_speed_m_s === null ? 'no port' : `${num(r[s].summary.peak_port_speed_m_s, 3)} m/s`),
        },
        { label: 'Most compression', get: (s) => `${num(r[s].summary.max_compression_db, 2)} dB` },
        { label: 'Amplifier clipping', get: (s) => `${num(r[s].summary.amp_clip_s, 3)} s` },
        { label: 'Stress events', get: (s) => String(r[s].summary.events.length) },
        {
          label: 'First limit',
          get: (s) => {
            const e = r[s].summary.events[0];
            return e ? `${KIND_LABEL[e.kind]} at ${clock(e.start_s, 2)}` : 'none';
          },
        },
        { label: 'Rendered at', get: (s) => `${num(r[s].summary.realtime_factor, 3)}× real time` },
      ]
    : [];
  return (
    <div class="bench-card offline-card">
      <h3>Offline render</h3>
      <p class="fine">
        Renders the whole track through both designs in the background, at their planned levels: every stress event, the traces, and WAV
        files to keep.
      </p>
      <div class="inline">
        <button
          type="button"
          class="primary"
          onClick={() => void p.bench.renderOffline()}
          disabled={!can || busy}
          data-testid="render-offline"
        >
          {r && !fresh ? 'Render again (designs changed)' : 'Render A and B offline'}
        </button>
      </div>
      <OfflineProgress bench={p.bench} state={p.state} />
      {r ? (
        <table
          class={`figures bench-table${fresh ? '' : ' stale'}`}
          data-testid="offline-results"
          data-threads={Math.max(r.a.threads ?? 1, r.b.threads ?? 1)}
        >
          <thead>
            <tr>
              <th />
              {SLOTS.map((s) => (
                <th>
                  <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr>
                <th>{row.label}</th>
                {SLOTS.map((s) => (
                  <td class="n" data-testid={row.label === 'Stress events' ? `events-${s}` : undefined}>
                    {row.get(s)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
      <div class="export-row">
        <label class="ctl">
          <span>Export</span>
          <select
            value={slot}
            onChange={(e) => setSlot((e.currentTarget as HTMLSelectElement).value as DesignSlot)}
            aria-label="Design to export"
            data-testid="export-slot"
          >
            {SLOTS.map((s) => (
              <option value={s}>Design {SLOT_LABEL[s]}</option>
            ))}
          </select>
        </label>
        <label class="ctl">
          <span>as</span>
          <select
            value={mode}
            onChange={(e) => setMode((e.currentTarget as HTMLSelectElement).value as ListenMode)}
            aria-label="Stream to export"
            data-testid="export-mode"
          >
            {LISTEN_MODES.map((m) => (
              <option value={m}>{LISTEN_MODE_LABEL[m]}</option>
            ))}
          </select>
        </label>
        <label class="ctl">
          <span>in</span>
          <select
            value={format}
            onChange={(e) => setFormat((e.currentTarget as HTMLSelectElement).value as ExportFormat)}
            aria-label="Sample format"
            data-testid="export-format"
          >
            <option value="16">16-bit PCM</option>
            <option value="f32">32-bit float</option>
          </select>
        </label>
        <button type="button" onClick={() => void p.bench.exportWav(slot, mode, format)} disabled={!can || busy} data-testid="export-wav">
          Export WAV
        </button>
      </div>
    </div>
  );
}

export function BenchNotices(p: { bench: BenchAudio; state: BenchState }) {
  const s = p.state;
  return (
    <>
      {s.status === 'unsupported' || s.status === 'error' ? (
        <p class="banner banner-warn" role="alert">
          {s.message}
        </p>
      ) : s.message ? (
        <p class="msg warning" role="status" data-testid="bench-message">
          {s.message}
        </p>
      ) : null}
      {s.designsMissing.length ? (
        <p class="msg warning" role="status">
          Design {s.designsMissing.map((d) => SLOT_LABEL[d]).join(' and ')} has errors: its last valid version is heard until they are
          fixed.
        </p>
      ) : null}
      {s.struggling ? (
        <div class="banner banner-warn" role="alert" data-testid="struggling">
          This machine is not keeping up with live rendering (engine load {(s.load * 100).toFixed(0)} %
          {s.lateBlocks ? `, ${s.lateBlocks} late blocks` : ''}): you may hear dropouts that are not in the design.
          <button type="button" class="small" onClick={() => void p.bench.renderOffline()}>
            Render offline instead
          </button>
        </div>
      ) : null}
    </>
  );
}

export function ListeningBench(_p: { theme: string }) {
  const { state: app, store } = useApp();
  const { bench, state } = useBench(store);
  const [nameA, nameB] = distinctNames([app.designs.a.name, app.designs.b.name]);
  const names = { a: nameA, b: nameB };
  return (
    <section class="sheet bench" aria-labelledby="bench-title" data-testid="bench">
      <h2 id="bench-title">Listening bench</h2>
      <p class="sheet-intro">
        Hear a track through design A, design B and the ideal flat reference, side by side and sample-synchronous: switching is instant,
        through a 5 ms crossfade. Keys: space plays, 1 / 2 / 3 pick A, B, reference.
      </p>
      <BenchNotices bench={bench} state={state} />
      <TrackCard bench={bench} state={state} />
      <div class="bench-card player">
        <Transport bench={bench} state={state} store={store} names={names} full />
        <VariantSwitch bench={bench} state={state} store={store} project={app.project} />
        <Overview bench={bench} state={state} theme={_p.theme} height={84} />
        <p class="fine overview-hint">Click the waveform to jump, drag across it to loop a passage.</p>
      </div>
      <div class="bench-cols">
        <LevelsCard state={state} docs={app.designs} />
        <OfflineCard bench={bench} state={state} />
      </div>
    </section>
  );
}
