// Small-signal analysis of one design: curves on a log grid and the figures a designer reads first.
import type { SpeakerSystem } from '../system.ts';
import { PORT_SPEED_LIMIT, SENSITIVITY_VOLTS, splDb } from '../units.ts';
import { abs, arg, div } from '../complex.ts';
import { fmt, warning, type Issue } from '../issues.ts';
import { passbandPressure, respond, type PointResponse } from './frequency.ts';
import type { Analysis, Curves, Figures, MaxSplLimit } from './types.ts';
import { sealedAlignment } from '../box/sealed.ts';
import { qesWithSeries, totalQ } from '../driver.ts';

/** "-3 dB" is the half-power point, 10·log10(2) = 3.0103 dB down, as in the published F3 tables. */
export const HALF_POWER_DB = 10 * Math.log10(2);

export interface AnalyzeOptions {
  /** Drive for the curves, V rms at the amplifier; default 2.83. */
  driveV?: number;
  fMinHz?: number;
  fMaxHz?: number;
  pointsPerOctave?: number;
}

export { PORT_SPEED_LIMIT, SENSITIVITY_VOLTS, splDb };

export function logGrid(fMin: number, fMax: number, perOctave: number): Float64Array {
  const n = Math.ceil(Math.log2(fMax / fMin) * perOctave) + 1;
  const grid = new Float64Array(n);
  for (let k = 0; k < n; k++) grid[k] = fMin * 2 ** (Math.log2(fMax / fMin) * (k / (n - 1)));
  return grid;
}

/** Group delay -d(phase)/dw from the ratio of two nearby responses (no unwrapping needed). */
function groupDelay(system: SpeakerSystem, f: number): number {
  const eps = 1e-4;
  const hi = respond(system, f * (1 + eps), 1).pressure;
  const lo = respond(system, f * (1 - eps), 1).pressure;
  return -arg(div(hi, lo)) / (2 * Math.PI * f * 2 * eps);
}

/** Amplifier volts (rms) for the planned level: SPL at the seat in the passband, or volts at full scale. */
export function plannedVoltsRms(system: SpeakerSystem): number {
  const level = system.listening.level;
  if (level.mode === 'volts') return level.voltsFs / Math.SQRT2;
  const perVolt = splDb(passbandPressure(system, 1));
  return 10 ** ((level.splDb - perVolt) / 20);
}

/**
 * The frequency below the passband where the anechoic response first falls `dropDb` under the
 * passband level, scanning downward from well inside the passband; refined by bisection.
 */
export function rolloffHz(system: SpeakerSystem, dropDb: number): number {
  const ref = splDb(passbandPressure(system, 1));
  const rel = (f: number) => splDb(abs(respond(system, f, 1, false).pressure)) - ref;
  const tuning = Math.max(system.driver.fs, 'fb' in system.box ? system.box.fb : 0);
  let prev = 4 * tuning;
  const step = 2 ** (-1 / 48);
  for (let f = prev * step; f > 0.5; f *= step) {
    if (rel(f) < -dropDb) {
      let lo = f;
      let hi = prev;
      for (let k = 0; k < 60; k++) {
        const mid = Math.sqrt(lo * hi);
        if (rel(mid) < -dropDb) lo = mid;
        else hi = mid;
      }
      return Math.sqrt(lo * hi);
    }
    prev = f;
  }
  return 0.5;
}

/** Small's reference efficiency eta0 = rho·Bl^2·Sd^2 / (2 pi·c·Re·Mms^2) (half space). */
export function referenceEfficiency(system: SpeakerSystem): number {
  const { air, driver: d } = system;
  return (air.rho * d.bl * d.bl * d.sd * d.sd) / (2 * Math.PI * air.c * d.re * d.mms * d.mms);
}

function maxVolts(system: SpeakerSystem, r: PointResponse, volts: number, f: number): { v: number; limit: MaxSplLimit } {
  const { driver: d, box, amplifier } = system;
  const candidates: { v: number; limit: MaxSplLimit }[] = [
    { v: (volts * d.xmax) / (Math.SQRT2 * abs(r.excursion)), limit: 'excursion' },
    // Thermal: the rated power dissipated in the coil's resistance.
    { v: volts * Math.sqrt(d.pe / (abs(r.current) ** 2 * d.re)), limit: 'thermal' },
    { v: amplifier.vPeak / Math.SQRT2, limit: 'amplifier' },
  ];
  if (box.type === 'passive-radiator') {
    const xp = abs(r.outletFlow) / (2 * Math.PI * f * box.sp);
    candidates.push({ v: (volts * box.xmax) / (Math.SQRT2 * xp), limit: 'radiator' });
  }
  return candidates.reduce((a, b) => (b.v < a.v ? b : a));
}

export function analyze(system: SpeakerSystem, options: AnalyzeOptions = {}): Analysis {
  const driveV = options.driveV ?? SENSITIVITY_VOLTS;
  const freqHz = logGrid(options.fMinHz ?? 10, options.fMaxHz ?? 2000, options.pointsPerOctave ?? 48);
  const n = freqHz.length;
  const { box } = system;
  const vented = box.type === 'vented';
  const radiator = box.type === 'passive-radiator';
  const hasOutlet = box.type !== 'sealed';
  const planned = plannedVoltsRms(system);

  const curves: Curves = {
    freqHz,
    splDb: new Float64Array(n),
    coneSplDb: new Float64Array(n),
    portSplDb: hasOutlet ? new Float64Array(n) : null,
    referenceSplDb: new Float64Array(n).fill(splDb(passbandPressure(system, driveV))),
    excursionMm: new Float64Array(n),
    plannedExcursionMm: new Float64Array(n),
    radiatorExcursionMm: radiator ? new Float64Array(n) : null,
    impedanceOhm: new Float64Array(n),
    phaseDeg: new Float64Array(n),
    groupDelayMs: new Float64Array(n),
    portAirSpeed: vented ? new Float64Array(n) : null,
    plannedPortAirSpeed: vented ? new Float64Array(n) : null,
    maxSplDb: new Float64Array(n),
    maxSplLimit: new Array<MaxSplLimit>(n),
  };

  for (let k = 0; k < n; k++) {
    const f = freqHz[k];
    const r = respond(system, f, driveV);
    curves.splDb[k] = splDb(abs(r.pressure));
    curves.coneSplDb[k] = splDb(abs(r.conePressure));
    if (curves.portSplDb) curves.portSplDb[k] = splDb(abs(r.outletPressure));
    const xPeakMm = Math.SQRT2 * abs(r.excursion) * 1000;
    curves.excursionMm[k] = xPeakMm;
    curves.plannedExcursionMm[k] = (xPeakMm * planned) / driveV;
    if (curves.radiatorExcursionMm && box.type === 'passive-radiator') {
      curves.radiatorExcursionMm[k] = (Math.SQRT2 * abs(r.outletFlow) * 1000) / (2 * Math.PI * f * box.sp);
    }
    curves.impedanceOhm[k] = abs(r.impedance);
    curves.phaseDeg[k] = (arg(r.impedance) * 180) / Math.PI;
    curves.groupDelayMs[k] = groupDelay(system, f) * 1000;
    if (curves.portAirSpeed && curves.plannedPortAirSpeed && box.type === 'vented') {
      const speed = (Math.SQRT2 * abs(r.outletFlow)) / box.sv;
      curves.portAirSpeed[k] = speed;
      curves.plannedPortAirSpeed[k] = (speed * planned) / driveV;
    }
    const lim = maxVolts(system, r, driveV, f);
    curves.maxSplDb[k] = curves.splDb[k] + 20 * Math.log10(lim.v / driveV);
    curves.maxSplLimit[k] = lim.limit;
  }

  const figures = computeFigures(system, curves, driveV, planned);
  return { system, driveV, figures, curves, warnings: levelWarnings(system, figures) };
}

function computeFigures(system: SpeakerSystem, curves: Curves, driveV: number, planned: number): Figures {
  const { box, driver, amplifier, crossover } = system;
  const { freqHz } = curves;
  const at = (f: number) => respond(system, f, driveV);
  const upTo = crossover.type === 'none' ? freqHz[freqHz.length - 1] : crossover.fx;
  let peakX = 0;
  let peakXHz = freqHz[0];
  let peakPort = 0;
  for (let k = 0; k < freqHz.length && freqHz[k] <= upTo; k++) {
    if (curves.excursionMm[k] > peakX) [peakX, peakXHz] = [curves.excursionMm[k], freqHz[k]];
    if (curves.portAirSpeed && curves.portAirSpeed[k] > peakPort) peakPort = curves.portAirSpeed[k];
  }
  let plannedX = 0;
  let plannedXHz = freqHz[0];
  let plannedPort = 0;
  let plannedPortHz = freqHz[0];
  for (let k = 0; k < freqHz.length && freqHz[k] <= upTo; k++) {
    if (freqHz[k] < 20) continue;
    if (curves.plannedExcursionMm[k] > plannedX) [plannedX, plannedXHz] = [curves.plannedExcursionMm[k], freqHz[k]];
    const ps = curves.plannedPortAirSpeed?.[k] ?? 0;
    if (ps > plannedPort) [plannedPort, plannedPortHz] = [ps, freqHz[k]];
  }
  // Nominal-impedance minimum: above the highest-frequency impedance peak below 500 Hz.
  let lastPeak = 0;
  for (let k = 1; k < freqHz.length - 1 && freqHz[k] < 500; k++) {
    if (curves.impedanceOhm[k] > curves.impedanceOhm[k - 1] && curves.impedanceOhm[k] >= curves.impedanceOhm[k + 1]) lastPeak = k;
  }
  let zMin = Infinity;
  let zMinHz = freqHz[lastPeak];
  for (let k = lastPeak; k < freqHz.length; k++) {
    if (curves.impedanceOhm[k] < zMin) [zMin, zMinHz] = [curves.impedanceOhm[k], freqHz[k]];
  }
  const qts = totalQ(qesWithSeries(driver.qes, driver.re, amplifier.rs), driver.qms);
  const sealed = box.type === 'sealed' ? sealedAlignment(driver.fs, qts, driver.vas, box.vb) : null;
  const spl = (f: number) => splDb(abs(at(f).pressure));
  const sensitivitySystem = { ...system, listening: { ...system.listening, roomGainHz: 0 } };
  return {
    f3Hz: rolloffHz(system, HALF_POWER_DB),
    f6Hz: rolloffHz(system, 6),
    f10Hz: rolloffHz(system, 10),
    fcHz: sealed ? sealed.fc : null,
    qtc: sealed ? sealed.qtc : null,
    fbHz: box.type === 'sealed' ? null : box.fb,
    fpHz: box.type === 'passive-radiator' ? box.fp : null,
    portLengthCm: box.type === 'vented' ? box.portLength * 100 : null,
    eta0Pct: referenceEfficiency(system) * 100,
    sensitivityDb: splDb(passbandPressure(sensitivitySystem, SENSITIVITY_VOLTS, 1)),
    passbandSplDb: splDb(passbandPressure(system, driveV)),
    peakExcursionMm: peakX,
    peakExcursionHz: peakXHz,
    peakPortSpeed: box.type === 'vented' ? peakPort : null,
    plannedPeakExcursionMm: plannedX,
    plannedPeakExcursionHz: plannedXHz,
    plannedPeakPortSpeed: box.type === 'vented' ? plannedPort : null,
    plannedPeakPortSpeedHz: box.type === 'vented' ? plannedPortHz : null,
    zMinOhm: zMin,
    zMinHz,
    plannedVoltsRms: planned,
    plannedSplDb: splDb(passbandPressure(system, planned)),
    spl30Db: spl(30),
    spl40Db: spl(40),
    spl50Db: spl(50),
    groupDelay40Ms: groupDelay(system, 40) * 1000,
  };
}

/** What the planned level does to this design, as warnings with numbers. */
function levelWarnings(system: SpeakerSystem, figures: Figures): Issue[] {
  const out: Issue[] = [];
  const worstX = figures.plannedPeakExcursionMm;
  const worstXHz = figures.plannedPeakExcursionHz;
  const worstPort = figures.plannedPeakPortSpeed ?? 0;
  const worstPortHz = figures.plannedPeakPortSpeedHz ?? 0;
  const xmaxMm = system.driver.xmax * 1000;
  if (worstX > xmaxMm) {
    out.push(
      warning(
        'listening.level',
        `a sine at the planned level (${fmt(figures.plannedVoltsRms)} V rms) moves the cone ${fmt(worstX)} mm at ${fmt(worstXHz)} Hz, beyond Xmax ${fmt(xmaxMm)} mm`,
      ),
    );
  }
  if (worstPort > 2 * PORT_SPEED_LIMIT) {
    out.push(
      warning(
        'box.ports',
        `port air speed reaches ${fmt(worstPort)} m/s at ${fmt(worstPortHz)} Hz at the planned level, over 10% of c: port noise will be clearly audible`,
      ),
    );
  } else if (worstPort > PORT_SPEED_LIMIT) {
    out.push(
      warning(
        'box.ports',
        `port air speed reaches ${fmt(worstPort)} m/s at ${fmt(worstPortHz)} Hz at the planned level (limit about ${PORT_SPEED_LIMIT} m/s)`,
      ),
    );
  }
  return out;
}
