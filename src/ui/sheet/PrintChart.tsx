// A chart for paper: the same ChartSpec the screen's charts draw, as an SVG (vector lines and real
// text in the PDF, the same colours by role). Log frequency on x, the spec's unit on y.
import type { ChartSpec, Role } from '../charts/specs.ts';

const INK: Record<'a' | 'b' | 'reference' | 'limit', string> = { a: '#0b6b70', b: '#c27c08', reference: '#8a9296', limit: '#b3363a' };

function strokeOf(role: Role): { color: string; width: number; dash?: string } {
  if (role === 'a' || role === 'b') return { color: INK[role], width: 1.8 };
  if (role === 'a-aux' || role === 'b-aux') return { color: INK[role === 'a-aux' ? 'a' : 'b'], width: 1.2, dash: '2 2' };
  if (role === 'a-way' || role === 'b-way') return { color: INK[role === 'a-way' ? 'a' : 'b'], width: 1, dash: '6 2 1 2' };
  if (role === 'reference') return { color: INK.reference, width: 1.2, dash: '5 3' };
  if (role === 'limit' || role === 'limit-hard') return { color: INK.limit, width: 1, dash: role === 'limit' ? '4 3' : undefined };
  const slot = role.endsWith('-a') ? 'a' : 'b';
  return { color: INK[slot], width: 1, dash: role.startsWith('limit-hard') ? undefined : '4 3' };
}

/** Round steps 1, 2, 2.5, 5 × 10^k giving about `target` intervals over the span. */
export function niceStep(span: number, target = 5): number {
  const raw = span / target;
  const p = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= raw) return m * p;
  return 10 * p;
}

/** The y range shown: the spec's fixed ends, else the data with a margin; dB charts show the top 50 dB. */
export function yRange(spec: ChartSpec): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const s of spec.series) {
    if (!s.values) continue;
    for (let i = 0; i < s.values.length; i++) {
      const v = s.values[i];
      if (!Number.isFinite(v)) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  if (!Number.isFinite(lo)) return [0, 1];
  if (spec.unit === 'dB') lo = Math.max(lo, hi - 50);
  let min = spec.yMin ?? lo;
  let max = spec.yMax ?? hi + Math.max((hi - lo) * 0.08, 0.5);
  if (spec.yMin === undefined) min -= Math.max((hi - lo) * 0.05, 0.5);
  if (max <= min) max = min + 1;
  const step = niceStep(max - min);
  return [Math.floor(min / step) * step, Math.ceil(max / step) * step];
}

const X_TICKS = [10, 20, 50, 100, 200, 500, 1000, 2000, 5000, 10000, 20000];
const hzLabel = (f: number) => (f >= 1000 ? `${f / 1000}k` : String(f));
const tickLabel = (v: number) => String(Number(v.toPrecision(6))).replace('-', '−');

const LEGEND_W = 100;
const LEGEND_ROW = 11;

interface Rect {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** Whether the segment from (x0, y0) to (x1, y1) touches the rectangle (Liang–Barsky clipping). */
function segmentHits(x0: number, y0: number, x1: number, y1: number, r: Rect): boolean {
  const dx = x1 - x0;
  const dy = y1 - y0;
  let t0 = 0;
  let t1 = 1;
  const edges: [number, number][] = [
    [-dx, x0 - r.x],
    [dx, r.x + r.w - x0],
    [-dy, y0 - r.y],
    [dy, r.y + r.h - y0],
  ];
  for (const [p, q] of edges) {
    if (p === 0) {
      if (q < 0) return false;
      continue;
    }
    const t = q / p;
    if (p < 0) t0 = Math.max(t0, t);
    else t1 = Math.min(t1, t);
    if (t0 > t1) return false;
  }
  return true;
}

/** Whether a polyline (its consecutive points joined) passes through the rectangle. */
function crosses(pts: [number, number][], r: Rect): boolean {
  if (pts.length === 1) return segmentHits(pts[0][0], pts[0][1], pts[0][0], pts[0][1], r);
  for (let i = 1; i < pts.length; i++) if (segmentHits(pts[i - 1][0], pts[i - 1][1], pts[i][0], pts[i][1], r)) return true;
  return false;
}

/** The legend's place: a free corner of the plot, else below it. */
export function placeLegend(
  lines: [number, number][][],
  plot: Rect,
  w: number,
  h: number,
  height: number,
  belowH = h,
): Rect & { where: 'top-right' | 'top-left' | 'bottom-right' | 'bottom-left' | 'below' } {
  const pad = 3;
  const corners = [
    { where: 'top-right' as const, x: plot.x + plot.w - w - pad, y: plot.y + pad },
    { where: 'top-left' as const, x: plot.x + pad, y: plot.y + pad },
    { where: 'bottom-right' as const, x: plot.x + plot.w - w - pad, y: plot.y + plot.h - h - pad },
    { where: 'bottom-left' as const, x: plot.x + pad, y: plot.y + plot.h - h - pad },
  ];
  for (const c of corners) {
    // Two points of margin around the box, so a line does not graze it.
    const r = { x: c.x - 2, y: c.y - 2, w: w + 4, h: h + 4 };
    if (h < plot.h - 2 * pad && !lines.some((l) => crosses(l, r))) return { ...c, w, h };
  }
  return { where: 'below', x: plot.x, y: height + 2, w: plot.w, h: belowH };
}

export function PrintChart({ spec, width = 340, height = 200 }: { spec: ChartSpec; width?: number; height?: number }) {
  const f = spec.freqHz;
  if (!f.length || !spec.series.length) {
    return <p class="print-chart-empty">{spec.empty ?? 'Nothing to show.'}</p>;
  }
  const m = { l: 40, r: 8, t: 8, b: 26 };
  const w = width - m.l - m.r;
  const h = height - m.t - m.b;
  const f0 = f[0];
  const f1 = f[f.length - 1];
  const [y0, y1] = yRange(spec);
  const X = (hz: number) => m.l + (w * Math.log(hz / f0)) / Math.log(f1 / f0);
  const Y = (v: number) => m.t + h * (1 - (v - y0) / (y1 - y0));
  const step = niceStep(y1 - y0);
  const yTicks: number[] = [];
  for (let v = y0; v <= y1 + step * 1e-6; v += step) yTicks.push(Number(v.toPrecision(12)));
  const path = (vals: ArrayLike<number>) => {
    let d = '';
    let pen = false;
    for (let i = 0; i < f.length; i++) {
      const v = vals[i];
      // Far outside the range the line is lifted; just outside it is drawn and clipped at the frame.
      if (!Number.isFinite(v) || v < y0 - (y1 - y0) || v > y1 + (y1 - y0)) {
        pen = false;
        continue;
      }
      d += `${pen ? 'L' : 'M'}${X(f[i]).toFixed(1)},${Y(v).toFixed(1)}`;
      pen = true;
    }
    return d;
  };
  const shown = spec.series.filter((s) => s.values);
  const legendH = shown.length * LEGEND_ROW + 2;
  // The legend goes in the first corner of the plot that no line crosses (a limit line along the top
  // must stay visible); when every corner is taken, it goes below the plot and the picture grows.
  const points = shown.map((s) => {
    const pts: [number, number][] = [];
    for (let i = 0; i < f.length; i++) {
      const v = s.values![i];
      if (Number.isFinite(v)) pts.push([X(f[i]), Math.min(Math.max(Y(v), m.t), m.t + h)]);
    }
    return pts;
  });
  // Below the plot the legend runs across in columns, to keep the picture short.
  const perRow = Math.max(1, Math.floor(w / LEGEND_W));
  const belowH = Math.ceil(shown.length / perRow) * LEGEND_ROW + 2;
  const legend = placeLegend(points, { x: m.l, y: m.t, w, h }, LEGEND_W, legendH, height, belowH);
  const across = legend.where === 'below' ? perRow : 1;
  const fullH = legend.where === 'below' ? height + belowH + 4 : height;
  return (
    <svg
      class="print-chart"
      viewBox={`0 0 ${width} ${fullH}`}
      width={width}
      height={fullH}
      role="img"
      aria-label={`${spec.title}: ${spec.summary.join(' ')}`}
      data-chart={spec.id}
    >
      <rect x={m.l} y={m.t} width={w} height={h} fill="#fff" stroke="#b9c2c4" stroke-width="0.75" />
      {X_TICKS.filter((t) => t >= f0 && t <= f1).map((t) => (
        <g>
          <line x1={X(t)} x2={X(t)} y1={m.t} y2={m.t + h} stroke="#e3e7e8" stroke-width="0.75" />
          <text x={X(t)} y={m.t + h + 12} font-size="8.5" text-anchor="middle" fill="#4a5357">
            {hzLabel(t)}
          </text>
        </g>
      ))}
      {yTicks.map((v) => (
        <g>
          <line x1={m.l} x2={m.l + w} y1={Y(v)} y2={Y(v)} stroke="#e3e7e8" stroke-width="0.75" />
          <text x={m.l - 4} y={Y(v) + 3} font-size="8.5" text-anchor="end" fill="#4a5357">
            {tickLabel(v)}
          </text>
        </g>
      ))}
      <text x={m.l + w / 2} y={height - 3} font-size="8.5" text-anchor="middle" fill="#4a5357">
        Frequency (Hz)
      </text>
      <text x={10} y={m.t + h / 2} font-size="8.5" text-anchor="middle" fill="#4a5357" transform={`rotate(-90 10 ${m.t + h / 2})`}>
        {spec.unit}
      </text>
      <clipPath id={`clip-${spec.id}`}>
        <rect x={m.l} y={m.t} width={w} height={h} />
      </clipPath>
      <g clip-path={`url(#clip-${spec.id})`}>
        {shown.map((s) => {
          const st = strokeOf(s.role);
          return (
            <path
              d={path(s.values!)}
              fill="none"
              stroke={st.color}
              stroke-width={st.width}
              stroke-dasharray={st.dash}
              stroke-linejoin="round"
            />
          );
        })}
      </g>
      <g transform={`translate(${legend.x}, ${legend.y})`} data-legend={legend.where}>
        <rect x={0} y={0} width={legend.w} height={legend.h} fill="#fff" fill-opacity="0.88" />
        {shown.map((s, i) => {
          const st = strokeOf(s.role);
          return (
            <g transform={`translate(${(i % across) * LEGEND_W}, ${Math.floor(i / across) * LEGEND_ROW + 6})`}>
              <line x1={4} x2={20} y1={0} y2={0} stroke={st.color} stroke-width={st.width} stroke-dasharray={st.dash} />
              <text x={24} y={3} font-size="8" fill="#1b2225">
                {s.label}
              </text>
            </g>
          );
        })}
      </g>
    </svg>
  );
}
