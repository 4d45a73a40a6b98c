// The small-signal transfer of the same lumped model, as a rational function of s:
// seat pressure per volt of amplifier EMF (series resistance included). Built by impedance algebra:
//   Ze = R + s·Le; the box kind's acoustic load on the cone zLoad = nz/dz (box/physics.ts);
//   v/u = Bl / (Ze·(Zm + Sd^2·zLoad) + Bl^2); U = Sd·v·nr/dz (what radiates: cone, outlet, leaks);
//   p = rho/(Omega·r)·s·U   (Small 1972, 1973; Hurlburt 2000).
// Used for the fast audio-rate linear chain.
import type { WooferParams } from './params.ts';
import { polyAdd, polyMul, polyScale, type Poly } from '../filters/analog.ts';

export interface Rational {
  num: Poly;
  den: Poly;
}

export function speakerTransfer(p: WooferParams): Rational {
  const R = p.re0 + p.rs;
  // Ze = zeN/zeD: R + s·Le, plus s·L2·R2/(R2 + s·L2) with a semi-inductance.
  const zeD: Poly = p.l2 > 0 ? [p.r2, p.l2] : [1];
  const ze: Poly = p.l2 > 0 ? polyAdd(polyMul([R, p.le0], zeD), [0, p.l2 * p.r2]) : [R, p.le0];
  const { nz, dz, nr } = p.newChamber().transfer();
  const zmech: Poly = [p.k0, p.rms, p.mms];
  // s·(Zm + Sd^2·zLoad)·dz, with zLoad = nz/dz.
  const nm = polyAdd(polyMul(zmech, dz), polyMul([0, p.sd * p.sd], nz));
  const dzD = p.l2 > 0 ? polyMul(dz, zeD) : dz;
  const den = polyAdd(polyMul(nm, ze), polyScale(polyMul([0, 1], dzD), p.bl0 * p.bl0));
  // Radiated flow per cone flow nr/dz (Small 1973's net compression flow in a one-chamber box).
  const num = polyScale(polyMul([0, 0, 1], p.l2 > 0 ? polyMul(nr, zeD) : nr), p.kOut * p.sd * p.bl0);
  return { num, den };
}
