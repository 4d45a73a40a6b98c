// The small-signal lumped circuit solved at one frequency (Thiele 1971; Small 1972, 1973):
//   e = (Re + Rs + jwLe)·i + Bl·v
//   (jwMms + Rms + 1/(jwCms))·v = Bl·i + Sd·pb
//   (jwCab + 1/Ral + Yo)·pb = -Sd·v          (Yo: port or radiator admittance; 0 for sealed)
//   p(r) = jw·rho·(Sd·v + Yo·pb + pb/Ral) / (Omega·r)  (far-field point source in solid angle Omega)
// Leaked air leaves the box too, so it radiates with the cone and port: the net radiated volume
// velocity is the box's compression flow, -jwCab·pb, which gives Small's s^4/D(s) form (JAES 1973).
// Phasors are rms when the drive is rms. Signs as in the large-signal model: x, v outward; pb over ambient.
import type { SpeakerSystem } from '../system.ts';
import { add, cx, div, inv, mul, scale, type Complex } from '../complex.ts';
import { BOX_KINDS } from '../box/index.ts';
import { boxCompliance } from '../box/common.ts';
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
}

/** Room or cabin gain: a 12 dB/octave rise below the corner (common practice, no source). */
export function roomGain(f: number, cornerHz: number): number {
  return cornerHz > 0 ? Math.sqrt(1 + (cornerHz / f) ** 4) : 1;
}

/** The subsonic 2nd-order Butterworth high-pass s^2/(s^2 + sqrt2·w0·s + w0^2) at w; 1 when off. */
export function subsonicGain(w: number, hz: number): Complex {
  if (!(hz > 0)) return cx(1);
  const w0 = 2 * Math.PI * hz;
  return div(cx(-w * w), cx(w0 * w0 - w * w, Math.SQRT2 * w0 * w));
}

/** The baffle step (1 + s/wz)/(1 + s/wp) at w, with the corners of filters/room.ts; 1 when off. */
export function baffleGain(w: number, widthM: number): Complex {
  if (!(widthM > 0)) return cx(1);
  const { wz, wp } = baffleStepCorners(widthM);
  return div(cx(1, w / wz), cx(1, w / wp));
}

export function respond(system: SpeakerSystem, f: number, volts: number, withRoomGain = true): PointResponse {
  const { air, driver: d, box, amplifier, listening } = system;
  const w = 2 * Math.PI * f;
  const jw = cx(0, w);
  // The amplifier's drive after the subsonic filter (the crossover low-pass is left out of the curves).
  const drive = scale(subsonicGain(w, system.crossover.highpassHz ?? 0), volts);
  const ze = cx(d.re + amplifier.rs, w * d.le);
  const zm = cx(d.rms, w * d.mms - 1 / (w * d.cms));
  const yo = BOX_KINDS[box.type].outletAdmittance(box, air, w) ?? cx(0);
  const ybox = add(cx(1 / box.ral, w * boxCompliance(box.vb, air)), yo);
  const zbox = inv(ybox);
  const zmTotal = add(zm, scale(zbox, d.sd * d.sd));
  const motional = div(cx(d.bl * d.bl), zmTotal);
  const current = div(drive, add(ze, motional));
  const coneVelocity = div(scale(current, d.bl), zmTotal);
  const boxPressure = scale(mul(coneVelocity, zbox), -d.sd);
  const outletFlow = mul(yo, boxPressure);
  const k = (air.rho * (withRoomGain ? roomGain(f, listening.roomGainHz) : 1)) / (listening.omega * listening.distance);
  // Radiation: jw·rho/(Omega·r), times the baffle step of a free-standing cabinet.
  const radiation = scale(mul(jw, baffleGain(w, listening.baffleWidth ?? 0)), k);
  const conePressure = mul(radiation, scale(coneVelocity, d.sd));
  const outletPressure = mul(radiation, outletFlow);
  const leakPressure = mul(radiation, scale(boxPressure, 1 / box.ral));
  return {
    pressure: add(add(conePressure, outletPressure), leakPressure),
    conePressure,
    outletPressure,
    coneVelocity,
    excursion: div(coneVelocity, jw),
    outletFlow,
    boxPressure,
    current,
    impedance: add(cx(d.re, w * d.le), motional),
  };
}

/**
 * Passband pressure for `volts` rms well above resonance and below the Le corner:
 * p = rho·Sd·Bl·e / ((Re + Rs)·Mms·Omega·r) — the level Small's reference efficiency predicts.
 */
export function passbandPressure(system: SpeakerSystem, volts: number, distance = system.listening.distance): number {
  const { air, driver: d, amplifier, listening } = system;
  return (air.rho * d.sd * d.bl * volts) / ((d.re + amplifier.rs) * d.mms * listening.omega * distance);
}
