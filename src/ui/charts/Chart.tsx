// One log-frequency chart drawn by uPlot. Data changes are applied with setData (no rebuild), into
// arrays kept from the last draw, at most once per animation frame; the chart is rebuilt only when
// its series or the theme change.
import { useEffect, useLayoutEffect, useRef } from 'preact/hooks';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { ChartSpec, Role } from './specs.ts';
import { simplifiedLine } from './line-path.ts';
import { num } from '../format.ts';
import { downloadBlob } from '../files.ts';

export interface Palette {
  a: string;
  b: string;
  reference: string;
  limit: string;
  axis: string;
  grid: string;
  text: string;
  background: string;
}

export function readPalette(el: Element): Palette {
  const cs = getComputedStyle(el);
  const v = (name: string, fallback: string) => cs.getPropertyValue(name).trim() || fallback;
  return {
    a: v('--c-a', '#0d6e74'),
    b: v('--c-b', '#c77d0a'),
    reference: v('--c-ref', '#8a9296'),
    limit: v('--c-limit', '#b3363a'),
    axis: v('--c-axis', '#4a5357'),
    grid: v('--c-grid', '#e3e7e8'),
    text: v('--c-text', '#1c2326'),
    background: v('--c-surface', '#ffffff'),
  };
}

function stroke(role: Role, p: Palette): { stroke: string; dash?: number[]; width: number } {
  switch (role) {
    case 'a':
      return { stroke: p.a, width: 2.25 };
    case 'b':
      return { stroke: p.b, width: 2.25 };
    case 'a-aux':
      return { stroke: p.a, width: 1.5, dash: [2, 3] };
    case 'b-aux':
      return { stroke: p.b, width: 1.5, dash: [2, 3] };
    case 'reference':
      return { stroke: p.reference, width: 1.5, dash: [6, 4] };
    case 'limit':
      return { stroke: p.limit, width: 1.25, dash: [5, 4] };
    case 'limit-hard':
      return { stroke: p.limit, width: 1.5 };
    case 'limit-a':
      return { stroke: p.a, width: 1.25, dash: [5, 4] };
    case 'limit-b':
      return { stroke: p.b, width: 1.25, dash: [5, 4] };
    case 'limit-hard-a':
      return { stroke: p.a, width: 1.5 };
    case 'limit-hard-b':
      return { stroke: p.b, width: 1.5 };
    case 'a-way':
      return { stroke: p.a, width: 1.25, dash: [8, 3, 2, 3] };
    case 'b-way':
      return { stroke: p.b, width: 1.25, dash: [8, 3, 2, 3] };
  }
}

function hz(v: number): string {
  return v >= 1000 ? `${Number((v / 1000).toPrecision(3))}k` : String(Number(v.toPrecision(3)));
}

/** Axis numbers without trailing zeros: 80, 2.5, 0.25. */
function tick(v: number): string {
  return String(Number(v.toPrecision(6))).replace('-', '−');
}

/**
 * Frequency ticks labelled at 1-2-5 steps only, so a log axis stays readable. The other ticks get
 * null, not an empty string: uPlot skips a null label but draws an empty one (some twenty canvas
 * text calls per chart and redraw for nothing).
 */
function xTickLabels(_u: uPlot, splits: number[]): (string | null)[] {
  return splits.map((v) => {
    const lead = Math.round(v / 10 ** Math.floor(Math.log10(v) + 1e-9));
    return lead === 1 || lead === 2 || lead === 5 ? hz(v) : null;
  });
}

/**
 * A chart's data for uPlot across redraws (a point without a value, NaN outside that design's own
 * grid, is a gap: uPlot wants null there): each series' array is kept and refilled in place, and a
 * series whose values are the very array drawn last time is not touched at all (an edit to A leaves
 * B's curves as they were), so an edit allocates nothing here.
 */
export class ChartData {
  private drawn: (ArrayLike<number> | null)[] = [];
  private arrays: (number | null)[][] = [];
  private freq: Float64Array | null = null;
  data: uPlot.AlignedData = [[]];

  /** Updates the arrays from the spec; false when nothing changed (no redraw needed). */
  update(spec: ChartSpec): boolean {
    const n = spec.freqHz.length;
    let changed = this.freq !== spec.freqHz || this.arrays.length !== spec.series.length;
    if (this.arrays.length !== spec.series.length) {
      this.arrays = spec.series.map(() => []);
      this.drawn = spec.series.map(() => null);
    }
    spec.series.forEach((s, k) => {
      const out = this.arrays[k];
      if (s.values === this.drawn[k] && out.length === n && s.values !== null) return;
      changed = true;
      out.length = n;
      const v = s.values;
      for (let i = 0; i < n; i++) {
        const x = v ? v[i] : Number.NaN;
        out[i] = Number.isFinite(x) ? x : null;
      }
      this.drawn[k] = v;
    });
    this.freq = spec.freqHz;
    // uPlot compares nothing: a new outer array with the same inner arrays is enough.
    if (changed) this.data = [spec.freqHz as unknown as number[], ...this.arrays] as uPlot.AlignedData;
    return changed;
  }
}

export function shapeKey(spec: ChartSpec): string {
  return spec.series.map((s) => `${s.role}:${s.label}:${s.values ? 1 : 0}`).join('|') + `|${spec.yMin ?? ''}|${spec.yMax ?? ''}`;
}

function options(spec: ChartSpec, width: number, height: number, p: Palette, onDraw: () => void, syncKey: string): uPlot.Options {
  const axisFont = '12px system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';
  return {
    width,
    height,
    pxAlign: false,
    scales: {
      x: { distr: 3, log: 10, time: false, range: (_u, lo, hi) => [lo, hi] },
      y: {
        range: (_u, lo, hi) => {
          let min = spec.yMin ?? lo;
          let max = spec.yMax ?? hi;
          if (spec.yMax === undefined && spec.yMin === undefined) {
            const pad = Math.max((max - min) * 0.08, 1);
            min -= pad;
            max += pad;
          } else if (spec.yMax === undefined) {
            max = max + Math.max((max - min) * 0.08, 0.1);
          }
          if (!Number.isFinite(min) || !Number.isFinite(max) || min === max) return [0, 1];
          return [min, max];
        },
      },
    },
    cursor: { sync: { key: syncKey }, points: { size: 7 }, drag: { x: false, y: false } },
    legend: { live: true },
    series: [
      { label: 'Frequency', value: (_u, v) => (v == null ? '—' : `${num(v, 3)} Hz`) },
      ...spec.series.map((s) => {
        const st = stroke(s.role, p);
        return {
          label: s.label,
          stroke: st.stroke,
          width: st.width,
          dash: st.dash,
          paths: simplifiedLine,
          points: { show: false },
          value: (_u: uPlot, v: number | null, _si: number, idx: number | null) =>
            v == null || !Number.isFinite(v)
              ? '—'
              : `${num(v, spec.digits)} ${spec.unit}${s.annotate && idx !== null ? ` · ${s.annotate(idx)}` : ''}`,
        } satisfies uPlot.Series;
      }),
    ],
    axes: [
      {
        stroke: p.axis,
        font: axisFont,
        grid: { stroke: p.grid, width: 1 },
        ticks: { stroke: p.grid, width: 1 },
        values: xTickLabels,
        label: 'Frequency (Hz)',
        labelFont: axisFont,
        labelSize: 20,
      },
      {
        stroke: p.axis,
        font: axisFont,
        grid: { stroke: p.grid, width: 1 },
        ticks: { stroke: p.grid, width: 1 },
        label: spec.unit,
        labelFont: axisFont,
        labelSize: 18,
        size: 52,
        values: (_u, splits) => splits.map(tick),
      },
    ],
    hooks: { draw: [onDraw] },
  };
}

/**
 * At most one draw per chart per animation frame: the first change in a frame draws at once (the
 * edit's own task, so the next frame shows it), later changes in the same frame wait for the next
 * frame and draw once with the newest data (typing or dragging faster than the screen refreshes).
 */
const drewThisFrame = new Set<uPlot>();
const waiting = new Map<uPlot, ChartData>();
let frameRequested = false;
function drawInFrame(u: uPlot, d: ChartData) {
  if (typeof requestAnimationFrame === 'undefined') {
    u.setData(d.data);
    return;
  }
  if (!drewThisFrame.has(u)) {
    drewThisFrame.add(u);
    u.setData(d.data);
  } else waiting.set(u, d);
  if (!frameRequested) {
    frameRequested = true;
    requestAnimationFrame(() => {
      frameRequested = false;
      drewThisFrame.clear();
      const due = [...waiting];
      waiting.clear();
      for (const [plot, data] of due) drawInFrame(plot, data);
    });
  }
}

/**
 * Charts scrolled out of view are not drawn in the edit's task: they are marked and drawn when the
 * browser is idle or when they scroll into view, whichever comes first, so an edit pays only for
 * the charts on screen. The idle drawing stops when less than `IDLE_SLICE_MS` of the idle period
 * is left (at least one chart each time) and goes on in the next one, so a keystroke that comes
 * meanwhile waits for one chart, not for all of them; when the browser found no idle time within
 * the callback's timeout, the rest are drawn at once. Without IntersectionObserver every chart
 * counts as on screen.
 */
const offscreen = new Map<uPlot, ChartData>();
let idleRequested = false;
/** About twice what one chart takes to draw on a slow machine. */
const IDLE_SLICE_MS = 2;
function drawWhenSeen(u: uPlot, d: ChartData, visible: boolean) {
  if (visible) {
    offscreen.delete(u);
    drawInFrame(u, d);
    return;
  }
  offscreen.set(u, d);
  drawWhenIdle();
}

function drawWhenIdle() {
  if (idleRequested) return;
  idleRequested = true;
  const later = (run: (deadline?: IdleDeadline) => void) =>
    typeof requestIdleCallback === 'function' ? requestIdleCallback(run, { timeout: 500 }) : setTimeout(run, 50);
  later((deadline) => {
    idleRequested = false;
    for (const [plot, data] of offscreen) {
      offscreen.delete(plot);
      // In a batch the chart is drawn here and now (not in a microtask), so the deadline counts it.
      plot.batch(() => drawInFrame(plot, data));
      if (deadline && !deadline.didTimeout && deadline.timeRemaining() < IDLE_SLICE_MS) break;
    }
    if (offscreen.size > 0) drawWhenIdle();
  });
}

/** A plot about to be destroyed leaves the queues of draws to come. */
function forget(u: uPlot) {
  offscreen.delete(u);
  waiting.delete(u);
  drewThisFrame.delete(u);
}

export interface ChartProps {
  spec: ChartSpec;
  height: number;
  theme: string;
  syncKey?: string;
  /** Offer PNG export of this chart. */
  exportable?: boolean;
}

export function Chart({ spec, height, theme, syncKey = 'preheard-freq', exportable = true }: ChartProps) {
  const host = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const built = useRef<string>('');
  const draws = useRef(0);
  const specRef = useRef(spec);
  specRef.current = spec;
  const data = useRef<ChartData | null>(null);
  const visible = useRef(true);

  // Build or rebuild when the series set or the theme changes; otherwise just set the data.
  const key = `${shapeKey(spec)}#${theme}#${height}`;
  // Layout effect: the redraw lands in the same task as the edit, not a frame later.
  useLayoutEffect(() => {
    const el = host.current;
    if (!el || spec.series.length === 0) return;
    if (plot.current && built.current === key && data.current) {
      if (data.current.update(spec)) drawWhenSeen(plot.current, data.current, visible.current);
      return;
    }
    if (plot.current) forget(plot.current);
    plot.current?.destroy();
    const width = Math.max(200, el.clientWidth || 600);
    const onDraw = () => {
      draws.current++;
      el.dataset.draws = String(draws.current);
    };
    data.current = new ChartData();
    data.current.update(spec);
    plot.current = new uPlot(options(spec, width, height, readPalette(el), onDraw, syncKey), data.current.data, el);
    built.current = key;
  }, [spec, key]);

  useEffect(() => {
    const el = host.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    const ro = new ResizeObserver(() => {
      const u = plot.current;
      const w = Math.floor(el.clientWidth);
      if (u && w > 0 && Math.abs(u.width - w) > 1) u.setSize({ width: w, height });
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, [height]);

  useEffect(() => {
    const el = host.current;
    if (!el || typeof IntersectionObserver === 'undefined') return;
    const io = new IntersectionObserver((entries) => {
      const seen = entries.some((e) => e.isIntersecting);
      visible.current = seen;
      const u = plot.current;
      const pending = u ? offscreen.get(u) : undefined;
      if (seen && u && pending) drawWhenSeen(u, pending, true);
    });
    io.observe(el);
    return () => io.disconnect();
  }, []);

  useEffect(
    () => () => {
      if (plot.current) forget(plot.current);
      plot.current?.destroy();
      plot.current = null;
    },
    [],
  );

  if (spec.series.length === 0) {
    return (
      <div class="chart-empty" style={{ height: `${height}px` }}>
        {spec.empty ?? 'Nothing to show.'}
      </div>
    );
  }
  return (
    <div class="chart">
      {exportable ? (
        <button
          type="button"
          class="small ghost chart-png"
          aria-label={`Save ${spec.title} as PNG`}
          onClick={() => plot.current && exportPng(plot.current, specRef.current, readPalette(host.current!))}
        >
          PNG
        </button>
      ) : null}
      <div class="chart-plot" ref={host} data-chart={spec.id} role="img" aria-label={`${spec.title}: ${spec.summary.join(' ')}`} />
    </div>
  );
}

/** The chart as a PNG: title, the plot and a legend, on the theme's background. */
export function exportPng(u: uPlot, spec: ChartSpec, p: Palette) {
  const src = u.ctx.canvas;
  const dpr = src.width / u.width || 1;
  const pad = 16 * dpr;
  const titleH = 28 * dpr;
  const lineH = 18 * dpr;
  const shown = spec.series.filter((s) => s.values);
  const legendH = (shown.length * 18 + 12) * dpr;
  const out = document.createElement('canvas');
  out.width = src.width + 2 * pad;
  out.height = src.height + titleH + legendH + 2 * pad;
  const ctx = out.getContext('2d');
  if (!ctx) return;
  ctx.fillStyle = p.background;
  ctx.fillRect(0, 0, out.width, out.height);
  ctx.fillStyle = p.text;
  ctx.font = `600 ${15 * dpr}px system-ui, sans-serif`;
  ctx.textBaseline = 'top';
  ctx.fillText(`${spec.title} (${spec.unit})`, pad, pad);
  ctx.drawImage(src, pad, pad + titleH);
  const x = pad;
  let y = pad + titleH + src.height + 8 * dpr;
  ctx.font = `${12 * dpr}px system-ui, sans-serif`;
  const y0 = y;
  for (const s of shown) {
    const st = stroke(s.role, p);
    ctx.strokeStyle = st.stroke;
    ctx.lineWidth = st.width * dpr;
    ctx.setLineDash((st.dash ?? []).map((d) => d * dpr));
    ctx.beginPath();
    ctx.moveTo(x, y + 7 * dpr);
    ctx.lineTo(x + 22 * dpr, y + 7 * dpr);
    ctx.stroke();
    ctx.setLineDash([]);
    ctx.fillStyle = p.text;
    ctx.fillText(s.longLabel ?? s.label, x + 28 * dpr, y);
    y += lineH;
  }
  ctx.fillStyle = p.axis;
  ctx.textAlign = 'right';
  ctx.fillText('preheard — model estimate', out.width - pad, y0);
  out.toBlob((blob) => blob && downloadBlob(blob, `preheard-${spec.id}.png`), 'image/png');
}
