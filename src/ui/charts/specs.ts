// What each chart shows, built from the two analyses. Pure data: no DOM, no drawing, no physics.
// SPL is the system sum at the seat; on demand each way is drawn beside it. Excursion, impedance
// and the other single-driver charts are the first driver way's (the woofer), plus each way on demand.
import type { Analysis, MaxSplLimit } from '../../engine/response/types.ts';
import type { SpeakerSystem } from '../../engine/system.ts';
import { PORT_SPEED_LIMIT } from '../engine.ts';
import { num, peakOf, TO_DISPLAY as K } from '../format.ts';
import { SLOTS, SLOT_LABEL, type Slot } from '../store.ts';
import { hasSum, sumOf, waysOf, type WayCurvesView } from '../analysis-view.ts';
import { firstDriverOf } from '../ways.ts';
import { amplifierPowerW, amplifierVolts, limitUse, type LimitUse } from '../../engine/response/limit-use.ts';

export type Role =
  | 'a'
  | 'b'
  | 'reference'
  | 'limit'
  | 'limit-a'
  | 'limit-b'
  | 'limit-hard'
  | 'limit-hard-a'
  | 'limit-hard-b'
  | 'a-aux'
  | 'b-aux'
  /** One way of a design, beside its sum. */
  | 'a-way'
  | 'b-way';

export interface SeriesSpec {
  label: string;
  role: Role;
  /** On the chart's own frequency grid; null = not available for this design. */
  values: ArrayLike<number> | null;
  /** The label with the design's name, for exported pictures. */
  longLabel?: string;
  /** Text beside the value in the hover readout (e.g. what limits max SPL). */
  annotate?: (index: number) => string;
}

export interface ChartSpec {
  id: ChartId;
  title: string;
  unit: string;
  digits: number;
  /** Fixed y range when the data would mislead otherwise. */
  yMin?: number;
  yMax?: number;
  freqHz: Float64Array;
  series: SeriesSpec[];
  /** The chart's key numbers as sentences (screen readers, text-only users, the print). */
  summary: string[];
  /** Shown instead of the chart when there is nothing to plot. */
  empty?: string;
}

export type ChartId =
  | 'spl'
  | 'excursion'
  | 'impedance'
  | 'phase'
  | 'group-delay'
  | 'port-speed'
  | 'max-spl'
  | 'outputs'
  | 'power'
  | 'limit-use'
  | DistortionChartId;
/** The distortion section's charts (components/DistortionPanel.tsx), drawn on request only. */
export type DistortionChartId = 'thd' | 'h3' | 'compression';

export const CHART_IDS: ChartId[] = [
  'spl',
  'excursion',
  'impedance',
  'phase',
  'group-delay',
  'port-speed',
  'max-spl',
  'outputs',
  'power',
  'limit-use',
];

export type GroupId = 'seat' | 'moves' | 'amplifier' | 'limits';

/** The Curves screen's charts by the question they answer, in the order shown. */
export const CHART_GROUPS: { id: GroupId; title: string; question: string; charts: ChartId[] }[] = [
  {
    id: 'seat',
    title: 'Bass at the seat',
    question: 'How loud and how deep each design plays where the listener sits, and how late its bass arrives there.',
    charts: ['spl', 'group-delay'],
  },
  {
    id: 'moves',
    title: 'What moves',
    question:
      'How far the cone (and any passive radiator) travels and how fast the port air moves at the planned level, and what cone and port each add at the seat.',
    charts: ['excursion', 'port-speed', 'outputs'],
  },
  {
    id: 'amplifier',
    title: 'What the amplifier sees',
    question: 'The load on the amplifier channel of the first driver way, and the power it delivers at the planned level.',
    charts: ['impedance', 'phase', 'power'],
  },
  {
    id: 'limits',
    title: 'Limits',
    question:
      'How loud each design can play at each frequency before something gives, and how much of each limit the planned level already uses.',
    charts: ['max-spl', 'limit-use'],
  },
];

/** A design's analysis and the system it was made for. */
export interface Model {
  analysis: Analysis;
  system: SpeakerSystem;
}
export type Pair = Record<Slot, Model | null>;

export interface ChartOptions {
  /** Draw each way beside the system sum. */
  showWays?: boolean;
  /** Build only these charts (in CHART_IDS order); all when absent. */
  only?: readonly ChartId[];
}

const LIMIT_TEXT: Record<MaxSplLimit, string> = {
  excursion: 'excursion',
  port: 'port air speed',
  thermal: 'coil heat',
  amplifier: 'amplifier',
  radiator: 'radiator travel',
};

/**
 * The charts' frequency grid: the wider of A's and B's (a design with a tweeter is analysed higher
 * up); the engine spaces every grid alike, so the other design's points fall on it or inside it.
 */
function grid(pair: Pair): Float64Array | null {
  const fa = pair.a?.analysis.curves.freqHz ?? null;
  const fb = pair.b?.analysis.curves.freqHz ?? null;
  if (!fa || !fb) return fa ?? fb;
  const span = (f: Float64Array) => Math.log(f[f.length - 1] / f[0]);
  return span(fb) > span(fa) ? fb : fa;
}

/**
 * Values of a design's curve on the shared grid, by nearest log frequency; outside the design's own
 * grid there is no value (NaN: a gap in the line, a dash in the tables).
 */
function onGrid(target: Float64Array, an: Analysis, values: ArrayLike<number> | null): ArrayLike<number> | null {
  if (!values) return null;
  const f = an.curves.freqHz;
  if (f === target || (f.length === target.length && f[0] === target[0] && f[f.length - 1] === target[target.length - 1])) return values;
  // The same curve on the same grid again (the other design was edited): the same array, so the
  // chart sees nothing changed.
  const hit = regridded.get(values as object);
  if (hit && hit.target === target) return hit.out;
  const out = new Float64Array(target.length);
  regridded.set(values as object, { target, out });
  // Half a grid step of slack at each end, so rounding never drops an end point.
  const slack = f.length > 1 ? Math.sqrt(f[1] / f[0]) : 1;
  let j = 0;
  for (let i = 0; i < target.length; i++) {
    if (target[i] < f[0] / slack || target[i] > f[f.length - 1] * slack) {
      out[i] = Number.NaN;
      continue;
    }
    while (j < f.length - 1 && Math.abs(Math.log(f[j + 1] / target[i])) <= Math.abs(Math.log(f[j] / target[i]))) j++;
    out[i] = values[j];
  }
  return out;
}

const regridded = new WeakMap<object, { target: Float64Array; out: Float64Array }>();

/** The first driver way's Xmax and Xlim in mm (where a single driver is meant). */
function limitsMm(m: Model): { xmax: number; xlim: number; re: number } {
  const w = firstDriverOf(m.system);
  return w ? { xmax: w.unit.xmax * K.mm, xlim: w.unit.xlim * K.mm, re: w.driver.re } : { xmax: NaN, xlim: NaN, re: NaN };
}

/** A constant line (a limit), the same array for the same length and value, so redraws skip it. */
const constants = new Map<string, Float64Array>();
function constant(n: number, v: number): Float64Array {
  const key = `${n}:${v}`;
  let c = constants.get(key);
  if (!c) {
    if (constants.size > 64) constants.clear();
    c = new Float64Array(n).fill(v);
    constants.set(key, c);
  }
  return c;
}

export function buildCharts(models: Pair, options: ChartOptions = {}): ChartSpec[] {
  const pair: Record<Slot, Analysis | null> = { a: models.a?.analysis ?? null, b: models.b?.analysis ?? null };
  const showWays = options.showWays ?? false;
  const f = grid(models);
  const wanted = (id: ChartId) => !options.only || options.only.includes(id);
  if (!f) {
    return CHART_IDS.filter(wanted).map((id) => ({
      id,
      title: TITLES[id],
      unit: '',
      digits: 3,
      freqHz: new Float64Array(0),
      series: [],
      summary: [],
      empty: 'Neither design is valid yet: fix the marked fields.',
    }));
  }
  const n = f.length;
  const per = (pick: (a: Analysis) => ArrayLike<number> | null, extra?: Partial<SeriesSpec>): SeriesSpec[] =>
    SLOTS.map((s) => {
      const an = pair[s];
      return {
        label: `${SLOT_LABEL[s]}`,
        longLabel: an ? `${SLOT_LABEL[s]}: ${models[s]!.system.name}` : undefined,
        role: s,
        values: an ? onGrid(f, an, pick(an)) : null,
        ...extra,
      };
    });
  /** Each way's own curve, when asked for and the analysis reports ways. */
  const perWay = (pick: (c: WayCurvesView) => ArrayLike<number> | null | undefined): SeriesSpec[] =>
    showWays
      ? SLOTS.flatMap((s) => {
          const an = pair[s];
          if (!an) return [];
          return waysOf(an).flatMap((w) => {
            const values = pick(w.curves);
            return values
              ? [
                  {
                    label: `${SLOT_LABEL[s]} ${w.name}`,
                    longLabel: `${SLOT_LABEL[s]}: ${models[s]!.system.name}, ${w.name}`,
                    role: `${s}-way` as Role,
                    values: onGrid(f, an, values),
                  },
                ]
              : [];
          });
        })
      : [];
  const present = SLOTS.filter((s) => pair[s] !== null) as Slot[];
  const fig = (s: Slot) => pair[s]!.figures;
  const sys = (s: Slot) => models[s]!.system;
  const sum = (s: Slot) => sumOf(pair[s]!);

  // SPL at the seat, with each design's ideal flat reference.
  const spl: ChartSpec = {
    id: 'spl',
    title: TITLES.spl,
    unit: 'dB',
    digits: 3,
    freqHz: f,
    series: [...per((a) => sumOf(a).splDb), ...referenceSeries(pair, f), ...perWay((c) => c.splDb), ...measuredSeries(models, f)],
    summary: present.map((s) => {
      const g = { ...fig(s), ...sum(s).figures };
      const ways = sys(s).ways.length;
      return `${SLOT_LABEL[s]}${ways > 1 && hasSum(pair[s]!) ? ` (sum of ${ways} ways)` : ''}: −3 dB at ${num(g.f3Hz, 3)} Hz, −10 dB at ${num(g.f10Hz, 3)} Hz; passband ${num(g.passbandSplDb, 3)} dB at ${num(sys(s).listening.distance, 2)} m for ${num(pair[s]!.driveV, 3)} V.`;
    }),
  };

  // Excursion at the planned level against the limits.
  const exSeries = per((a) => a.curves.plannedExcursionMm);
  for (const s of SLOTS) {
    const an = pair[s];
    if (an?.curves.radiatorExcursionMm)
      exSeries.push({ label: `${SLOT_LABEL[s]} radiator`, role: `${s}-aux` as Role, values: onGrid(f, an, an.curves.radiatorExcursionMm) });
  }
  exSeries.push(
    ...perWay((c) => c.plannedExcursionMm),
    ...limitLines(models, n, (m) => limitsMm(m).xmax, 'Xmax ±', 'limit'),
    ...limitLines(models, n, (m) => limitsMm(m).xlim, 'Xlim ±', 'limit-hard'),
  );
  const excursion: ChartSpec = {
    id: 'excursion',
    title: TITLES.excursion,
    unit: 'mm',
    digits: 3,
    yMin: 0,
    freqHz: f,
    series: exSeries,
    summary: present.map((s) => {
      const pk = peakOf(pair[s]!.curves.plannedExcursionMm);
      const xmax = limitsMm(models[s]!).xmax;
      const woofer = firstDriverOf(sys(s))?.name ?? '';
      return pk
        ? `${SLOT_LABEL[s]}${sys(s).ways.length > 1 ? ` ${woofer}` : ''}: peak ${num(pk.value, 3)} mm at ${num(pair[s]!.curves.freqHz[pk.index], 3)} Hz, a sine at the planned level's drive (${num(fig(s).plannedVoltsRms, 3)} V rms, ${num(fig(s).plannedSplDb, 3)} dB(C) of programme at the seat); Xmax ${num(xmax, 3)} mm${pk.value > xmax ? ' — exceeded' : ''}.`
        : `${SLOT_LABEL[s]}: no excursion data.`;
    }),
  };

  const impedance: ChartSpec = {
    id: 'impedance',
    title: TITLES.impedance,
    unit: 'Ω',
    digits: 3,
    yMin: 0,
    freqHz: f,
    series: [...per((a) => a.curves.impedanceOhm), ...perWay((c) => c.impedanceOhm)],
    summary: present.map(
      (s) =>
        `${SLOT_LABEL[s]}: minimum ${num(fig(s).zMinOhm, 3)} Ω at ${num(fig(s).zMinHz, 3)} Hz (Re ${num(limitsMm(models[s]!).re, 3)} Ω).`,
    ),
  };

  const phase: ChartSpec = {
    id: 'phase',
    title: TITLES.phase,
    unit: '°',
    digits: 3,
    yMin: -90,
    yMax: 90,
    freqHz: f,
    series: per((a) => a.curves.phaseDeg),
    summary: present.map((s) => {
      const c = pair[s]!.curves.phaseDeg;
      let lo = Infinity;
      let hi = -Infinity;
      for (let i = 0; i < c.length; i++) {
        lo = Math.min(lo, c[i]);
        hi = Math.max(hi, c[i]);
      }
      return `${SLOT_LABEL[s]}: phase between ${num(lo, 3)}° and ${num(hi, 3)}°.`;
    }),
  };

  const groupDelay: ChartSpec = {
    id: 'group-delay',
    title: TITLES['group-delay'],
    unit: 'ms',
    digits: 3,
    freqHz: f,
    series: per((a) => a.curves.groupDelayMs),
    summary: present.map((s) => `${SLOT_LABEL[s]}: ${num(fig(s).groupDelay40Ms, 3)} ms at 40 Hz.`),
  };

  const anyPort = present.some((s) => pair[s]!.curves.plannedPortAirSpeed !== null);
  const portSpeed: ChartSpec = {
    id: 'port-speed',
    title: TITLES['port-speed'],
    unit: 'm/s',
    digits: 3,
    yMin: 0,
    freqHz: f,
    series: anyPort
      ? [
          ...per((a) => a.curves.plannedPortAirSpeed),
          ...perWay((c) => c.plannedPortAirSpeed),
          { label: `limit ${PORT_SPEED_LIMIT} m/s`, role: 'limit', values: constant(n, PORT_SPEED_LIMIT) },
        ]
      : [],
    summary: present.map((s) => {
      const pk = peakOf(pair[s]!.curves.plannedPortAirSpeed);
      return pk
        ? `${SLOT_LABEL[s]}: peak ${num(pk.value, 3)} m/s at ${num(pair[s]!.curves.freqHz[pk.index], 3)} Hz at the planned level (limit ${PORT_SPEED_LIMIT} m/s${pk.value > PORT_SPEED_LIMIT ? ', exceeded' : ''}).`
        : `${SLOT_LABEL[s]}: no port.`;
    }),
    empty: anyPort ? undefined : 'Neither design has a port.',
  };

  const maxSpl: ChartSpec = {
    id: 'max-spl',
    title: TITLES['max-spl'],
    unit: 'dB',
    digits: 3,
    freqHz: f,
    series: SLOTS.map((s) => {
      const an = pair[s];
      const lim = an?.curves.maxSplLimit;
      return {
        label: SLOT_LABEL[s],
        longLabel: an ? `${SLOT_LABEL[s]}: ${models[s]!.system.name}` : undefined,
        role: s,
        values: an ? onGrid(f, an, an.curves.maxSplDb) : null,
        annotate: lim && an && an.curves.freqHz.length === n ? (i: number) => LIMIT_TEXT[lim[i]] ?? '' : undefined,
      };
    }),
    summary: present.map((s) => {
      const c = pair[s]!.curves;
      const i40 = nearest(c.freqHz, 40);
      const i100 = nearest(c.freqHz, 100);
      return `${SLOT_LABEL[s]}: ${num(c.maxSplDb[i40], 3)} dB at 40 Hz (${LIMIT_TEXT[c.maxSplLimit[i40]]}), ${num(c.maxSplDb[i100], 3)} dB at 100 Hz (${LIMIT_TEXT[c.maxSplLimit[i100]]}).`;
    }),
  };

  const built: ChartSpec[] = [spl, excursion, impedance, phase, groupDelay, portSpeed, maxSpl];
  if (wanted('outputs')) built.push(outputsChart(models, f));
  if (wanted('power')) built.push(powerChart(models, f));
  if (wanted('limit-use')) built.push(limitUseChart(models, f));
  return built.filter((c) => wanted(c.id));
}

/** The first driver way's power and limit shares at the planned level, once per analysis. */
const perAnalysis = new WeakMap<Analysis, { powerW: Float64Array; use: LimitUse } | null>();
function plannedLoad(m: Model) {
  let hit = perAnalysis.get(m.analysis);
  if (hit === undefined) {
    const w = firstDriverOf(m.system);
    const volts = m.analysis.figures.plannedVoltsRms;
    // The amplifier's output through the way's filter, once for both figures.
    const drive = w ? amplifierVolts(w, m.analysis.curves.freqHz, volts) : null;
    hit =
      w && drive
        ? { powerW: amplifierPowerW(w, m.analysis.curves, volts, drive), use: limitUse(m.system, w, m.analysis.curves, volts, drive) }
        : null;
    perAnalysis.set(m.analysis, hit);
  }
  return hit;
}

const present = (models: Pair) => SLOTS.filter((s) => models[s] !== null);

function outputsChart(models: Pair, f: Float64Array): ChartSpec {
  const series: SeriesSpec[] = [];
  for (const s of present(models)) {
    const an = models[s]!.analysis;
    series.push({ label: `${SLOT_LABEL[s]} cone`, role: s, values: onGrid(f, an, an.curves.coneSplDb) });
    if (an.curves.portSplDb)
      series.push({
        label: `${SLOT_LABEL[s]} ${an.curves.radiatorExcursionMm ? 'radiator' : 'port'}`,
        role: `${s}-aux` as Role,
        values: onGrid(f, an, an.curves.portSplDb),
      });
  }
  return {
    id: 'outputs',
    title: TITLES.outputs,
    unit: 'dB',
    digits: 3,
    freqHz: f,
    series,
    summary: present(models).flatMap((s) => {
      const c = models[s]!.analysis.curves;
      const pk = peakOf(c.portSplDb);
      const lines = [
        pk
          ? `${SLOT_LABEL[s]}: the ${c.radiatorExcursionMm ? 'radiator' : 'port'} is loudest at ${num(c.freqHz[pk.index], 3)} Hz (${num(pk.value, 3)} dB), where it carries the bass.`
          : `${SLOT_LABEL[s]}: only the cone radiates (no port or radiator).`,
      ];
      // A measurement at the seat holds the cone and the port together: it cannot say which of them it corrects.
      if (models[s]!.system.ways.some((w) => w.kind === 'driver' && w.measured))
        lines.push(
          pk
            ? `${SLOT_LABEL[s]}: these curves are the model's. A measured response corrects only the way's total sound at the seat: a measurement there cannot tell the cone's share from the ${c.radiatorExcursionMm ? 'radiator' : 'port'}'s.`
            : `${SLOT_LABEL[s]}: this curve is the model's. A measured response corrects the way's total sound at the seat, shown with the responses.`,
        );
      return lines;
    }),
  };
}

function powerChart(models: Pair, f: Float64Array): ChartSpec {
  const series: SeriesSpec[] = present(models).map((s) => ({
    label: SLOT_LABEL[s],
    longLabel: `${SLOT_LABEL[s]}: ${models[s]!.system.name}`,
    role: s,
    values: onGrid(f, models[s]!.analysis, plannedLoad(models[s]!)?.powerW ?? null),
  }));
  return {
    id: 'power',
    title: TITLES.power,
    unit: 'W',
    digits: 3,
    yMin: 0,
    freqHz: f,
    series,
    summary: present(models).map((s) => {
      const pk = peakOf(plannedLoad(models[s]!)?.powerW);
      const an = models[s]!.analysis;
      return pk
        ? `${SLOT_LABEL[s]}: at most ${num(pk.value, 3)} W at ${num(an.curves.freqHz[pk.index], 3)} Hz for a sine at ${num(an.figures.plannedVoltsRms, 3)} V rms; the amplifier gives ${num(models[s]!.system.amplifier.power, 3)} W into ${num(models[s]!.system.amplifier.load, 2)} Ω.`
        : `${SLOT_LABEL[s]}: no driver way.`;
    }),
  };
}

function limitUseChart(models: Pair, f: Float64Array): ChartSpec {
  const series: SeriesSpec[] = [];
  const summary: string[] = [];
  for (const s of present(models)) {
    const an = models[s]!.analysis;
    const use = plannedLoad(models[s]!)?.use;
    if (!use) continue;
    series.push({ label: `${SLOT_LABEL[s]} cone travel of Xmax`, role: s, values: onGrid(f, an, use.excursionPct) });
    if (use.portPct)
      series.push({
        label: `${SLOT_LABEL[s]} port air of ${PORT_SPEED_LIMIT} m/s`,
        role: `${s}-aux` as Role,
        values: onGrid(f, an, use.portPct),
      });
    if (use.heatPct)
      series.push({ label: `${SLOT_LABEL[s]} coil heat of Pe`, role: `${s}-way` as Role, values: onGrid(f, an, use.heatPct) });
    const parts = [
      ['cone travel', peakOf(use.excursionPct)],
      ['port air speed', peakOf(use.portPct)],
      ['coil heat', peakOf(use.heatPct)],
    ] as const;
    const worst = parts.filter(([, p]) => p).sort((x, y) => y[1]!.value - x[1]!.value)[0];
    if (worst)
      summary.push(
        `${SLOT_LABEL[s]}: ${worst[0]} comes closest, ${num(worst[1]!.value, 3)} % of its limit at ${num(an.curves.freqHz[worst[1]!.index], 3)} Hz${worst[1]!.value > 100 ? ' — over it' : ''}.`,
      );
  }
  if (series.length) series.push({ label: 'the limit, 100 %', role: 'limit', values: constant(f.length, 100) });
  return { id: 'limit-use', title: TITLES['limit-use'], unit: '%', digits: 3, yMin: 0, freqHz: f, series, summary };
}

export const TITLES: Record<ChartId, string> = {
  spl: 'SPL at the seat',
  excursion: 'Cone excursion at the planned level',
  impedance: 'Impedance magnitude',
  phase: 'Impedance phase',
  'group-delay': 'Group delay',
  'port-speed': 'Port air speed at the planned level',
  'max-spl': 'Maximum SPL at the seat',
  outputs: 'Cone and port, each alone at the seat',
  power: 'Power from the amplifier at the planned level',
  'limit-use': 'Share of each limit used at the planned level',
  thd: 'Total harmonic distortion',
  h3: 'Third harmonic',
  compression: 'Compression of the fundamental',
};

function nearest(f: Float64Array, hz: number) {
  let best = 0;
  for (let i = 0; i < f.length; i++) if (Math.abs(Math.log(f[i] / hz)) < Math.abs(Math.log(f[best] / hz))) best = i;
  return best;
}

function referenceSeries(pair: Record<Slot, Analysis | null>, f: Float64Array): SeriesSpec[] {
  const refs = SLOTS.filter((s) => pair[s] !== null).map((s) => ({ s, v: onGrid(f, pair[s]!, pair[s]!.curves.referenceSplDb)! }));
  if (refs.length === 2 && sameValues(refs[0].v, refs[1].v)) return [{ label: 'ideal', role: 'reference', values: refs[0].v }];
  return refs.map((r) => ({ label: `${SLOT_LABEL[r.s]} ideal`, role: 'reference' as Role, values: r.v }));
}

/** Each way's measured response beside the curves (a way with a measured table only). */
function measuredSeries(models: Pair, f: Float64Array): SeriesSpec[] {
  return SLOTS.flatMap((s) => {
    const an = models[s]?.analysis;
    if (!an) return [];
    return waysOf(an).flatMap((w) =>
      w.curves.measuredSplDb
        ? [
            {
              label: `${SLOT_LABEL[s]} measured ${w.name}`,
              longLabel: `${SLOT_LABEL[s]}: ${models[s]!.system.name}, ${w.name} as measured`,
              role: `${s}-aux` as Role,
              values: onGrid(f, an, w.curves.measuredSplDb),
            },
          ]
        : [],
    );
  });
}

function limitLines(pair: Pair, n: number, pick: (m: Model) => number, label: string, role: 'limit' | 'limit-hard'): SeriesSpec[] {
  const vals = SLOTS.filter((s) => pair[s] !== null).map((s) => ({ s, v: pick(pair[s]!) }));
  if (vals.length === 2 && Math.abs(vals[0].v - vals[1].v) < 1e-9) return [{ label, role, values: constant(n, vals[0].v) }];
  return vals.map((x) => ({ label: `${SLOT_LABEL[x.s]} ${label}`, role: `${role}-${x.s}` as Role, values: constant(n, x.v) }));
}

function sameValues(a: ArrayLike<number>, b: ArrayLike<number>) {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (Math.abs(a[i] - b[i]) > 1e-9) return false;
  return true;
}
