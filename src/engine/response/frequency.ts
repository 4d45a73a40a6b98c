// The small-signal lumped circuit of one driver way solved at one frequency (Thiele 1971; Small 1972, 1973):
//   e = (Re + Rs + jwLe)·i + Bl·v
//   (jwMms + Rms + 1/(jwCms) + Sd^2·zLoad)·v = Bl·i      (zLoad: the box kind's acoustic load on the cone)
//   p(r) = jw·rho·U / (Omega·r),  U = Sd·v·(cone + outlet + leak)  (far-field point source in solid angle Omega)
// The box kind gives zLoad and what radiates per unit cone volume velocity (box/physics.ts): in a
// one-chamber box the leak radiates with cone and port, which gives Small's s^4/D(s) form (JAES 1973).
// Phasors are rms when the drive is rms. Signs as in the large-signal model: x, v outward; pb over ambient.
import type { ActiveFilter, Driver, DriverWay, SpeakerSystem, Way } from '../system.ts';
import { cachedCorrection, type MeasuredCorrection } from './measured.ts';
import { delayAt, wayFilterAt } from '../filters/way-filter.ts';
import { add, cx, div, mul, scale, sub, type Complex } from '../complex.ts';
import { ladderThevenin } from './ladder.ts';
import { BOX_KINDS } from '../box/index.ts';
import { baffleStepCorners } from '../filters/room.ts';

export interface PointResponse {
  /** Pressure at the seat, Pa. */
  pressure: Complex;
  conePressure: Complex;
  /** From the port or radiator; zero for a sealed box. */
  outletPressure: Complex;
  coneVelocity: Complex;
  /** Cone displacement, m. */
  excursion: Complex;
  /** Volume velocity out through the port or radiator, m^3/s. */
  outletFlow: Complex;
  /** Box pressure, Pa. */
  boxPressure: Complex;
  current: Complex;
  /** Driver terminal impedance, ohm (series resistance excluded). */
  impedance: Complex;
  /** Volts at the driver terminals (after the amplifier's resistance and any passive network). */
  terminalVoltage: Complex;
}

/**
 * The blocked coil: Re + jw·Le, plus the semi-inductance jw·L2·R2/(R2 + jw·L2) when given (the
 * L2R2 lossy-inductance model: eddy currents make the coil's inductance fall and its resistance rise
 * with frequency).
 */
export function coilImpedance(d: Pick<Driver, 're' | 'le' | 'l2' | 'r2'>, w: number): Complex {
  const z = cx(d.re, w * d.le);
  if (!(d.l2 > 0)) return z;
  const jwl2 = cx(0, w * d.l2);
  return add(z, div(scale(jwl2, d.r2), add(cx(d.r2), jwl2)));
}

/** Room or cabin gain: a 12 dB/octave rise below the corner (common practice, no source). */
export function roomGain(f: number, cornerHz: number): number {
  return cornerHz > 0 ? Math.sqrt(1 + (cornerHz / f) ** 4) : 1;
}

/** The baffle step (1 + s/wz)/(1 + s/wp) at w, with the corners of filters/room.ts; 1 when off. */
export function baffleGain(w: number, widthM: number): Complex {
  if (!(widthM > 0)) return cx(1);
  const { wz, wp } = baffleStepCorners(widthM);
  return div(cx(1, w / wz), cx(1, w / wp));
}

/**
 * One driver way at frequency f for `volts` rms at the amplifier's input: the way's filter (gain and
 * delay included) in front of the amplifier, then the driver in its box. Polarity and the acoustic
 * offset are left to `wayPressure`, which places the way in the sum.
 */
export function respond(system: SpeakerSystem, way: DriverWay, f: number, volts: number, withRoomGain = true): PointResponse {
  const r = modelled(system, way, f, volts, withRoomGain);
  // A measured response corrects the pressure at the seat; the cone's and outlet's shares stay modelled.
  return way.measured ? { ...r, pressure: mul(r.pressure, measuredCorrection(system, way)!.at(f)) } : r;
}

const NO_FILTER: ActiveFilter = { type: 'active', highpass: null, lowpass: null, gain: 1, delay: 0 };

/**
 * A driver way's measured-response correction, or null without one: against its drivers' own
 * pressure in their box at constant voltage (no filter, no network, no room gain; the baffle step in).
 */
export function measuredCorrection(system: SpeakerSystem, way: DriverWay): MeasuredCorrection | null {
  const bare: DriverWay = { ...way, filter: NO_FILTER, network: undefined, measured: undefined };
  const { air, amplifier, listening } = system;
  const dependsOn = [way.driver, way.box, air, amplifier.rs, listening.distance, listening.omega, listening.baffleWidth ?? 0];
  return cachedCorrection(way, dependsOn, (f) => modelled(system, bare, f, 1, false).pressure);
}

/**
 * The last value of a pure function of an object and a frequency, kept for the next call with the same
 * object (by identity) and frequency: the figures solve one way at one frequency many times over (a
 * coil heating up, the limits of a sine), and its filter, network and box do not change between those
 * calls. The very same numbers come back, so nothing the caller computes changes.
 */
function lastAt<K extends object, V>(compute: (key: K, w: number, extra: unknown) => V): (key: K, w: number, extra?: unknown) => V {
  let lastKey: K | null = null;
  let lastW = Number.NaN;
  let lastExtra: unknown;
  let last: V;
  return (key, w, extra) => {
    if (key !== lastKey || w !== lastW || extra !== lastExtra) {
      last = compute(key, w, extra);
      [lastKey, lastW, lastExtra] = [key, w, extra];
    }
    return last;
  };
}

const filterAt = lastAt((filter: ActiveFilter, w) => wayFilterAt(filter, w));
const theveninAt = lastAt((network: NonNullable<DriverWay['network']>, w, rs) => ladderThevenin(network, w, rs as number));
const acousticsAt = lastAt((box: DriverWay['box'], w, air) => BOX_KINDS[box.type].acoustics(box, air as SpeakerSystem['air'], w));

function modelled(system: SpeakerSystem, way: DriverWay, f: number, volts: number, withRoomGain: boolean): PointResponse {
  const { air, amplifier, listening } = system;
  const { driver: d, box } = way;
  const w = 2 * Math.PI * f;
  const jw = cx(0, w);
  let drive = scale(filterAt(way.filter, w), volts);
  const coil = coilImpedance(d, w);
  let source = cx(amplifier.rs);
  if (way.network) {
    // A passive way: the amplifier and its network seen from the driver terminals.
    const th = theveninAt(way.network, w, amplifier.rs);
    drive = mul(drive, th.gain);
    source = th.z;
  }
  const ze = add(coil, source);
  const zm = cx(d.rms, w * d.mms - 1 / (w * d.cms));
  const ac = acousticsAt(box, w, air);
  const zmTotal = add(zm, scale(ac.zLoad, d.sd * d.sd));
  const motional = div(cx(d.bl * d.bl), zmTotal);
  const current = div(drive, add(ze, motional));
  const coneVelocity = div(scale(current, d.bl), zmTotal);
  const coneFlow = scale(coneVelocity, d.sd);
  const boxPressure = mul(ac.chamber, coneFlow);
  const outletFlow = mul(ac.outlet, coneFlow);
  const k = (air.rho * (withRoomGain ? roomGain(f, listening.roomGainHz) : 1)) / (listening.omega * listening.distance);
  // Radiation: jw·rho/(Omega·r), times the baffle step of a free-standing cabinet.
  const radiation = scale(mul(jw, baffleGain(w, listening.baffleWidth ?? 0)), k);
  const conePressure = scale(mul(radiation, coneFlow), ac.cone);
  const outletPressure = mul(radiation, outletFlow);
  const leakPressure = mul(radiation, mul(ac.leak, coneFlow));
  return {
    pressure: add(add(conePressure, outletPressure), leakPressure),
    conePressure,
    outletPressure,
    coneVelocity,
    excursion: div(coneVelocity, jw),
    outletFlow,
    boxPressure,
    current,
    impedance: add(coil, motional),
    terminalVoltage: sub(drive, mul(current, source)),
  };
}

/**
 * Passband pressure for `volts` rms well above resonance and below the Le corner:
 * p = rho·Sd·Bl·e / ((Re + Rs)·Mms·Omega·r) — the level Small's reference efficiency predicts.
 */
export function passbandPressure(system: SpeakerSystem, way: Way, volts: number, distance = system.listening.distance): number {
  if (way.kind === 'flat') return (way.paPerV * volts * system.listening.distance) / distance;
  const { air, amplifier, listening } = system;
  const d = way.driver;
  return (air.rho * d.sd * d.bl * volts) / ((d.re + amplifier.rs) * d.mms * listening.omega * distance);
}

/** Time of flight of a way's acoustic offset, s (its depth behind the baffle reference over c). */
export const offsetDelay = (system: SpeakerSystem, way: Way): number => way.offset / system.air.c;

/**
 * A way's complex pressure at the seat as it enters the sum: filter, driver (or the flat band at its
 * passband level, with the baffle step), polarity, and the acoustic offset as a delay.
 */
export function wayPressure(system: SpeakerSystem, way: Way, f: number, volts: number, withRoomGain = true): Complex {
  const w = 2 * Math.PI * f;
  const own =
    way.kind === 'driver'
      ? respond(system, way, f, volts, withRoomGain).pressure
      : mul(scale(wayFilterAt(way.filter, w), way.paPerV * volts), baffleGain(w, system.listening.baffleWidth ?? 0));
  return placedInSum(system, way, own, f);
}

/** A way's own pressure at f as it enters the sum: its polarity and its offset's delay applied. */
export function placedInSum(system: SpeakerSystem, way: Way, own: Complex, f: number): Complex {
  return scale(mul(own, delayAt(2 * Math.PI * f, offsetDelay(system, way))), way.polarity);
}

/** The whole system's complex pressure at the seat: the sum of its ways. */
export function systemPressure(system: SpeakerSystem, f: number, volts: number, withRoomGain = true): Complex {
  let sum = cx(0);
  for (const way of system.ways) sum = add(sum, wayPressure(system, way, f, volts, withRoomGain));
  return sum;
}
