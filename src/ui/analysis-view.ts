// What the screens read of an analysis, per way and for the whole system, in one place.
// The analysis gives its top-level curves and figures for the first driver way; per-way results
// (`ways`: the driver ways) and the summed system (`sum`, whose curves list every way as it enters
// the sum) are read here and only here, guarded, so screens never depend on which of them a given
// analysis carries.
import type { Analysis, Curves, Figures } from '../engine/response/types.ts';
import type { DesignDoc } from '../engine/design/document.ts';
import { firstDriverIndex } from './ways.ts';
import type { AmplifierShortfall } from '../engine/level/programme.ts';

/** One way's curves on the analysis grid (driver-only curves are absent for a flat way). */
export interface WayCurvesView {
  splDb: ArrayLike<number>;
  plannedExcursionMm?: ArrayLike<number> | null;
  impedanceOhm?: ArrayLike<number> | null;
  plannedPortAirSpeed?: ArrayLike<number> | null;
  /** A measured response's level where its table has points (NaN elsewhere). */
  measuredSplDb?: ArrayLike<number> | null;
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
  /** Every driver way: `{way: {name}, curves, figures}`. */
  ways?: unknown;
  /** The system at the seat: `{curves: {splDb, ways: [{name, kind, splDb}]}, figures}`. */
  sum?: unknown;
}

const isArrayLike = (v: unknown): v is ArrayLike<number> =>
  (v instanceof Float64Array || Array.isArray(v)) && (v as ArrayLike<number>).length > 0;

function curvesOf(raw: unknown): WayCurvesView | null {
  const c = record(raw);
  if (!c || !isArrayLike(c.splDb)) return null;
  const opt = (k: string) => (isArrayLike(c[k]) ? (c[k] as ArrayLike<number>) : null);
  return {
    splDb: c.splDb,
    plannedExcursionMm: opt('plannedExcursionMm'),
    impedanceOhm: opt('impedanceOhm'),
    plannedPortAirSpeed: opt('plannedPortAirSpeed'),
    measuredSplDb: opt('measuredSplDb'),
  };
}

const record = (v: unknown): Record<string, unknown> | null =>
  v !== null && typeof v === 'object' && !Array.isArray(v) ? (v as Record<string, unknown>) : null;

function sumRaw(a: Analysis): Record<string, unknown> | null {
  const r = record((a as Analysis & PerWayAnalysis).sum);
  return r && curvesOf(r.curves) ? r : null;
}

/** The driver ways the analysis reports, by name. */
function driverWays(a: Analysis): Map<string, { curves: WayCurvesView; figures: Partial<Figures> }> {
  const out = new Map<string, { curves: WayCurvesView; figures: Partial<Figures> }>();
  const raw = (a as Analysis & PerWayAnalysis).ways;
  if (!Array.isArray(raw)) return out;
  for (const w of raw) {
    const r = record(w);
    const name = record(r?.way)?.name ?? r?.name;
    const curves = curvesOf(r?.curves);
    if (typeof name === 'string' && curves) out.set(name, { curves, figures: (record(r?.figures) ?? {}) as Partial<Figures> });
  }
  return out;
}

/**
 * Every way the analysis reports on its own, in design order, flat ways included (empty before
 * per-way analysis exists). A way's SPL is as it enters the sum (filter, polarity and offset).
 */
export function waysOf(a: Analysis): WayView[] {
  const drivers = driverWays(a);
  const entering = record(sumRaw(a)?.curves)?.ways;
  if (!Array.isArray(entering)) return [...drivers].map(([name, w]) => ({ name, ...w }));
  const out: WayView[] = [];
  for (const e of entering) {
    const r = record(e);
    const splDb = r?.splDb;
    if (!r || typeof r.name !== 'string' || !isArrayLike(splDb)) continue;
    const own = drivers.get(r.name);
    out.push({ name: r.name, curves: { ...(own?.curves ?? {}), splDb }, figures: own?.figures ?? {} });
  }
  return out;
}

/** A driver way's own analysis (its curves as it plays through its filter, its figures). */
function driverWayNamed(a: Analysis, name: string) {
  return driverWays(a).get(name) ?? null;
}

/**
 * The figures of way `index` of the design: its own when the analysis reports ways, else the
 * top-level ones when it is the first driver way (which they describe), else none.
 */
export function wayFigures(a: Analysis, doc: DesignDoc, index: number): Partial<Figures> | null {
  const name = doc.ways[index]?.name;
  const own = name === undefined ? null : driverWayNamed(a, name);
  if (own) return own.figures;
  return index === firstDriverIndex(doc) ? a.figures : null;
}

/** The same for curves. */
export function wayCurves(a: Analysis, doc: DesignDoc, index: number): WayCurvesView | null {
  const name = doc.ways[index]?.name;
  const own = name === undefined ? null : driverWayNamed(a, name);
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

/** The way whose amplifier channel falls furthest short of the planned level's programme peaks, or null. */
export function worstShortfall(an: Analysis | null): AmplifierShortfall | null {
  return an?.programme.shortfalls.reduce<AmplifierShortfall | null>((a, b) => (a && a.shortDb >= b.shortDb ? a : b), null) ?? null;
}
