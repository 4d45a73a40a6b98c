// The model's typed large-signal polynomials, every length from none to the most a design may hold
// (src/engine/sim/nonlinear.ts MAX_COEFFICIENTS), checked against the static force balance on the
// cone: held at a steady voltage in a vented box (whose port lets the box pressure go to zero at
// DC), the cone comes to rest where the motor force and the reluctance force meet the suspension,
//   Bl(x)·i + ½·Le'(x)·i² = Kms(x)·x
// (the lumped-parameter large-signal model, "Tutorial: Loudspeaker Nonlinearities", JAES 54 (2006)).
// The test evaluates the polynomials itself, as power sums in millimetres, so a coefficient taken
// from the wrong place or a term left out by the model's unrolled Horner chains moves the balance
// by percents, while the model's own rounding leaves it within 1e-9.
import { describe, expect, it } from 'vitest';
import { MAX_COEFFICIENTS } from '../src/engine/sim/nonlinear.ts';
import { wooferParams } from '../src/engine/sim/params.ts';
import { WooferSim } from '../src/engine/sim/woofer.ts';
import { system, ventedBox, wooferOf } from './sim-fixtures.ts';

const FS = 48000;

/** Relative coefficients per mm^k (our own numbers): a_k / 8^k with |a_k| <= 0.1, so each curve stays within 1 ± 0.5 to 7 mm. */
const shape = (count: number, seed: number) => Array.from({ length: count }, (_, k) => (0.1 * Math.sin(seed + 1.7 * k)) / 8 ** (k + 1));

/** 1 + Σ c_k·x^k and its derivative per metre, x in metres, c per mm^k. */
function curve(c: number[], xM: number): { value: number; slope: number } {
  const mm = xM * 1000;
  let value = 1,
    slope = 0;
  c.forEach((ck, k) => {
    value += ck * mm ** (k + 1);
    slope += (k + 1) * ck * mm ** k * 1000;
  });
  return { value, slope };
}

describe('typed Bl(x), Kms(x) and Le(x) of every length: the cone at rest meets the force balance', () => {
  for (let count = 0; count <= MAX_COEFFICIENTS; count++) {
    it(`${count} coefficients in each polynomial`, () => {
      const sys = system(ventedBox(28, 38, 7), { d: { leMh: 0.6, xmaxMm: 5, xlimMm: 15 } });
      const d = wooferOf(sys).driver;
      d.blRelPerMm = shape(count, 1);
      d.kmsRelPerMm = shape(count, 2);
      d.leRelPerMm = shape(count, 3);
      // No default curves where a polynomial is empty: constant Bl, Kms and Le.
      d.nonlinearFitted = false;
      const sim = new WooferSim(wooferParams(sys, wooferOf(sys), 1 / FS));
      // A raised-cosine ramp to 5.5 V over 0.2 s, then held until the box and port have settled.
      const ramp = 0.2 * FS;
      for (let k = 0; k < 3 * FS; k++) sim.step(k < ramp ? 2.75 * (1 - Math.cos((Math.PI * k) / ramp)) : 5.5);
      const { x, i, v } = sim;
      expect(Math.abs(v)).toBeLessThan(1e-9);
      expect(x * 1000).toBeGreaterThan(4);
      const bl = d.bl * curve(d.blRelPerMm, x).value;
      const kms = curve(d.kmsRelPerMm, x).value / d.cms;
      const dLe = d.le * curve(d.leRelPerMm, x).slope;
      const motor = bl * i + 0.5 * dLe * i * i;
      expect(Math.abs(motor - kms * x) / (kms * x)).toBeLessThan(1e-9);
    });
  }
});
