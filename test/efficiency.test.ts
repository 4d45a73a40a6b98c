import { describe, expect, it } from 'vitest';
import { analyze, referenceEfficiency } from '../src/engine/response/analyze.ts';
import { doc, system, woofer } from './helpers/designs.ts';

// Small, JAES 1972/1973: eta0 = (4 pi^2 / c^3)·fs^3·Vas/Qes = rho·Bl^2·Sd^2 / (2 pi·c·Re·Mms^2).
describe('reference efficiency and sensitivity (Small 1972)', () => {
  const d = doc({ fs_hz: 40, qes: 0.4, qms: 4, vas_l: 30 }, { type: 'sealed', vb_l: 20 });

  it('agrees with the fs/Vas/Qes form of eta0', () => {
    const s = system(d);
    const eta = (4 * Math.PI ** 2 * 40 ** 3 * 0.03) / (s.air.c ** 3 * 0.4);
    expect(referenceEfficiency(s, woofer(s))).toBeCloseTo(eta, 12);
    expect(analyze(s).figures.eta0Pct).toBeCloseTo(eta * 100, 10);
  });

  it('gives the half-space sensitivity 112.16 dB + 10·log10(eta0) for 1 W at 1 m', () => {
    // 10·log10(rho c/(2 pi p_ref^2)) = 112.16 dB at 20 °C (Small's eta0 is a half-space figure)
    const f = analyze(system(d)).figures;
    const perWatt = f.sensitivityDb - 10 * Math.log10(2.83 ** 2 / 6); // 2.83 V into Re referred to 1 W
    expect(perWatt).toBeCloseTo(112.16 + 10 * Math.log10(f.eta0Pct / 100), 1);
  });

  it('is 6 dB lower in full space: a mass-controlled cone keeps its volume velocity, the image source goes (the baffle step; common practice)', () => {
    const half = analyze(system(d)).figures.sensitivityDb;
    const full = analyze(system({ ...d, listening: { distance_m: 1, space: 'full' } })).figures.sensitivityDb;
    expect(half - full).toBeCloseTo(20 * Math.log10(2), 6);
  });
});
