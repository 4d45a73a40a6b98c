// Voice-coil heating: the exact discretisation of the two-node network against its analytic
// step response (Henricksen, JAES 1987; Button, JAES 1992), and the copper compression figures.
import { describe, expect, it } from 'vitest';
import { compressionDb, steadyRise, thermalStep } from '../src/engine/sim/thermal.ts';
import { ALPHA_R } from '../src/engine/design/convert.ts';
import type { ThermalParams } from '../src/engine/system.ts';

const net: ThermalParams = { rtv: 2.5, ctv: 4, rtm: 1.5, ctm: 800, alphaR: 3.93e-3, material: 'copper', coilMaxC: 150 };

/** Analytic coil rise for power P switched on at t = 0 (two real exponentials). */
function analyticRise(t: number, P: number): number {
  const { rtv, ctv, rtm, ctm } = net;
  // Characteristic equation of the network: s^2 + b s + c = 0.
  const b = 1 / (rtv * ctv) + (1 / rtv + 1 / rtm) / ctm;
  const c = 1 / (rtv * ctv * rtm * ctm);
  const s1 = (-b + Math.sqrt(b * b - 4 * c)) / 2;
  const s2 = (-b - Math.sqrt(b * b - 4 * c)) / 2;
  const tInf = P * (rtv + rtm);
  // T(t) = T_inf + A e^{s1 t} + B e^{s2 t}, T(0) = 0, T'(0) = P/Ctv.
  const B = (P / ctv + s1 * tInf) / (s2 - s1);
  const A = -tInf - B;
  return tInf + A * Math.exp(s1 * t) + B * Math.exp(s2 * t);
}

describe('two-node thermal network', () => {
  it('follows the analytic two-exponential step response (steps of 5 ms and 1 s)', () => {
    for (const dt of [0.005, 1]) {
      const st = thermalStep(net, dt);
      let tv = 0,
        tm = 0;
      const P = 20;
      for (let k = 1; k <= Math.round(3600 / dt); k++) {
        const a = st.p11 * tv + st.p12 * tm + st.g1 * P;
        tm = st.p21 * tv + st.p22 * tm + st.g2 * P;
        tv = a;
        const t = k * dt;
        if (Math.abs(t - 10) < dt / 2 || Math.abs(t - 600) < dt / 2 || Math.abs(t - 3600) < dt / 2) {
          expect(Math.abs(tv - analyticRise(t, P))).toBeLessThan(1e-9 * (1 + analyticRise(t, P)));
        }
      }
    }
  });
  it('settles at P·(Rtv + Rtm)', () => {
    expect(steadyRise(net, 20)).toBeCloseTo(80, 12);
    expect(analyticRise(1e6, 20)).toBeCloseTo(80, 9);
  });
  it('voltage-drive compression of a copper coil: -1.56, -2.88, -4.03, -5.04 dB for 50..200 K (REFERENCES, derived from IEC 60028)', () => {
    expect(ALPHA_R.copper).toBe(3.93e-3);
    const expected = [-1.56, -2.88, -4.03, -5.04];
    for (const [k, rise] of [50, 100, 150, 200].entries()) expect(compressionDb(ALPHA_R.copper, rise)).toBeCloseTo(expected[k], 2);
  });
});
