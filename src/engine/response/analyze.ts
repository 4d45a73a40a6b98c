// Small-signal analysis of one design: each driver way's curves and figures, and the summed output
// of all ways at the seat.
import { crossoverFigures } from './crossover-figures.ts';
import type { Box, DriverWay, SpeakerSystem, Way } from '../system.ts';
import { BOX_KINDS } from '../box/index.ts';
import type { BoxFigure, BoxProbe } from '../box/physics.ts';
import { PORT_SPEED_LIMIT, SENSITIVITY_VOLTS, splDb } from '../units.ts';
import { abs, add, arg, cx, div, hypot, mul, scale, type Complex } from '../complex.ts';
import { error, fmt, warning, type Issue } from '../issues.ts';
import { type AmplifierShortfall, amplifierShortfalls, programmeLeqCPerVolt, programmeVoltsRms } from '../level/programme.ts';
import {
  drivenPressure,
  offsetDelay,
  passbandPressure,
  placedInSum,
  respond,
  sineParts,
  systemPressure,
  wayPressure,
  type SineParts,
} from './frequency.ts';
import { byContent } from './by-content.ts';
import { ladderInputImpedance, ladderStates, ladderThevenin, partLabel, partPower } from './ladder.ts';
import { delayAt, wayFilterAt } from '../filters/way-filter.ts';
import type { Analysis, Curves, Figures, MaxSplLimit, NetworkCurves, PartFigure, SumAnalysis, SumCurves, WayAnalysis } from './types.ts';
import { sealedAlignment } from '../box/sealed.ts';
import { qesWithSeries, totalQ } from '../driver.ts';
import { roomAnalysis } from '../room/analysis.ts';
import { measuredSplOnGrid } from './measured-points.ts';

/** "-3 dB" is the half-power point, 10·log10(2) = 3.0103 dB down, as in the published F3 tables. */
export const HALF_POWER_DB = 10 * Math.log10(2);

export interface AnalyzeOptions {
  /** Drive for the curves, V rms at the amplifier; default 2.83. */
  driveV?: number;
  fMinHz?: number;
  /** Default 2 kHz for a design with one driver way (the first version's grid), 20 kHz with more. */
  fMaxHz?: number;
  pointsPerOctave?: number;
}

export { PORT_SPEED_LIMIT, SENSITIVITY_VOLTS, splDb };

export function logGrid(fMin: number, fMax: number, perOctave: number): Float64Array {
  const last = lastGrids.find((g) => g.fMin === fMin && g.fMax === fMax && g.perOctave === perOctave);
  // A copy: the caller owns its grid (an analysis keeps it as its curves' frequencies).
  if (last) return last.grid.slice();
  const n = Math.ceil(Math.log2(fMax / fMin) * perOctave) + 1;
  const grid = new Float64Array(n);
  for (let k = 0; k < n; k++) grid[k] = fMin * 2 ** (Math.log2(fMax / fMin) * (k / (n - 1)));
  lastGrids.unshift({ fMin, fMax, perOctave, grid });
  lastGrids.length = Math.min(lastGrids.length, 4);
  return grid.slice();
}
/** The last few grids made: every analysis makes the same two or three (a power per point each). */
const lastGrids: { fMin: number; fMax: number; perOctave: number; grid: Float64Array }[] = [];

/** The first driver way: the first version's woofer, and the way the single-way views show. */
export function firstDriverWay(system: SpeakerSystem): DriverWay {
  const way = system.ways.find((w): w is DriverWay => w.kind === 'driver');
  if (!way) throw new Error('a system has at least one driver way');
  return way;
}

/** The way with its low-pass left out: its low end as the box and the high-pass shape it. */
export const withoutLowpass = (way: DriverWay): DriverWay => ({ ...way, filter: { ...way.filter, lowpass: null } });

/** The way with no filter at all: the drivers in their box alone. */
export const unfiltered = (way: DriverWay): DriverWay => ({
  ...way,
  filter: { type: 'active', highpass: null, lowpass: null, gain: 1, delay: 0 },
});

/**
 * A passive way's network acting on its drivers' passband, per source volt relative to the drivers
 * wired straight to the amplifier: the drivers taken as their resistance Re (well above resonance,
 * below the coil's inductance), so this is what the network alone does to the way's level and phase.
 * 1 for an active way.
 */
export function networkFlatAt(system: SpeakerSystem, way: Way, w: number): Complex {
  if (way.kind !== 'driver' || !way.network) return cx(1);
  const rs = system.amplifier.rs;
  const th = ladderThevenin(way.network, w, rs);
  return scale(div(th.gain, add(th.z, cx(way.driver.re))), way.driver.re + rs);
}

/** Relative frequency step of the group-delay difference quotient. */
const GD_EPS = 1e-4;

/** Group delay -d(phase)/dw from the ratio of the responses at f·(1 -/+ GD_EPS) (no unwrapping needed). */
const groupDelayFrom = (below: Complex, above: Complex, f: number): number => -arg(div(above, below)) / (2 * Math.PI * f * 2 * GD_EPS);

function groupDelayOf(pressure: (f: number) => Complex, f: number): number {
  return groupDelayFrom(pressure(f * (1 - GD_EPS)), pressure(f * (1 + GD_EPS)), f);
}

const wayGroupDelay = (system: SpeakerSystem, way: DriverWay, f: number) => groupDelayOf((x) => respond(system, way, x, 1).pressure, f);
const sumGroupDelay = (system: SpeakerSystem, f: number) => groupDelayOf((x) => systemPressure(system, x, 1), f);

/**
 * Every way's pressure as it enters the sum (`wayPressure`) on the grid and just below and above
 * each grid frequency, for the sum and the group delays: each evaluated once. Kept as numbers
 * (real and imaginary parts in turn), not objects, since the analysis keeps them across edits.
 */
interface Placed {
  below: Float64Array;
  at: Float64Array;
  above: Float64Array;
}

/** The k-th complex value of an array of real and imaginary parts in turn. */
const complexAt = (parts: Float64Array, k: number): Complex => ({ re: parts[2 * k], im: parts[2 * k + 1] });

function complexParts(n: number, value: (k: number) => Complex): Float64Array {
  const out = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    const z = value(k);
    out[2 * k] = z.re;
    out[2 * k + 1] = z.im;
  }
  return out;
}

/** A driver way's curves that do not depend on the planned level. */
type GridCurves = Omit<Curves, 'freqHz' | 'referenceSplDb' | 'plannedExcursionMm' | 'plannedPortAirSpeed' | 'network' | 'measuredSplDb'>;

/**
 * What one way gives on the grid whatever the planned level and the other ways: its place in the sum
 * and, for a driver way, its curves at the analysis drive and its largest sine at each frequency
 * (the costliest figure: the coil heated to equilibrium at every limit).
 */
interface WayOnGrid {
  placed: Placed;
  curves: GridCurves | null;
}

function wayOnGrid(system: SpeakerSystem, way: Way, freqHz: Float64Array, volts: number): WayOnGrid {
  const n = freqHz.length;
  const placed: Placed = {
    below: complexParts(n, (k) => wayPressure(system, way, freqHz[k] * (1 - GD_EPS), volts)),
    at: new Float64Array(2 * n),
    above: complexParts(n, (k) => wayPressure(system, way, freqHz[k] * (1 + GD_EPS), volts)),
  };
  if (way.kind !== 'driver') {
    placed.at = complexParts(n, (k) => wayPressure(system, way, freqHz[k], volts));
    return { placed, curves: null };
  }
  const { box } = way;
  const probe = BOX_KINDS[box.type].probe(box);
  const curves: GridCurves = {
    splDb: new Float64Array(n),
    coneSplDb: new Float64Array(n),
    portSplDb: box.type !== 'sealed' ? new Float64Array(n) : null,
    excursionMm: new Float64Array(n),
    radiatorExcursionMm: probe?.kind === 'radiator' ? new Float64Array(n) : null,
    impedanceOhm: new Float64Array(n),
    phaseDeg: new Float64Array(n),
    groupDelayMs: new Float64Array(n),
    portAirSpeed: probe?.kind === 'port-speed' ? new Float64Array(n) : null,
    maxSplDb: new Float64Array(n),
    maxSplLimit: new Array<MaxSplLimit>(n),
  };
  for (let k = 0; k < n; k++) {
    const f = freqHz[k];
    const r = respond(system, way, f, volts);
    const at = placedInSum(system, way, r.pressure, f);
    placed.at[2 * k] = at.re;
    placed.at[2 * k + 1] = at.im;
    curves.splDb[k] = splDb(abs(r.pressure));
    curves.coneSplDb[k] = splDb(abs(r.conePressure));
    if (curves.portSplDb) curves.portSplDb[k] = splDb(abs(r.outletPressure));
    curves.excursionMm[k] = Math.SQRT2 * abs(r.excursion) * 1000;
    const stress = outletStress(box, abs(r.outletFlow), 2 * Math.PI * f);
    if (curves.radiatorExcursionMm && stress) curves.radiatorExcursionMm[k] = stress.value;
    // What the amplifier sees: the drivers, or their network loaded by them.
    const load = way.network ? ladderInputImpedance(way.network, 2 * Math.PI * f, r.impedance) : r.impedance;
    curves.impedanceOhm[k] = abs(load);
    curves.phaseDeg[k] = (arg(load) * 180) / Math.PI;
    // The way as placed in the sum, less its offset's pure delay (polarity leaves the delay alone).
    curves.groupDelayMs[k] = (groupDelayFrom(complexAt(placed.below, k), complexAt(placed.above, k), f) - offsetDelay(system, way)) * 1000;
    if (curves.portAirSpeed && stress) curves.portAirSpeed[k] = stress.value;
    const lim = maxSine(system, way, f);
    curves.maxSplDb[k] = splDb(lim.pa);
    curves.maxSplLimit[k] = lim.limit;
  }
  return { placed, curves };
}

/** The last ways on their grids, by everything they depend on: an edit recomputes only the ways it touched. */
const waysOnGrid = byContent<WayOnGrid>(16);

function waysOnGridOf(system: SpeakerSystem, freqHz: Float64Array, grid: number[], volts: number): WayOnGrid[] {
  // The planned level and the room shape none of it (the room acts on the sum, room/analysis.ts).
  const { level: _level, room: _room, ...listening } = system.listening;
  return system.ways.map((way) =>
    waysOnGrid([way, system.air, system.amplifier, listening, volts, grid], () => wayOnGrid(system, way, freqHz, volts)),
  );
}

/**
 * The passband pressure of the whole system per amplifier volt, Pa/V at `distance`: each way
 * replaced by its flat passband level (Small's reference efficiency; a flat way's own level) through
 * its filter, polarity and offset, summed, and the median magnitude taken over 20 Hz to 20 kHz:
 * the level most of the band sits at. A Linkwitz-Riley split of ways at one level sums all-pass,
 * so this is exactly that level; a first-version design keeps its woofer's passband.
 */
export function sumPassbandPerVolt(system: SpeakerSystem, distance = system.listening.distance): number {
  const grid = logGrid(20, 20000, 12);
  const levels = Array.from(grid, (f) => {
    const w = 2 * Math.PI * f;
    let sum = cx(0);
    for (const way of system.ways) {
      const h = mul(mul(wayFilterAt(way.filter, w), networkFlatAt(system, way, w)), delayAt(w, offsetDelay(system, way)));
      sum = add(sum, scale(h, way.polarity * passbandPressure(system, way, 1, distance)));
    }
    return abs(sum);
  }).sort((a, b) => a - b);
  return levels[(levels.length - 1) / 2];
}

/**
 * Amplifier volts (rms) for the planned level: the programme stand-in's (level/programme.ts), whose
 * long-term C-weighted level at the seat is the planned SPL, or whose peaks reach the planned volts
 * at full scale. The renders use the track's own Leq,C the same way.
 */
export function plannedVoltsRms(system: SpeakerSystem, programmeLeqCPerVoltDb?: number): number {
  return programmeVoltsRms(system, programmeLeqCPerVoltDb);
}

/**
 * The frequency where `relDb(f)` first falls under -dropDb, scanning downward from `startHz` (well
 * inside the passband); refined by bisection.
 */
function rolloff(relDb: (f: number) => number, startHz: number, dropDb: number): number {
  let prev = startHz;
  const step = 2 ** (-1 / 48);
  for (let f = prev * step; f > 0.5; f *= step) {
    if (relDb(f) < -dropDb) {
      let lo = f;
      let hi = prev;
      for (let k = 0; k < 60; k++) {
        const mid = Math.sqrt(lo * hi);
        if (relDb(mid) < -dropDb) lo = mid;
        else hi = mid;
      }
      return Math.sqrt(lo * hi);
    }
    prev = f;
  }
  return 0.5;
}

/**
 * A way's passband level through its filter's gain, Pa per amplifier volt at the seat; through a
 * passive network, at the network's most open point from 20 Hz to 20 kHz (its pads and its
 * inductors' winding resistance count).
 */
function wayPassbandPerVolt(system: SpeakerSystem, way: DriverWay): number {
  let open = 1;
  if (way.network) {
    open = 0;
    for (const f of logGrid(20, 20000, 12)) open = Math.max(open, abs(networkFlatAt(system, way, 2 * Math.PI * f)));
  }
  return passbandPressure(system, way, 1) * Math.abs(way.filter.gain) * open;
}

/** Where the scan for a way's low end starts: well above its resonance and its high-pass corner. */
const scanStartHz = (system: SpeakerSystem, way: DriverWay) =>
  Math.max(4 * Math.max(way.driver.fs, boxFigures(system, way).fbHz ?? 0), 2 * (way.filter.highpass?.hz ?? 0));

/**
 * Where a way's anechoic low end first falls `dropDb` under its passband level (its high-pass,
 * gain and delay included, its low-pass left out).
 */
export function rolloffHz(system: SpeakerSystem, way: DriverWay, dropDb: number): number {
  return rolloffsHz(system, way, [dropDb])[0];
}

/** `rolloffHz` for several drops at once: the way's level at each frequency solved once for all. */
export function rolloffsHz(system: SpeakerSystem, way: DriverWay, dropsDb: number[]): number[] {
  const low = withoutLowpass(way);
  const level = remembered((f: number) => splDb(abs(drivenPressure(system, low, f, 1, false))));
  const scanFrom = scanStartHz(system, way);
  const passband = splDb(wayPassbandPerVolt(system, way));
  let fromPeak: { start: number; ref: number } | null = null;
  const bandPeak = () => {
    // The box itself rolls the top off (a bandpass box): measure from the band's own peak, when it
    // stays under the passband level of the drivers, and scan down from there.
    let start = scanFrom;
    const step = 2 ** (1 / 48);
    let peak = -Infinity;
    for (let f = start; f > start / 64; f /= step) {
      const l = level(f);
      if (l > peak) [peak, start] = [l, f];
    }
    // Golden-section search between the grid neighbours of the highest grid point.
    let lo = Math.log(start / step);
    let hi = Math.log(start * step);
    const g = (Math.sqrt(5) - 1) / 2;
    for (let k = 0; k < 40; k++) {
      const a = hi - g * (hi - lo);
      const b = lo + g * (hi - lo);
      if (level(Math.exp(a)) > level(Math.exp(b))) hi = b;
      else lo = a;
    }
    start = Math.exp((lo + hi) / 2);
    return { start, ref: Math.min(passband, Math.max(peak, level(start))) };
  };
  return dropsDb.map((dropDb) => {
    let [start, ref] = [scanFrom, passband];
    if (level(start) - ref < -dropDb) {
      fromPeak ??= bandPeak();
      [start, ref] = [fromPeak.start, fromPeak.ref];
    }
    return rolloff((f) => level(f) - ref, start, dropDb);
  });
}

/** `fn` with its results kept by argument: the rolloff scans of several drops step through the same frequencies. */
function remembered(fn: (f: number) => number): (f: number) => number {
  const kept = new Map<number, number>();
  return (f) => {
    let v = kept.get(f);
    if (v === undefined) {
      v = fn(f);
      kept.set(f, v);
    }
    return v;
  };
}

/**
 * The sum's low end: the lowest frequency where the anechoic sum comes within `dropDb` of its
 * passband level, scanning up from 0.5 Hz (so a dip where the ways cross over, which the sum's
 * curve shows, does not hide how deep the system reaches); refined by bisection.
 */
export function sumRolloffHz(system: SpeakerSystem, dropDb: number, sumPerVolt = sumPassbandPerVolt(system)): number {
  return sumRolloffsHz(system, [dropDb], sumPerVolt)[0];
}

/** `sumRolloffHz` for several drops at once: the sum at each frequency solved once for all. */
function sumRolloffsHz(system: SpeakerSystem, dropsDb: number[], sumPerVolt: number): number[] {
  const ref = splDb(sumPerVolt);
  const rel = remembered((f: number) => splDb(abs(systemPressure(system, f, 1, false))) - ref);
  return dropsDb.map((dropDb) => firstWithin(rel, dropDb));
}

function firstWithin(rel: (f: number) => number, dropDb: number): number {
  const step = 2 ** (1 / 24);
  let prev = 0.5;
  if (rel(prev) >= -dropDb) return prev;
  for (let f = prev * step; f < 40000; f *= step) {
    if (rel(f) >= -dropDb) {
      let lo = prev;
      let hi = f;
      for (let k = 0; k < 60; k++) {
        const mid = Math.sqrt(lo * hi);
        if (rel(mid) >= -dropDb) hi = mid;
        else lo = mid;
      }
      return Math.sqrt(lo * hi);
    }
    prev = f;
  }
  return Number.NaN;
}

/** Small's reference efficiency eta0 = rho·Bl^2·Sd^2 / (2 pi·c·Re·Mms^2) (half space). */
export function referenceEfficiency(system: SpeakerSystem, way: DriverWay): number {
  const { air } = system;
  const d = way.driver;
  return (air.rho * d.bl * d.bl * d.sd * d.sd) / (2 * Math.PI * air.c * d.re * d.mms * d.mms);
}

// --- What the box kind adds: its figures and its stress probe in small-signal form. ---

/** The box kind's own figures, and a closed box's fc and Qtc, which depend on the driver (Small 1972). */
function boxFigures(system: SpeakerSystem, way: DriverWay): Pick<Figures, 'fcHz' | 'qtc' | 'fbHz' | 'fpHz' | 'portLengthCm' | 'box'> {
  const { box, driver } = way;
  const own: BoxFigure[] = BOX_KINDS[box.type].figures(box, system.air);
  const byId = (id: string) => own.find((x) => x.id === id)?.value ?? null;
  const rs = system.amplifier.rs;
  const sealed =
    box.type === 'sealed'
      ? sealedAlignment(driver.fs, totalQ(qesWithSeries(driver.qes, driver.re, rs), driver.qms), driver.vas, box.vb)
      : null;
  return {
    fcHz: sealed ? sealed.fc : null,
    qtc: sealed ? sealed.qtc : null,
    fbHz: byId('fb'),
    fpHz: byId('fp'),
    portLengthCm: byId('port-length'),
    box: own,
  };
}

/**
 * The box's stress for an rms outlet flow at w, as its kind's probe measures it in the
 * large-signal model (peak values): port air speed in m/s, or radiator travel in mm.
 */
function outletStress(box: Box, outletFlow: number, w: number): { kind: BoxProbe['kind']; value: number; limit: number } | null {
  const probe = BOX_KINDS[box.type].probe(box);
  if (!probe) return null;
  // The port probe reads the ports' volume velocity |U|; the radiator's reads its excursion |U|/(w·Sp).
  const quantity = probe.kind === 'port-speed' ? outletFlow : box.type === 'passive-radiator' ? outletFlow / (w * box.sp) : Number.NaN;
  return { kind: probe.kind, value: Math.SQRT2 * quantity * probe.toUnit, limit: probe.limit };
}

/** The way with its coil `riseK` kelvin above ambient (Re(T) = Re0·(1 + alpha_R·ΔT), REFERENCES). */
function hotWay(way: DriverWay, riseK: number): DriverWay {
  if (riseK === 0) return way;
  const d = way.driver;
  return { ...way, driver: { ...d, re: d.re * (1 + d.thermal.alphaR * riseK) } };
}

/**
 * One copy of a way whose coil resistance is set in place (`heat`), for the heating steps of
 * `maxSine`: a copy of the way and its driver per step was most of what those steps cost. Only for
 * a way without a measured response, whose correction is kept by the table and built against the
 * way first asked for (response/measured.ts): a copy changed later must not be that way. A design's
 * way is never changed, so its copy stays right for as long as the way lives.
 */
const heated = new WeakMap<DriverWay, DriverWay>();
function heat(way: DriverWay, riseK: number): DriverWay {
  if (riseK === 0 || way.measured) return hotWay(way, riseK);
  let hot = heated.get(way);
  if (!hot) {
    hot = { ...way, driver: { ...way.driver } };
    heated.set(way, hot);
  }
  const d = way.driver;
  // The same expression as hotWay's, so the same resistance to the last bit.
  hot.driver.re = d.re * (1 + d.thermal.alphaR * riseK);
  return hot;
}

/** Power in the coil's resistance, W, for a coil current (rms). */
const coilPower = (way: DriverWay, current: number) => current ** 2 * way.driver.re;

/** The response parts each heating step reads, filled in place (maxSine runs one at a time). */
const step: SineParts = { pressure: 0, excursion: 0, outletFlow: 0, current: 0 };

/**
 * The largest drive (V rms at the way's input) and the seat pressure there (Pa rms) for a sine at f
 * before the way reaches a limit: cone Xmax, port air speed or radiator travel (the box kind's
 * probe), the amplifier's rail, or the coil's rated temperature. Every limit is taken with the
 * coil at its thermal equilibrium at that drive: steady state ΔT = P·(Rtv + Rtm) of the two-node
 * network (REFERENCES, voice-coil heating), with P the power in the hot coil's resistance, found by
 * fixed-point iteration (the hot coil draws less, so the iteration settles in a few steps).
 */
export function maxSine(system: SpeakerSystem, way: DriverWay, f: number): { v: number; pa: number; limit: MaxSplLimit } {
  const d = way.driver;
  const w = 2 * Math.PI * f;
  const rth = d.thermal.rtv + d.thermal.rtm;
  const riseMax = Math.max(d.thermal.coilMaxC - system.air.temperatureC, 0);
  // The filter sits in front of the amplifier: its gain sets how much input reaches the rail.
  const vAmp = system.amplifier.vPeak / (Math.SQRT2 * abs(wayFilterAt(way.filter, w)));
  // Thermal: the drive that holds the coil at its rating, with the coil's resistance at the rating.
  // (Read now: the heating steps below reuse `heat`'s copy of the way and `step`.)
  const atMax = heat(way, riseMax);
  sineParts(system, atMax, f, 1, step);
  const paAtMax = step.pressure;
  const vThermal = Math.sqrt(riseMax / (rth * coilPower(atMax, step.current)));
  let rise = 0;
  // The best so far as plain numbers (no object per heating step).
  let bestV = vAmp;
  let bestPa = 0;
  let bestLimit: MaxSplLimit = 'amplifier';
  for (let it = 0; it < 12; it++) {
    const hot = heat(way, rise);
    const r = sineParts(system, hot, f, 1, step);
    bestV = vAmp;
    bestPa = 0;
    bestLimit = 'amplifier';
    const vExcursion = d.xmax / (Math.SQRT2 * r.excursion);
    if (vExcursion < bestV) {
      bestV = vExcursion;
      bestLimit = 'excursion';
    }
    const stress = outletStress(way.box, r.outletFlow, w);
    if (stress) {
      const vStress = stress.limit / stress.value;
      if (vStress < bestV) {
        bestV = vStress;
        bestLimit = stress.kind === 'radiator' ? 'radiator' : 'port';
      }
    }
    const riseHere = rth * coilPower(hot, r.current) * bestV * bestV;
    if (riseHere >= riseMax || vThermal <= bestV) {
      // The coil reaches its rating first: the drive that holds it there, with the hot coil's response.
      return { v: vThermal, pa: paAtMax * vThermal, limit: 'thermal' };
    }
    bestPa = r.pressure * bestV;
    if (Math.abs(riseHere - rise) < 1e-3) break;
    rise = riseHere;
  }
  return { v: bestV, pa: bestPa, limit: bestLimit };
}

/** A passive way's network on the grid: its transfer at the analysis drive, its parts at the planned drive. */
function networkCurves(system: SpeakerSystem, way: DriverWay, freqHz: Float64Array, planned: number): NetworkCurves {
  const parts = way.network ?? [];
  const n = freqHz.length;
  const out: NetworkCurves = {
    transferDb: new Float64Array(n),
    transferDeg: new Float64Array(n),
    driverImpedanceOhm: new Float64Array(n),
    parts: parts.map((p, j) => ({ label: partLabel(p, j), plannedPowerW: new Float64Array(n), plannedCurrentA: new Float64Array(n) })),
  };
  for (let k = 0; k < n; k++) {
    const w = 2 * Math.PI * freqHz[k];
    const r = respond(system, way, freqHz[k], planned);
    const t = scale(r.terminalVoltage, 1 / planned);
    out.transferDb[k] = 20 * Math.log10(abs(t));
    out.transferDeg[k] = (arg(t) * 180) / Math.PI;
    out.driverImpedanceOhm[k] = abs(r.impedance);
    const states = ladderStates(parts, w, r.terminalVoltage, r.current);
    states.forEach((st, j) => {
      out.parts[j].plannedPowerW[k] = partPower(parts[j], w, st);
      out.parts[j].plannedCurrentA[k] = abs(st.current);
    });
  }
  return out;
}

/** Each part's worst heat and current over 20 Hz to 20 kHz at the planned level. */
function partFigures(way: DriverWay, curves: Curves): PartFigure[] | null {
  if (!way.network || !curves.network) return null;
  return curves.network.parts.map((p, j) => {
    const power = peakOver(curves.freqHz, p.plannedPowerW, 20, 20000);
    const current = peakOver(curves.freqHz, p.plannedCurrentA, 20, 20000);
    const rated = way.network![j].ratedW;
    return {
      label: p.label,
      peakPowerW: power.value,
      peakPowerHz: power.hz,
      peakCurrentA: current.value,
      peakCurrentHz: current.hz,
      ratedW: rated > 0 ? rated : null,
    };
  });
}

function wayCurves(
  system: SpeakerSystem,
  way: DriverWay,
  onGrid: WayOnGrid,
  freqHz: Float64Array,
  driveV: number,
  planned: number,
): Curves {
  // The analysis's own copies: the kept ones serve the next edit.
  const g = onGrid.curves!;
  const copy = (x: Float64Array | null) => (x ? x.slice() : null);
  return {
    freqHz,
    splDb: g.splDb.slice(),
    coneSplDb: g.coneSplDb.slice(),
    portSplDb: copy(g.portSplDb),
    referenceSplDb: new Float64Array(freqHz.length).fill(splDb(wayPassbandPerVolt(system, way) * driveV)),
    excursionMm: g.excursionMm.slice(),
    plannedExcursionMm: g.excursionMm.map((x) => (x * planned) / driveV),
    radiatorExcursionMm: copy(g.radiatorExcursionMm),
    impedanceOhm: g.impedanceOhm.slice(),
    phaseDeg: g.phaseDeg.slice(),
    groupDelayMs: g.groupDelayMs.slice(),
    portAirSpeed: copy(g.portAirSpeed),
    plannedPortAirSpeed: g.portAirSpeed ? g.portAirSpeed.map((x) => (x * planned) / driveV) : null,
    maxSplDb: g.maxSplDb.slice(),
    maxSplLimit: [...g.maxSplLimit],
    network: way.network ? networkCurves(system, way, freqHz, planned) : null,
    measuredSplDb: measuredSplOnGrid(system, way, freqHz, driveV),
  };
}

/** The largest value of `values` over the grid from `fromHz` up, and where. */
function peakOver(freqHz: Float64Array, values: Float64Array | null, fromHz: number, toHz = Infinity): { value: number; hz: number } {
  let value = 0;
  let hz = freqHz[0];
  for (let k = 0; k < freqHz.length; k++) {
    if (freqHz[k] < fromHz || freqHz[k] > toHz || !values) continue;
    if (values[k] > value) [value, hz] = [values[k], freqHz[k]];
  }
  return { value, hz };
}

function wayFigures(system: SpeakerSystem, way: DriverWay, curves: Curves, driveV: number, planned: number): Figures {
  const { freqHz } = curves;
  const peakX = peakOver(freqHz, curves.excursionMm, 0);
  const plannedX = peakOver(freqHz, curves.plannedExcursionMm, 20);
  const plannedPort = peakOver(freqHz, curves.plannedPortAirSpeed, 20);
  const vented = curves.portAirSpeed !== null;
  // Nominal-impedance minimum: above the highest-frequency impedance peak below 500 Hz (for a
  // way whose resonance lies higher, above its highest peak below 4·fs).
  const peakBelow = Math.max(500, 4 * way.driver.fs);
  let lastPeak = 0;
  for (let k = 1; k < freqHz.length - 1 && freqHz[k] < peakBelow; k++) {
    if (curves.impedanceOhm[k] > curves.impedanceOhm[k - 1] && curves.impedanceOhm[k] >= curves.impedanceOhm[k + 1]) lastPeak = k;
  }
  let zMin = Infinity;
  let zMinHz = freqHz[lastPeak];
  for (let k = lastPeak; k < freqHz.length; k++) {
    if (curves.impedanceOhm[k] < zMin) [zMin, zMinHz] = [curves.impedanceOhm[k], freqHz[k]];
  }
  const spl = (f: number) => splDb(abs(respond(system, way, f, driveV).pressure));
  const [f3Hz, f6Hz, f10Hz] = rolloffsHz(system, way, [HALF_POWER_DB, 6, 10]);
  const sensitivitySystem = { ...system, listening: { ...system.listening, roomGainHz: 0 } };
  return {
    f3Hz,
    f6Hz,
    f10Hz,
    ...boxFigures(system, way),
    eta0Pct: referenceEfficiency(system, way) * 100,
    sensitivityDb: splDb(passbandPressure(sensitivitySystem, way, SENSITIVITY_VOLTS, 1)),
    passbandSplDb: splDb(wayPassbandPerVolt(system, way) * driveV),
    peakExcursionMm: peakX.value,
    peakExcursionHz: peakX.hz,
    peakPortSpeed: vented ? peakOver(freqHz, curves.portAirSpeed, 0).value : null,
    plannedPeakExcursionMm: plannedX.value,
    plannedPeakExcursionHz: plannedX.hz,
    plannedPeakPortSpeed: vented ? plannedPort.value : null,
    plannedPeakPortSpeedHz: vented ? plannedPort.hz : null,
    zMinOhm: zMin,
    zMinHz,
    plannedVoltsRms: planned,
    plannedSplDb: splDb(wayPassbandPerVolt(system, way) * planned),
    spl30Db: spl(30),
    spl40Db: spl(40),
    spl50Db: spl(50),
    groupDelay40Ms: wayGroupDelay(system, way, 40) * 1000,
    parts: partFigures(way, curves),
  };
}

/** What the planned level does to one way, as warnings with numbers. */
function levelWarnings(system: SpeakerSystem, wa: Omit<WayAnalysis, 'warnings'>): Issue[] {
  const { figures, way, index } = wa;
  const out: Issue[] = [];
  const several = system.ways.filter((w) => w.kind === 'driver').length > 1;
  const who = several ? `the ${way.name}: ` : '';
  const worstX = figures.plannedPeakExcursionMm;
  const xmaxMm = way.unit.xmax * 1000;
  if (worstX > xmaxMm) {
    out.push(
      warning(
        'listening.level',
        `${who}a sine at the planned level's drive (${fmt(figures.plannedVoltsRms)} V rms, the programme stand-in's) moves the cone ${fmt(worstX)} mm at ${fmt(figures.plannedPeakExcursionHz)} Hz, beyond Xmax ${fmt(xmaxMm)} mm`,
      ),
    );
  }
  // A resistor's rated power against its heat for a sine at the planned level (a passive network).
  for (const [j, part] of (figures.parts ?? []).entries()) {
    if (part.ratedW !== null && part.peakPowerW > part.ratedW) {
      out.push(
        warning(
          `ways[${index}].filter.ladder[${j}].w`,
          `${who}part ${part.label} takes ${fmt(part.peakPowerW)} W at ${fmt(part.peakPowerHz)} Hz for a sine at the planned level, over its rating of ${fmt(part.ratedW)} W`,
        ),
      );
    }
  }
  const worstPort = figures.plannedPeakPortSpeed ?? 0;
  const worstPortHz = figures.plannedPeakPortSpeedHz ?? 0;
  const path = `ways[${index}].box.ports`;
  if (worstPort > 2 * PORT_SPEED_LIMIT) {
    out.push(
      warning(
        path,
        `${who}port air speed reaches ${fmt(worstPort)} m/s at ${fmt(worstPortHz)} Hz at the planned level, over 10% of c: port noise will be clearly audible`,
      ),
    );
  } else if (worstPort > PORT_SPEED_LIMIT) {
    out.push(
      warning(
        path,
        `${who}port air speed reaches ${fmt(worstPort)} m/s at ${fmt(worstPortHz)} Hz at the planned level (limit about ${PORT_SPEED_LIMIT} m/s)`,
      ),
    );
  }
  return out;
}

/** One driver way of the system on the grid, at the analysis drive and the planned drive. */
function analyzeWay(
  system: SpeakerSystem,
  way: DriverWay,
  onGrid: WayOnGrid,
  freqHz: Float64Array,
  driveV: number,
  planned: number,
): WayAnalysis {
  const curves = wayCurves(system, way, onGrid, freqHz, driveV, planned);
  const wa = { way, index: system.ways.indexOf(way), figures: wayFigures(system, way, curves, driveV, planned), curves };
  return { ...wa, warnings: levelWarnings(system, wa) };
}

function analyzeSum(
  system: SpeakerSystem,
  placed: Placed[],
  freqHz: Float64Array,
  driveV: number,
  sumPerVolt: number,
  planned: number,
): SumAnalysis {
  const n = freqHz.length;
  const curves: SumCurves = {
    freqHz,
    splDb: new Float64Array(n),
    phaseDeg: new Float64Array(n),
    groupDelayMs: new Float64Array(n),
    ways: system.ways.map((w) => ({ name: w.name, kind: w.kind, splDb: new Float64Array(n) })),
    passiveLoadOhm: passiveLoad(system, freqHz),
  };
  let loadMin: { value: number; hz: number } | null = null;
  if (curves.passiveLoadOhm) {
    loadMin = { value: Infinity, hz: Number.NaN };
    for (let k = 0; k < n; k++) {
      if (freqHz[k] >= 20 && freqHz[k] <= 20000 && curves.passiveLoadOhm[k] < loadMin.value)
        loadMin = { value: curves.passiveLoadOhm[k], hz: freqHz[k] };
    }
  }
  for (let k = 0; k < n; k++) {
    // The ways' phasors added in plain numbers (the same sums as adding Complex objects from zero,
    // without an object per way and frequency: less garbage for the redraw after an edit).
    let belowRe = 0,
      belowIm = 0,
      atRe = 0,
      atIm = 0,
      aboveRe = 0,
      aboveIm = 0;
    for (let j = 0; j < placed.length; j++) {
      const p = placed[j];
      const hereRe = p.at[2 * k],
        hereIm = p.at[2 * k + 1];
      curves.ways[j].splDb[k] = splDb(hypot(hereRe, hereIm));
      belowRe += p.below[2 * k];
      belowIm += p.below[2 * k + 1];
      atRe += hereRe;
      atIm += hereIm;
      aboveRe += p.above[2 * k];
      aboveIm += p.above[2 * k + 1];
    }
    curves.splDb[k] = splDb(hypot(atRe, atIm));
    curves.phaseDeg[k] = (Math.atan2(atIm, atRe) * 180) / Math.PI;
    curves.groupDelayMs[k] = groupDelayFrom(cx(belowRe, belowIm), cx(aboveRe, aboveIm), freqHz[k]) * 1000;
  }
  const [f3Hz, f6Hz, f10Hz] = sumRolloffsHz(system, [HALF_POWER_DB, 6, 10], sumPerVolt);
  const passbandSplDb = splDb(sumPerVolt * driveV);
  return {
    curves,
    figures: {
      f3Hz,
      f6Hz,
      f10Hz,
      sensitivityDb: splDb(sumPassbandPerVolt(system, 1) * SENSITIVITY_VOLTS),
      passbandSplDb,
      plannedVoltsRms: planned,
      plannedSplDb: splDb(sumPerVolt * planned),
      groupDelay40Ms: sumGroupDelay(system, 40) * 1000,
      passiveLoadMinOhm: loadMin ? loadMin.value : null,
      passiveLoadMinHz: loadMin ? loadMin.hz : null,
      crossover: crossoverFigures(freqHz, curves.splDb, curves.ways, passbandSplDb, Math.max(f3Hz, freqHz[0])),
    },
  };
}

/** The planned level with the programme stand-in, and what the amplifier cannot give of it. */
function plannedProgramme(system: SpeakerSystem, voltsRms: number, leqCPerVoltDb: number): Analysis['programme'] {
  return { voltsRms, leqCPerVoltDb, shortfalls: amplifierShortfalls(system, voltsRms) };
}

function shortfallError(system: SpeakerSystem, s: AmplifierShortfall): Issue {
  const several = system.ways.filter((w) => w.kind === 'driver').length > 1;
  const lv = system.listening.level;
  const level = lv.mode === 'spl' ? `${fmt(lv.splDb)} dB(C) at the seat` : `${fmt(lv.voltsFs)} V at full scale`;
  return error(
    'listening.level',
    `the planned level (${level}, with the programme stand-in) needs ${fmt(s.needV)} V peaks from the amplifier${several ? ` on the ${s.way} way` : ''}; it gives ${fmt(s.railV)} V: ${fmt(s.shortDb)} dB (${fmt(s.needV - s.railV)} V) short, so it clips on every loud passage`,
  );
}

/**
 * The passive ways together on their one amplifier channel: their input impedances in parallel
 * (each network loaded by its drivers in their box); null when no way is passive.
 */
function passiveLoad(system: SpeakerSystem, freqHz: Float64Array): Float64Array | null {
  const passive = system.ways.filter((w): w is DriverWay => w.kind === 'driver' && w.network !== undefined);
  if (passive.length === 0) return null;
  return freqHz.map((f) => {
    let y = cx(0);
    for (const way of passive) {
      const z = ladderInputImpedance(way.network!, 2 * Math.PI * f, respond(system, way, f, 1).impedance);
      y = add(y, div(cx(1), z));
    }
    return 1 / abs(y);
  });
}

export function analyze(system: SpeakerSystem, options: AnalyzeOptions = {}): Analysis {
  const driveV = options.driveV ?? SENSITIVITY_VOLTS;
  const driverWays = system.ways.filter((w): w is DriverWay => w.kind === 'driver');
  const fMax = options.fMaxHz ?? (driverWays.length > 1 ? 20000 : 2000);
  const grid = [options.fMinHz ?? 10, fMax, options.pointsPerOctave ?? 48];
  const freqHz = logGrid(grid[0], grid[1], grid[2]);
  const sumPerVolt = sumPassbandPerVolt(system);
  // The stand-in's level per volt once: the planned volts and the planned level both take it.
  const programmeLeqDb = programmeLeqCPerVolt(system);
  const planned = plannedVoltsRms(system, programmeLeqDb);
  const onGrid = waysOnGridOf(system, freqHz, grid, driveV);
  const placed = onGrid.map((g) => g.placed);
  const programme = plannedProgramme(system, planned, programmeLeqDb);
  // The planned level itself, as every figure quotes it: the stand-in's Leq,C at the seat.
  const plannedLevelDb = programme.leqCPerVoltDb + 20 * Math.log10(planned);
  const ways = driverWays.map((way) => {
    const wa = analyzeWay(system, way, onGrid[system.ways.indexOf(way)], freqHz, driveV, planned);
    return { ...wa, figures: { ...wa.figures, plannedSplDb: plannedLevelDb } };
  });
  const first = ways[0];
  const sum = analyzeSum(system, placed, freqHz, driveV, sumPerVolt, planned);
  const room = roomAnalysis(system, freqHz, sum.curves.splDb);
  return {
    ...first,
    system,
    driveV,
    ways,
    sum: { ...sum, figures: { ...sum.figures, plannedSplDb: plannedLevelDb } },
    ...(room ? { room } : {}),
    programme,
    warnings: [...programme.shortfalls.map((s) => shortfallError(system, s)), ...ways.flatMap((w) => w.warnings)],
  };
}
