// What the screens read of an analysis, per way and for the whole system, in one place.
// The analysis gives its top-level curves and figures for the first driver way; per-way results
// (`ways`) and the summed system are read here and only here, guarded, so screens never depend on
// which of them a given analysis carries. The sum is looked for under `sum`, and under `system`
// when that holds curves rather than the SpeakerSystem the analysis was made for.
import type { Analysis, Curves, Figures } from '../engine/response/types.ts';
import type { DesignDoc } from '../engine/design/document.ts';
import { firstDriverIndex } from './ways.ts';

/** One way's curves on the analysis grid (driver-only curves are absent for a flat way). */
export interface WayCurvesView {
  splDb: ArrayLike<number>;
  plannedExcursionMm?: ArrayLike<number> | null;
  impedanceOhm?: ArrayLike<number> | null;
  plannedPortAirSpeed?: ArrayLike<number> | null;
}

export interface WayView {
  name: string;
  curves: WayCurvesView;
  figures: Partial<Figures>;
}

/** The summed output at the seat: the SPL curve and the system's figures (f3 and sensitivity of the sum). */
export interface SumView {
  splDb: ArrayLike<number>;
  figures: Partial<Figures>;
}

interface PerWayAnalysis {
  ways?: unknown;
  sum?: unknown;
}

function sumRaw(a: Analysis): Record<string, unknown> | null {
  for (const raw of [(a as Analysis & PerWayAnalysis).sum, (a as { system?: unknown }).system]) {
    if (raw && typeof raw === 'object' && curvesOf((raw as Record<string, unknown>).curves)) return raw as Record<string, unknown>;
  }
  return null;
}

const isArrayLike = (v: unknown): v is ArrayLike<number> =>
  (v instanceof Float64Array || Array.isArray(v)) && (v as ArrayLike<number>).length > 0;

function curvesOf(raw: unknown): WayCurvesView | null {
  if (!raw || typeof raw !== 'object') return null;
  const c = raw as Record<string, unknown>;
  if (!isArrayLike(c.splDb)) return null;
  const opt = (k: string) => (isArrayLike(c[k]) ? (c[k] as ArrayLike<number>) : null);
  return {
    splDb: c.splDb,
    plannedExcursionMm: opt('plannedExcursionMm'),
    impedanceOhm: opt('impedanceOhm'),
    plannedPortAirSpeed: opt('plannedPortAirSpeed'),
  };
}

/** Every way the analysis reports on its own, in design order (empty before per-way analysis exists). */
export function waysOf(a: Analysis): WayView[] {
  const raw = (a as Analysis & PerWayAnalysis).ways;
  if (!Array.isArray(raw)) return [];
  const out: WayView[] = [];
  for (const w of raw) {
    if (!w || typeof w !== 'object') continue;
    const r = w as Record<string, unknown>;
    const curves = curvesOf(r.curves);
    if (typeof r.name !== 'string' || !curves) continue;
    out.push({ name: r.name, curves, figures: (r.figures && typeof r.figures === 'object' ? r.figures : {}) as Partial<Figures> });
  }
  return out;
}

/** The way of that name, if the analysis reports it. */
export function wayNamed(a: Analysis, name: string): WayView | null {
  return waysOf(a).find((w) => w.name === name) ?? null;
}

/**
 * The figures of way `index` of the design: its own when the analysis reports ways, else the
 * top-level ones when it is the first driver way (which they describe), else none.
 */
export function wayFigures(a: Analysis, doc: DesignDoc, index: number): Partial<Figures> | null {
  const name = doc.ways[index]?.name;
  const own = name === undefined ? null : wayNamed(a, name);
  if (own) return own.figures;
  return index === firstDriverIndex(doc) ? a.figures : null;
}

/** The same for curves. */
export function wayCurves(a: Analysis, doc: DesignDoc, index: number): WayCurvesView | null {
  const name = doc.ways[index]?.name;
  const own = name === undefined ? null : wayNamed(a, name);
  if (own) return own.curves;
  return index === firstDriverIndex(doc) ? topCurves(a.curves) : null;
}

const topCurves = (c: Curves): WayCurvesView => ({
  splDb: c.splDb,
  plannedExcursionMm: c.plannedExcursionMm,
  impedanceOhm: c.impedanceOhm,
  plannedPortAirSpeed: c.plannedPortAirSpeed,
});

/** The system sum when the analysis has it, else the top-level curve (the first version's system). */
export function sumOf(a: Analysis): SumView {
  const r = sumRaw(a);
  const curves = r && curvesOf(r.curves);
  if (r && curves)
    return { splDb: curves.splDb, figures: (r.figures && typeof r.figures === 'object' ? r.figures : {}) as Partial<Figures> };
  return { splDb: a.curves.splDb, figures: a.figures };
}

/** True when the analysis reports the system sum apart from the first driver way. */
export function hasSum(a: Analysis): boolean {
  return sumRaw(a) !== null;
}
