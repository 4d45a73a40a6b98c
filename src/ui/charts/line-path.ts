// A curve's line as the canvas strokes it: the points in canvas pixels, broken at gaps, with every
// point that lies within a fraction of a pixel of the line through its neighbours left out. On a
// log-frequency axis most of a smooth curve is such points (hundreds per chart line where a handful
// bend it), and a software-rasterised antialiased stroke costs about in proportion to its segments.
import simplify from 'simplify-js';
import type uPlot from 'uplot';

/**
 * How far (in canvas pixels) a point left out may lie from the line drawn: a quarter pixel, under
 * what an antialiased line of 1.25 px or wider shows (a pixel's coverage changes by at most a
 * quarter). Common practice for polyline simplification on screen, no source.
 */
export const LINE_TOLERANCE_PX = 0.25;

/**
 * The runs of a curve's points to stroke (x, y pairs, flat), from its points in pixels, each run one
 * stretch without a gap (a null or non-finite y ends a run; a run of one point draws nothing and is
 * left out). Ramer–Douglas–Peucker (simplify-js, its exact mode): every point left out lies within
 * `tolerance` of the segment between the kept points around it; a run's first and last points are
 * always kept.
 */
export function lineRuns(xs: ArrayLike<number>, ys: ArrayLike<number | null>, tolerance = LINE_TOLERANCE_PX): number[][] {
  const runs: number[][] = [];
  let run: { x: number; y: number }[] = [];
  const close = () => {
    if (run.length > 1) {
      const kept = simplify(run, tolerance, true);
      const flat = new Array<number>(kept.length * 2);
      for (let k = 0; k < kept.length; k++) {
        flat[2 * k] = kept[k].x;
        flat[2 * k + 1] = kept[k].y;
      }
      runs.push(flat);
    }
    run = [];
  };
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i];
    const y = ys[i];
    if (y === null || !Number.isFinite(y) || !Number.isFinite(x)) close();
    else run.push({ x, y });
  }
  close();
  return runs;
}

/** The same values, element for element (null included), with no tolerance. */
function sameExactly(a: ArrayLike<number | null>, b: ArrayLike<number | null>): boolean {
  if (a === b) return true;
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * Each chart's x positions in pixels, shared by its curves, kept while the frequencies (the same
 * grid in every analysis), the x scale and the plot's place stay: the same array then, which tells
 * `simplifiedLine` that a curve with unchanged values has an unchanged line.
 */
const xPixels = new WeakMap<uPlot, { freq: ArrayLike<number>; min: number; max: number; left: number; width: number; px: Float64Array }>();
function xPixelsOf(u: uPlot): Float64Array {
  const xs = u.data[0];
  const sx = u.scales.x;
  const kept = xPixels.get(u);
  if (
    kept &&
    kept.min === sx.min &&
    kept.max === sx.max &&
    kept.left === u.bbox.left &&
    kept.width === u.bbox.width &&
    sameExactly(kept.freq, xs)
  ) {
    kept.freq = xs;
    return kept.px;
  }
  const px = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) px[i] = u.valToPos(xs[i], 'x', true);
  xPixels.set(u, { freq: xs, min: sx.min ?? 0, max: sx.max ?? 0, left: u.bbox.left, width: u.bbox.width, px });
  return px;
}

interface KeptLine {
  px: Float64Array;
  idx0: number;
  min: number | undefined;
  max: number | undefined;
  top: number;
  height: number;
  values: (number | null)[];
  paths: uPlot.Series.Paths;
}
/** Each chart's lines as last built, by series: an edit of A leaves B's lines as they were. */
const keptLines = new WeakMap<uPlot, Map<number, KeptLine>>();

/**
 * uPlot's path for a curve, from `lineRuns`: the same line its own linear builder strokes, within
 * `LINE_TOLERANCE_PX`, with gaps left open rather than clipped. A curve whose values, scales and
 * plot are as at its last build gets that build's path again.
 */
export const simplifiedLine: uPlot.Series.PathBuilder = (u, seriesIdx, idx0, idx1) => {
  const px = xPixelsOf(u);
  const ys = u.data[seriesIdx] as (number | null | undefined)[];
  const yScale = u.series[seriesIdx].scale ?? 'y';
  const sy = u.scales[yScale];
  const values = Array.prototype.slice.call(ys, idx0, idx1 + 1).map((v) => v ?? null) as (number | null)[];
  const lines = keptLines.get(u) ?? new Map<number, KeptLine>();
  keptLines.set(u, lines);
  const kept = lines.get(seriesIdx);
  if (
    kept &&
    kept.px === px &&
    kept.idx0 === idx0 &&
    kept.min === sy.min &&
    kept.max === sy.max &&
    kept.top === u.bbox.top &&
    kept.height === u.bbox.height &&
    sameExactly(kept.values, values)
  )
    return kept.paths;
  const py = values.map((v) => (v === null ? null : u.valToPos(v, yScale, true)));
  const stroke = new Path2D();
  for (const r of lineRuns(px.subarray(idx0, idx1 + 1), py)) {
    stroke.moveTo(r[0], r[1]);
    for (let k = 2; k < r.length; k += 2) stroke.lineTo(r[k], r[k + 1]);
  }
  const paths = { stroke, fill: null, clip: null, band: null, flags: 0 };
  lines.set(seriesIdx, { px, idx0, min: sy.min, max: sy.max, top: u.bbox.top, height: u.bbox.height, values, paths });
  return paths;
};
