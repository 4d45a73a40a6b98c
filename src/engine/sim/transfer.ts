// The small-signal transfer of the same lumped model, as a rational function of s:
// seat pressure per volt of amplifier EMF (series resistance included). Built by impedance algebra:
//   Ze = R + s·Le; box admittance Yb = s·Cab + 1/Ral + Yport (Yport = 1/(s·Map), or the radiator's
//   Sp^2·s/(s^2·Mmp + s·Rmp + Kmp)); v/u = Bl / (Ze·(Zm + Sd^2/Yb) + Bl^2);
//   U = Sd·v·s·Cab/Yb (cone + outlet + leak); p = rho/(Omega·r)·s·U   (Small 1972, 1973; Hurlburt 2000).
// Used for the fast audio-rate linear chain.
import type { WooferParams } from './params.ts';
import { BOX_RADIATOR, BOX_VENTED } from './params.ts';
import { polyAdd, polyEval, polyMul, polyScale, type Poly } from '../filters/analog.ts';

export interface Rational {
  num: Poly;
  den: Poly;
}

export function speakerTransfer(p: WooferParams): Rational {
  const R = p.re0 + p.rs;
  const ze: Poly = [R, p.le0];
  let nb: Poly, db: Poly;
  const open: Poly = [p.g, p.cab]; // s·Cab + G
  if (p.boxCode === BOX_VENTED) {
    nb = [1, p.g * p.map, p.cab * p.map];
    db = [0, p.map];
  } else if (p.boxCode === BOX_RADIATOR) {
    const zr: Poly = [p.kmp0, p.rmp, p.mmp];
    nb = polyAdd(polyMul(open, zr), [0, p.sp * p.sp]);
    db = zr;
  } else {
    nb = open;
    db = [1];
  }
  const zmech: Poly = [p.k0, p.rms, p.mms];
  const nm = polyAdd(polyMul(zmech, nb), polyMul([0, p.sd * p.sd], db));
  const den = polyAdd(polyMul(nm, ze), polyScale(polyMul([0, 1], nb), p.bl0 * p.bl0));
  // The leak radiates with cone and port: U = Sd·v·s·Cab/Yb (Small 1973's net compression flow).
  const num = polyScale(polyMul(polyMul([0, 0, 1], [0, p.cab]), db), p.kOut * p.sd * p.bl0);
  return { num, den };
}

/** Complex value of a rational function at s = j·2·pi·f. */
export function rationalAt(r: Rational, f: number): [number, number] {
  const w = 2 * Math.PI * f;
  const [nr, ni] = polyEval(r.num, 0, w);
  const [dr, di] = polyEval(r.den, 0, w);
  const d2 = dr * dr + di * di;
  return [(nr * dr + ni * di) / d2, (ni * dr - nr * di) / d2];
}
