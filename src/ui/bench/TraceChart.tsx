// Small charts of the engine's traces around the playhead (uPlot): cone excursion against Xmax,
// coil temperature against its rating, port air speed against its limit, compression against 1 dB.
// From the offline render when it is current, otherwise from the live meters while playing.
import { useEffect, useLayoutEffect, useRef, useState } from 'preact/hooks';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { BenchAudio, BenchState } from '../../audio/bench.ts';
import type { SpeakerSystem } from '../../engine/system.ts';
import { readPalette } from '../charts/Chart.tsx';
import { clock } from './palette.ts';
import { num } from '../format.ts';
import { PORT_SPEED_LIMIT } from '../engine.ts';
import { firstDriverOf } from '../ways.ts';

type Metric = 'excursion' | 'coil' | 'port' | 'compression';
const METRICS: { id: Metric; title: string; unit: string; digits: number }[] = [
  { id: 'excursion', title: 'Cone excursion, peak', unit: 'mm', digits: 3 },
  { id: 'coil', title: 'Coil temperature', unit: '°C', digits: 3 },
  { id: 'port', title: 'Port air speed, peak', unit: 'm/s', digits: 3 },
  { id: 'compression', title: 'Power compression', unit: 'dB', digits: 2 },
];
/** Seconds shown either side of the playhead. */
const HALF_WINDOW_S = 3;
const REFRESH_MS = 100;

/** The traces are the first driver way's (the woofer's): its limits are drawn. */
function limitOf(m: Metric, s: SpeakerSystem | null): number | null {
  const w = s ? firstDriverOf(s) : null;
  if (!w) return null;
  if (m === 'excursion') return w.unit.xmax * 1000;
  if (m === 'coil') return w.unit.thermal.coilMaxC;
  if (m === 'port') return w.box.type === 'vented' ? PORT_SPEED_LIMIT : null;
  return 1;
}

const vented = (s: SpeakerSystem | null) => (s ? firstDriverOf(s)?.box.type === 'vented' : false);

interface Window {
  t: number[];
  a: (number | null)[][];
  b: (number | null)[][];
}

/** The points of each metric within [t0, t1], from the offline traces or the live history. */
function windowed(bench: BenchAudio, state: BenchState, t0: number, t1: number): Window {
  const out: Window = { t: [], a: METRICS.map(() => []), b: METRICS.map(() => []) };
  const r = bench.offlineFresh() ? state.offline.results : null;
  if (r) {
    const hz = r.a.traces.hz;
    const i0 = Math.max(0, Math.floor(t0 * hz)),
      i1 = Math.min(r.a.traces.excursionMm.length - 1, Math.ceil(t1 * hz));
    for (let i = i0; i <= i1; i++) {
      out.t.push(i / hz);
      for (const slot of ['a', 'b'] as const) {
        const tr = r[slot].traces;
        const arr = out[slot];
        arr[0].push(tr.excursionMm[i] ?? null);
        arr[1].push(tr.coilTempC[i] ?? null);
        arr[2].push(tr.portSpeed[i] ?? null);
        arr[3].push(tr.compressionDb[i] ?? null);
      }
    }
    return out;
  }
  for (const p of state.history) {
    if (p.t < t0 || p.t > t1) continue;
    if (out.t.length && p.t <= out.t[out.t.length - 1]) continue;
    out.t.push(p.t);
    for (const slot of ['a', 'b'] as const) {
      const m = p[slot];
      const arr = out[slot];
      arr[0].push(m ? m.excursionMm : null);
      arr[1].push(m ? m.coilTempC : null);
      arr[2].push(m ? m.portSpeed : null);
      arr[3].push(m ? m.compressionDb : null);
    }
  }
  return out;
}

export function TraceCharts(p: { bench: BenchAudio; state: BenchState; theme: string; systems: Record<'a' | 'b', SpeakerSystem | null> }) {
  const host = useRef<HTMLDivElement>(null);
  const plots = useRef<uPlot[]>([]);
  const [width, setWidth] = useState(600);
  const stateRef = useRef(p.state);
  stateRef.current = p.state;
  const anyVented = vented(p.systems.a) || vented(p.systems.b);
  const shown = METRICS.filter((m) => m.id !== 'port' || anyVented);

  useLayoutEffect(() => {
    const el = host.current;
    if (!el) return;
    const ro = new ResizeObserver(() => setWidth(Math.max(280, Math.floor(el.clientWidth))));
    ro.observe(el);
    return () => ro.disconnect();
  }, []);

  useEffect(() => {
    const el = host.current;
    if (!el) return;
    const pal = readPalette(el);
    const cols = width > 900 ? 2 : 1;
    const w = Math.floor((width - (cols - 1) * 14) / cols) - 2;
    const font = '11.5px system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';
    for (const u of plots.current) u.destroy();
    plots.current = [];
    const boxes = el.querySelectorAll<HTMLElement>('.trace-plot');
    shown.forEach((m, i) => {
      const limA = limitOf(m.id, p.systems.a),
        limB = limitOf(m.id, p.systems.b);
      const opts: uPlot.Options = {
        width: w,
        height: 128,
        pxAlign: false,
        legend: { show: false },
        cursor: { show: false },
        scales: {
          x: { time: false },
          y: {
            range: (_u, lo, hi) => {
              const top = Math.max(hi ?? 0, (limA ?? 0) * 1.15, (limB ?? 0) * 1.15, m.id === 'coil' ? 40 : 0.5);
              const bottom = 0;
              void lo;
              return [bottom, top];
            },
          },
        },
        series: [
          {},
          { stroke: pal.a, width: 1.75, points: { show: false } },
          { stroke: pal.b, width: 1.75, points: { show: false } },
          { stroke: pal.a, width: 1, dash: [5, 4], points: { show: false } },
          { stroke: pal.b, width: 1, dash: [2, 3], points: { show: false } },
        ],
        axes: [
          {
            stroke: pal.axis,
            font,
            size: 26,
            grid: { stroke: pal.grid, width: 1 },
            ticks: { stroke: pal.grid },
            values: (_u, s) => s.map((v) => clock(v, s.length > 1 && s[1] - s[0] < 1 ? 1 : 0)),
          },
          {
            stroke: pal.axis,
            font,
            size: 52,
            grid: { stroke: pal.grid, width: 1 },
            ticks: { stroke: pal.grid },
            values: (_u, s) => s.map((v) => num(v, 3)),
          },
        ],
        hooks: {
          draw: [
            (u) => {
              const st = stateRef.current;
              const t = st.track ? p.bench.positionNow() / st.track.sampleRate : 0;
              const x = u.valToPos(t, 'x', true);
              const g = u.ctx;
              g.save();
              g.strokeStyle = pal.text;
              g.lineWidth = 1.5 * devicePixelRatio;
              g.beginPath();
              g.moveTo(x, u.bbox.top);
              g.lineTo(x, u.bbox.top + u.bbox.height);
              g.stroke();
              g.restore();
            },
          ],
        },
      };
      plots.current.push(
        new uPlot(
          opts,
          [
            [0, 1],
            [null, null],
            [null, null],
            [null, null],
            [null, null],
          ] as unknown as uPlot.AlignedData,
          boxes[i],
        ),
      );
    });
    return () => {
      for (const u of plots.current) u.destroy();
      plots.current = [];
    };
  }, [width, p.theme, p.systems.a, p.systems.b, shown.length]);

  // Follow the playhead.
  useEffect(() => {
    let timer = 0;
    const update = () => {
      const st = stateRef.current;
      if (!st.track) return;
      const dur = st.track.frames / st.track.sampleRate;
      const now = p.bench.positionNow() / st.track.sampleRate;
      const t0 = Math.max(0, Math.min(now - HALF_WINDOW_S, dur - 2 * HALF_WINDOW_S)),
        t1 = Math.min(dur, t0 + 2 * HALF_WINDOW_S);
      const win = windowed(p.bench, st, t0, t1);
      shown.forEach((m, i) => {
        const u = plots.current[i];
        if (!u) return;
        const k = METRICS.indexOf(m);
        const limA = limitOf(m.id, p.systems.a),
          limB = limitOf(m.id, p.systems.b);
        const n = win.t.length;
        const xs = n ? win.t : [t0, t1];
        const fill = (v: number | null) => (n ? win.t.map(() => v) : [v, v]);
        // A design without a port has no port trace (the engine reports zeros for it).
        const own = (slot: 'a' | 'b') => (n && (m.id !== 'port' || vented(p.systems[slot])) ? win[slot][k] : fill(null));
        const data = [xs, own('a'), own('b'), fill(limA), fill(limB)];
        u.batch(() => {
          u.setData(data as unknown as uPlot.AlignedData, false);
          u.setScale('x', { min: t0, max: t1 });
        });
      });
    };
    update();
    if (p.state.playing) timer = window.setInterval(update, REFRESH_MS);
    return () => clearInterval(timer);
  }, [p.state.playing, p.state.position, p.state.offline, p.state.history.length === 0, width, p.theme, shown.length]);

  const src = p.bench.offlineFresh()
    ? 'from the offline render of the whole track'
    : p.state.playing || p.state.history.length
      ? 'live, while playing'
      : 'play the track or render it offline to see them';
  return (
    <section class="traces" aria-label="Traces around the playhead" ref={host}>
      <h3>
        Around the playhead{' '}
        <span class="fine">
          ±{HALF_WINDOW_S} s, {src}
        </span>
      </h3>
      <div class={`trace-grid${width > 900 ? ' two' : ''}`}>
        {shown.map((m) => (
          <figure class="trace-card" data-trace={m.id}>
            <figcaption>
              {m.title} <span class="u">{m.unit}</span>
              <span class="trace-key">
                <i class="k-a" /> A <i class="k-b" /> B <i class="k-lim" /> limit
              </span>
            </figcaption>
            <div class="trace-plot" />
          </figure>
        ))}
      </div>
    </section>
  );
}
