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
import { add, cx, hypot, mul, scale, type Complex } from '../complex.ts';
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
export function coilImpedance(d: Pick<Driver, 're' | 'le' | 'l2' | 'r2'>, w: number, out: Complex = cx(0)): Complex {
  out.re = d.re;
  out.im = w * d.le;
  if (!(d.l2 > 0)) return out;
  // add(z, div(scale(jwL2, R2), add(cx(R2), jwL2))) written out, in the helpers' order of operations.
  const wl2 = w * d.l2;
  const numRe = 0 * d.r2;
  const numIm = wl2 * d.r2;
  const denRe = d.r2 + 0;
  const denIm = 0 + wl2;
  const den2 = denRe * denRe + denIm * denIm;
  out.re += (numRe * denRe + numIm * denIm) / den2;
  out.im += (numIm * denRe - numRe * denIm) / den2;
  return out;
}

/** Room or cabin gain: a 12 dB/octave rise below the corner (common practice, no source). */
export function roomGain(f: number, cornerHz: number): number {
  return cornerHz > 0 ? Math.sqrt(1 + (cornerHz / f) ** 4) : 1;
}

/** The last baffle width's step corners (they depend on the width alone): a design has one width, asked for at every solve. */
const cornersOf = { widthM: Number.NaN, corners: { wz: 0, wp: 0 } };

/** The baffle step (1 + s/wz)/(1 + s/wp) at w, with the corners of filters/room.ts; 1 when off. */
export function baffleGain(w: number, widthM: number, out: Complex = cx(0)): Complex {
  if (!(widthM > 0)) {
    out.re = 1;
    out.im = 0;
    return out;
  }
  if (widthM !== cornersOf.widthM) {
    cornersOf.widthM = widthM;
    cornersOf.corners = baffleStepCorners(widthM);
  }
  const { wz, wp } = cornersOf.corners;
  // div(cx(1, w/wz), cx(1, w/wp)) written out, in the helper's order of operations.
  const a = w / wz;
  const b = w / wp;
  const d = 1 * 1 + b * b;
  out.re = (1 * 1 + a * b) / d;
  out.im = (a * 1 - 1 * b) / d;
  return out;
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
      lastKey = key;
      lastW = w;
      lastExtra = extra;
    }
    return last;
  };
}

const filterAt = lastAt((filter: ActiveFilter, w) => wayFilterAt(filter, w));
const theveninAt = lastAt((network: NonNullable<DriverWay['network']>, w, rs) => ladderThevenin(network, w, rs as number));
const acousticsAt = lastAt((box: DriverWay['box'], w, air) => BOX_KINDS[box.type].acoustics(box, air as SpeakerSystem['air'], w));

/** Where `solve` leaves each phasor in `SOLVED`: its real part, its imaginary part next. */
const enum At {
  pressure = 0,
  conePressure = 2,
  outletPressure = 4,
  coneVelocity = 6,
  excursion = 8,
  outletFlow = 10,
  boxPressure = 12,
  current = 14,
  impedance = 16,
  terminalVoltage = 18,
}
/** The last solution, overwritten by the next `solve` (read it before solving again). */
const SOLVED = new Float64Array(20);
/** `solve`'s coil impedance and baffle step at the frequency being solved (read within the call). */
const COIL = cx(0);
const BAFFLE = cx(0);

/*
 * The circuit is solved in real and imaginary parts rather than through complex.ts's objects: the
 * analysis solves it some ten times per grid point (the coil heating up, the limits of a sine), and
 * the objects were most of what it allocated. Each line does exactly the operations of the helper it
 * stands for, in the same order (`div(a, b)`: (a.re·b.re + a.im·b.im)/d, (a.im·b.re − a.re·b.im)/d
 * with d = b.re² + b.im²), so the numbers are the same to the last bit (test/analysis-identity.test.ts).
 * The solution lands in `SOLVED`: `modelled` makes the response's phasors of it, `wayPressure` reads
 * only the pressure.
 */
function solve(system: SpeakerSystem, way: DriverWay, f: number, volts: number, withRoomGain: boolean): Float64Array {
  const { air, amplifier, listening } = system;
  const { driver: d, box } = way;
  const w = 2 * Math.PI * f;
  const filter = filterAt(way.filter, w);
  // drive = filter·volts, through the network's Thevenin gain for a passive way
  let driveRe = filter.re * volts;
  let driveIm = filter.im * volts;
  const coil = coilImpedance(d, w, COIL);
  let sourceRe = amplifier.rs;
  let sourceIm = 0;
  if (way.network) {
    // A passive way: the amplifier and its network seen from the driver terminals.
    const th = theveninAt(way.network, w, amplifier.rs);
    const re = driveRe * th.gain.re - driveIm * th.gain.im;
    driveIm = driveRe * th.gain.im + driveIm * th.gain.re;
    driveRe = re;
    sourceRe = th.z.re;
    sourceIm = th.z.im;
  }
  // ze = coil + source; zmTotal = (Rms + j(w·Mms − 1/(w·Cms))) + zLoad·Sd²
  const zeRe = coil.re + sourceRe;
  const zeIm = coil.im + sourceIm;
  const ac = acousticsAt(box, w, air);
  const sd2 = d.sd * d.sd;
  const ztRe = d.rms + ac.zLoad.re * sd2;
  const ztIm = w * d.mms - 1 / (w * d.cms) + ac.zLoad.im * sd2;
  const zt2 = ztRe * ztRe + ztIm * ztIm;
  // motional = Bl²/zmTotal
  const bl2 = d.bl * d.bl;
  const motionalRe = (bl2 * ztRe + 0 * ztIm) / zt2;
  const motionalIm = (0 * ztRe - bl2 * ztIm) / zt2;
  // current = drive/(ze + motional)
  const zRe = zeRe + motionalRe;
  const zIm = zeIm + motionalIm;
  const z2 = zRe * zRe + zIm * zIm;
  const currentRe = (driveRe * zRe + driveIm * zIm) / z2;
  const currentIm = (driveIm * zRe - driveRe * zIm) / z2;
  // coneVelocity = current·Bl/zmTotal; coneFlow = coneVelocity·Sd
  const forceRe = currentRe * d.bl;
  const forceIm = currentIm * d.bl;
  const velocityRe = (forceRe * ztRe + forceIm * ztIm) / zt2;
  const velocityIm = (forceIm * ztRe - forceRe * ztIm) / zt2;
  const flowRe = velocityRe * d.sd;
  const flowIm = velocityIm * d.sd;
  const { chamber, outlet, leak } = ac;
  const outletFlowRe = outlet.re * flowRe - outlet.im * flowIm;
  const outletFlowIm = outlet.re * flowIm + outlet.im * flowRe;
  const k = (air.rho * (withRoomGain ? roomGain(f, listening.roomGainHz) : 1)) / (listening.omega * listening.distance);
  // Radiation: jw·rho/(Omega·r), times the baffle step of a free-standing cabinet.
  const baffle = baffleGain(w, listening.baffleWidth ?? 0, BAFFLE);
  const radiationRe = (0 * baffle.re - w * baffle.im) * k;
  const radiationIm = (0 * baffle.im + w * baffle.re) * k;
  const coneRe = (radiationRe * flowRe - radiationIm * flowIm) * ac.cone;
  const coneIm = (radiationRe * flowIm + radiationIm * flowRe) * ac.cone;
  const outletRe = radiationRe * outletFlowRe - radiationIm * outletFlowIm;
  const outletIm = radiationRe * outletFlowIm + radiationIm * outletFlowRe;
  const leakFlowRe = leak.re * flowRe - leak.im * flowIm;
  const leakFlowIm = leak.re * flowIm + leak.im * flowRe;
  const leakRe = radiationRe * leakFlowRe - radiationIm * leakFlowIm;
  const leakIm = radiationRe * leakFlowIm + radiationIm * leakFlowRe;
  // excursion = coneVelocity/jw
  const w2 = 0 * 0 + w * w;
  const out = SOLVED;
  out[At.pressure] = coneRe + outletRe + leakRe;
  out[At.pressure + 1] = coneIm + outletIm + leakIm;
  out[At.conePressure] = coneRe;
  out[At.conePressure + 1] = coneIm;
  out[At.outletPressure] = outletRe;
  out[At.outletPressure + 1] = outletIm;
  out[At.coneVelocity] = velocityRe;
  out[At.coneVelocity + 1] = velocityIm;
  out[At.excursion] = (velocityRe * 0 + velocityIm * w) / w2;
  out[At.excursion + 1] = (velocityIm * 0 - velocityRe * w) / w2;
  out[At.outletFlow] = outletFlowRe;
  out[At.outletFlow + 1] = outletFlowIm;
  out[At.boxPressure] = chamber.re * flowRe - chamber.im * flowIm;
  out[At.boxPressure + 1] = chamber.re * flowIm + chamber.im * flowRe;
  out[At.current] = currentRe;
  out[At.current + 1] = currentIm;
  out[At.impedance] = coil.re + motionalRe;
  out[At.impedance + 1] = coil.im + motionalIm;
  out[At.terminalVoltage] = driveRe - (currentRe * sourceRe - currentIm * sourceIm);
  out[At.terminalVoltage + 1] = driveIm - (currentRe * sourceIm + currentIm * sourceRe);
  return out;
}

const phasor = (s: Float64Array, at: At): Complex => ({ re: s[at], im: s[at + 1] });

/** The parts of a way's response a sine's limits read (`sineParts`): magnitudes, rms for an rms drive. */
export interface SineParts {
  /** |p| at the seat, Pa (a measured way's correction applied, as `respond` applies it). */
  pressure: number;
  /** |x| of the cone, m. */
  excursion: number;
  /** |U| out through the port or radiator, m^3/s. */
  outletFlow: number;
  /** |i| in the coil, A. */
  current: number;
}

/**
 * `respond`'s pressure, excursion, outlet flow and current as magnitudes, written into `out`: the
 * same numbers to the last bit (the same operations, `abs` being `hypot` of the parts), without
 * the eleven objects of a response. The largest sine solves each grid point up to thirteen times.
 */
export function sineParts(system: SpeakerSystem, way: DriverWay, f: number, volts: number, out: SineParts): SineParts {
  const s = solve(system, way, f, volts, true);
  let pRe = s[At.pressure];
  let pIm = s[At.pressure + 1];
  if (way.measured) {
    // mul(pressure, correction), written out.
    const c = measuredCorrection(system, way)!.at(f);
    const re = pRe * c.re - pIm * c.im;
    pIm = pRe * c.im + pIm * c.re;
    pRe = re;
  }
  out.pressure = hypot(pRe, pIm);
  out.excursion = hypot(s[At.excursion], s[At.excursion + 1]);
  out.outletFlow = hypot(s[At.outletFlow], s[At.outletFlow + 1]);
  out.current = hypot(s[At.current], s[At.current + 1]);
  return out;
}

function modelled(system: SpeakerSystem, way: DriverWay, f: number, volts: number, withRoomGain: boolean): PointResponse {
  const s = solve(system, way, f, volts, withRoomGain);
  return {
    pressure: phasor(s, At.pressure),
    conePressure: phasor(s, At.conePressure),
    outletPressure: phasor(s, At.outletPressure),
    coneVelocity: phasor(s, At.coneVelocity),
    excursion: phasor(s, At.excursion),
    outletFlow: phasor(s, At.outletFlow),
    boxPressure: phasor(s, At.boxPressure),
    current: phasor(s, At.current),
    impedance: phasor(s, At.impedance),
    terminalVoltage: phasor(s, At.terminalVoltage),
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
  // A driver way without a measured response needs only the pressure of the solution (no objects
  // for the rest of it: the sum and its group delay solve every way twice per grid point).
  const own =
    way.kind !== 'driver'
      ? mul(scale(wayFilterAt(way.filter, w), way.paPerV * volts), baffleGain(w, system.listening.baffleWidth ?? 0))
      : drivenPressure(system, way, f, volts, withRoomGain);
  return placedInSum(system, way, own, f);
}

/**
 * `respond(...).pressure` (a measured way's correction included) without the rest of the response:
 * the pressure read from the solution, one object instead of eleven. The sum, its group delay and
 * the ways' f3 scans ask for nothing else.
 */
export function drivenPressure(system: SpeakerSystem, way: DriverWay, f: number, volts: number, withRoomGain = true): Complex {
  return way.measured
    ? respond(system, way, f, volts, withRoomGain).pressure
    : phasor(solve(system, way, f, volts, withRoomGain), At.pressure);
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
