// What a way's drivers and its amplifier channel go through for a sine held at a drive, against
// frequency, from its small-signal curves: the power the amplifier delivers, the heat in the coils,
// and how much of each limit (Xmax, port air speed, the coils' rated power) that uses.
// The coil heat is I²·Re with the cold Re (the model's first estimate; a coil that has heated
// up draws less current, so this errs on the safe side). With several drivers `way.driver` is
// their combination (its Re and its Pe are the whole way's), so the share is each driver's too.
// The drive is the rms volts at the amplifier's input: an active way's filter comes first.
import { abs, hypot } from '../complex.ts';
import { wayFilterAt } from '../filters/way-filter.ts';
import { PORT_SPEED_LIMIT } from '../units.ts';
import type { DriverWay, SpeakerSystem } from '../system.ts';
import type { Curves } from './types.ts';

/**
 * Real power from the amplifier into the way's terminals, W: U²·cos(phase)/|Z| (common practice,
 * no source), U the amplifier's output (the drive through an active way's filter) and Z what the
 * amplifier sees (a passive way's network included); the amplifier's own resistance left out.
 */
export function amplifierPowerW(
  way: DriverWay,
  curves: Pick<Curves, 'freqHz' | 'impedanceOhm' | 'phaseDeg'>,
  voltsRms: number,
  drive = amplifierVolts(way, curves.freqHz, voltsRms),
): Float64Array {
  const z = curves.impedanceOhm;
  const out = new Float64Array(z.length);
  for (let i = 0; i < z.length; i++) out[i] = (drive[i] * drive[i] * Math.cos((curves.phaseDeg[i] * Math.PI) / 180)) / z[i];
  return out;
}

/** The amplifier's output, V rms, for `voltsRms` at its input: through an active way's filter. */
export function amplifierVolts(way: DriverWay, freqHz: Float64Array, voltsRms: number): Float64Array {
  const out = new Float64Array(freqHz.length);
  for (let i = 0; i < out.length; i++) out[i] = voltsRms * abs(wayFilterAt(way.filter, 2 * Math.PI * freqHz[i]));
  return out;
}

/** Each value as a percentage of `limit` (a loop: `Float64Array.from` with a map goes through an iterator). */
function percentOf(v: ArrayLike<number>, limit: number): Float64Array {
  const out = new Float64Array(v.length);
  for (let i = 0; i < out.length; i++) out[i] = (100 * v[i]) / limit;
  return out;
}

const net = (c: Curves) => c.network !== null;

/**
 * Heat in the way's coils, W: |I|²·Re, the coil current read from the curves: an active way's
 * U/|Z + rs| (U through its filter, Z the terminal impedance at its phase), a passive way's
 * terminal volts (the network's transfer) over the drivers' own impedance.
 */
export function coilHeatW(
  system: SpeakerSystem,
  way: DriverWay,
  curves: Curves,
  voltsRms: number,
  drive = net(curves) ? null : amplifierVolts(way, curves.freqHz, voltsRms),
): Float64Array {
  const { freqHz: f, impedanceOhm: z, phaseDeg, network: net } = curves;
  const rs = system.amplifier.rs;
  const out = new Float64Array(f.length);
  for (let i = 0; i < f.length; i++) {
    let current: number;
    if (net) current = (voltsRms * 10 ** (net.transferDb[i] / 20)) / net.driverImpedanceOhm[i];
    else {
      const ph = (phaseDeg[i] * Math.PI) / 180;
      current = drive![i] / hypot(z[i] * Math.cos(ph) + rs, z[i] * Math.sin(ph));
    }
    out[i] = current * current * way.driver.re;
  }
  return out;
}

export interface LimitUse {
  /** Peak cone excursion over Xmax, percent. */
  excursionPct: Float64Array;
  /** Peak port air speed over the port speed limit, percent; null without a port. */
  portPct: Float64Array | null;
  /** Coil heat over the rated power Pe, percent; null when no rating is given. */
  heatPct: Float64Array | null;
}

/** Each limit's share used by a sine at `voltsRms` (the drive the curves' planned-level figures use). */
export function limitUse(
  system: SpeakerSystem,
  way: DriverWay,
  curves: Curves,
  voltsRms: number,
  drive = net(curves) ? null : amplifierVolts(way, curves.freqHz, voltsRms),
): LimitUse {
  const xmaxMm = way.unit.xmax * 1000;
  return {
    excursionPct: percentOf(curves.plannedExcursionMm, xmaxMm),
    portPct: curves.plannedPortAirSpeed ? percentOf(curves.plannedPortAirSpeed, PORT_SPEED_LIMIT) : null,
    heatPct: way.driver.pe > 0 ? percentOf(coilHeatW(system, way, curves, voltsRms, drive), way.driver.pe) : null,
  };
}
