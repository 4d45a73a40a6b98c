// Distortion and compression against frequency from the large-signal model: stepped sines in
// steady state (the classical stepped-sine measurement, e.g. IEC 60268-5's harmonic distortion).
// Each driver way is driven through its filter (a sine stays a sine: gain |H(f)|, phase arg H(f))
// and run until the transient has died; its seat pressure is then analysed over whole periods.
//   THD = sqrt(H2^2 + ... + H5^2)/H1, h2 and h3 relative to H1 in dB,
//   compression = 20·log10(H1 nonlinear / H1 of the linear twin at the same drive) (<= 0 dB when the
//   drive compresses); the thermal rise is left out (short tones: the coil has no time to heat).
// The sum adds each harmonic of every way at the seat as phasors (filter phase, room gain, baffle
// step, polarity and offset delay at k·f), so ways that cancel there cancel here too; flat ways add
// their fundamental. The amplifier is taken as clean (its clipping is the renderer's business).
import { abs, add, cx, mul, scale, type Complex } from '../complex.ts';
import { delayAt, wayFilterAt } from '../filters/way-filter.ts';
import { baffleGain, measuredCorrection, offsetDelay, roomGain, wayPressure } from '../response/frequency.ts';
import { wooferParams } from '../sim/params.ts';
import { WooferSim } from '../sim/woofer.ts';
import { LinearRecurrence } from '../sim/linear.ts';
import type { DriverWay, SpeakerSystem } from '../system.ts';

/** Harmonics measured: the fundamental and H2..H5. */
export const HARMONICS = 5;

export interface DistortionPoint {
  freqHz: number;
  thdPct: number;
  h2Db: number;
  h3Db: number;
  compressionDb: number;
  /** Fundamental at the seat, Pa rms. */
  fundamentalPa: number;
}

/**
 * Complex amplitudes (peak phasors, x = Re{X·e^{jwt}}) of harmonics 1..K of a signal sampled at
 * exactly `perPeriod` samples per period, over `periods` whole periods from `start` (a DFT on
 * the harmonic bins: no leakage for a periodic signal).
 */
export function harmonicPhasors(x: ArrayLike<number>, start: number, perPeriod: number, periods: number, count = HARMONICS): Complex[] {
  const n = perPeriod * periods;
  const out: Complex[] = [];
  for (let k = 1; k <= count; k++) {
    let c = 0;
    let s = 0;
    const w = (2 * Math.PI * k) / perPeriod;
    for (let i = 0; i < n; i++) {
      const v = x[start + i];
      c += v * Math.cos(w * i);
      s += v * Math.sin(w * i);
    }
    out.push(cx((2 * c) / n, (-2 * s) / n));
  }
  return out;
}

/** THD and the other figures from harmonic magnitudes (index 0 the fundamental). */
export function figuresOf(h: number[], linearH1: number, freqHz: number, fundamentalPa: number): DistortionPoint {
  const rest = Math.sqrt(h.slice(1).reduce((s, v) => s + v * v, 0));
  const db = (v: number) => 20 * Math.log10(Math.max(v, 1e-300) / h[0]);
  return {
    freqHz,
    thdPct: (100 * rest) / h[0],
    h2Db: db(h[1]),
    h3Db: db(h[2]),
    compressionDb: 20 * Math.log10(h[0] / linearH1),
    fundamentalPa,
  };
}

/** Samples per period: at least 48 kHz and 24 samples for the fifth harmonic's sake. */
export const samplesPerPeriod = (f: number) => Math.max(24 * HARMONICS, Math.ceil(192000 / f));

export interface WayHarmonics {
  /** At the seat, as the way plays there. */
  point: DistortionPoint;
  /** The driver model's own output (no room gain or baffle step): for checks against the model. */
  model: DistortionPoint;
  /** Harmonics 1..K at the seat as they enter the sum (rms phasors, Pa). */
  atSeat: Complex[];
}

/** One driver way at f for `voltsRms` at the amplifier's input, in steady state. */
export function wayHarmonics(system: SpeakerSystem, way: DriverWay, f: number, voltsRms: number): WayHarmonics {
  const m = samplesPerPeriod(f);
  const fsamp = m * f;
  const p = wooferParams(system, way, 1 / fsamp);
  const nl = new WooferSim(p);
  const lin = new LinearRecurrence(wooferParams(system, way, 1 / fsamp, { linear: true }));
  const w = 2 * Math.PI * f;
  const hf = wayFilterAt(way.filter, w);
  const amp = Math.SQRT2 * voltsRms * abs(hf);
  const phase = Math.atan2(hf.im, hf.re);
  // Settle for 0.4 s or 40 periods, whichever is longer, with the first 10 periods faded in.
  const settlePeriods = Math.max(40, Math.ceil(0.4 * f));
  const periods = 8;
  const total = (settlePeriods + periods) * m;
  const fade = 10 * m;
  const yn = new Float64Array(periods * m);
  const yl = new Float64Array(periods * m);
  const start = settlePeriods * m;
  for (let i = 0; i < total; i++) {
    const env = i < fade ? 0.5 - 0.5 * Math.cos((Math.PI * i) / fade) : 1;
    const u = amp * env * Math.cos((2 * Math.PI * i) / m + phase);
    const pn = nl.step(u);
    const pl = lin.step(u);
    if (i >= start) {
      yn[i - start] = pn;
      yl[i - start] = pl;
    }
  }
  const hn = harmonicPhasors(yn, 0, m, periods);
  const hl = harmonicPhasors(yl, 0, m, periods, 1);
  const atSeat = hn.map((h, i) => toSeat(system, way, h, (i + 1) * f));
  // Figures at the seat (room gain and baffle step weigh the harmonics); compression from the
  // model's own output, where the linear twin has the same discretisation.
  const point = { ...figuresOf(atSeat.map(abs), 1, f, abs(atSeat[0])), compressionDb: 20 * Math.log10(abs(hn[0]) / abs(hl[0])) };
  const model = figuresOf(hn.map(abs), abs(hl[0]), f, abs(hn[0]) / Math.SQRT2);
  return { point, model, atSeat };
}

/**
 * A peak phasor of the driver model's output at `f` as it arrives at the seat, as an rms phasor:
 * room gain and baffle step at f, the way's polarity and offset delay, and a measured response's
 * correction at f (every harmonic and product at its own frequency, as the render's FIR does).
 */
export function toSeat(system: SpeakerSystem, way: DriverWay, h: Complex, f: number): Complex {
  const w = 2 * Math.PI * f;
  const g = roomGain(f, system.listening.roomGainHz);
  const placed = scale(
    mul(mul(h, baffleGain(w, system.listening.baffleWidth ?? 0)), delayAt(w, offsetDelay(system, way))),
    (g * way.polarity) / Math.SQRT2,
  );
  const measured = measuredCorrection(system, way);
  return measured ? mul(placed, measured.at(f)) : placed;
}

/** Third-octave steps from 20 Hz to 2 kHz, to 16 kHz when more than one way has drivers. */
export function distortionFrequencies(system: SpeakerSystem): number[] {
  const top = system.ways.filter((w) => w.kind === 'driver').length > 1 ? 16000 : 2000;
  const out: number[] = [];
  for (let k = 0; 20 * 2 ** (k / 3) <= top * 1.001; k++) out.push(Number((20 * 2 ** (k / 3)).toPrecision(4)));
  return out;
}

export interface DistortionCurves {
  levelsVolts: number;
  ways: { name: string; points: DistortionPoint[] }[];
  sum: DistortionPoint[];
}

export interface DistortionOptions {
  /** Called after each frequency with the share done (0..1); return false to stop (null result). */
  onProgress?: (done: number) => boolean | undefined;
}

/** Stepped-sine curves for every driver way and the sum, at `voltsRms` on the amplifier's input. */
export function distortionCurves(
  system: SpeakerSystem,
  freqHz: number[],
  voltsRms: number,
  opt: DistortionOptions = {},
): DistortionCurves | null {
  const driverWays = system.ways.filter((w): w is DriverWay => w.kind === 'driver');
  const ways = driverWays.map((w) => ({ name: w.name, points: [] as DistortionPoint[] }));
  const sum: DistortionPoint[] = [];
  const steps = freqHz.length * driverWays.length;
  let done = 0;
  for (const f of freqHz) {
    const seat: Complex[] = new Array(HARMONICS).fill(cx(0));
    let linearSum = cx(0);
    for (const way of system.ways) {
      // The linear reference of the sum: the small-signal model at the same drive.
      linearSum = add(linearSum, wayPressure(system, way, f, voltsRms));
      if (way.kind !== 'driver') {
        seat[0] = add(seat[0], wayPressure(system, way, f, voltsRms));
        continue;
      }
      const r = wayHarmonics(system, way, f, voltsRms);
      ways[driverWays.indexOf(way)].points.push(r.point);
      r.atSeat.forEach((h, k) => {
        seat[k] = add(seat[k], h);
      });
      done++;
      if (opt.onProgress?.(done / steps) === false) return null;
    }
    sum.push(figuresOf(seat.map(abs), abs(linearSum), f, abs(seat[0])));
  }
  return { levelsVolts: voltsRms, ways, sum };
}
