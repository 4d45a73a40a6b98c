import { describe, expect, it } from 'vitest';
import { analyze, HALF_POWER_DB, rolloffHz, splDb, unfiltered } from '../src/engine/response/analyze.ts';
import { respond, passbandPressure } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { sealedF3Ratio, sealedVolumeFor } from '../src/engine/align/index.ts';
import { doc, qesFor, system, woofer } from './helpers/designs.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';

// Small, "Closed-Box Loudspeaker Systems", JAES 1972. The driver in its box alone: no way filter.
const NO_CROSSOVER = { crossover: { type: 'none' as const } };
const bare = (s: SpeakerSystem) => unfiltered(woofer(s));
const qms = 5;
const sealedWithQtc = (qtc: number, qts = 0.35, vasL = 40) => {
  const vbL = sealedVolumeFor(vasL / 1000, qts, qtc) * 1000;
  return system(doc({ fs_hz: 30, qes: qesFor(qts, qms), qms, vas_l: vasL }, { type: 'sealed', vb_l: vbL }, NO_CROSSOVER));
};

describe('closed box (Small 1972)', () => {
  it('has fc = fs·sqrt(1 + alpha) and Qtc = Qts·sqrt(1 + alpha)', () => {
    const s = system(doc({ fs_hz: 30, qes: qesFor(0.35, qms), qms, vas_l: 40 }, { type: 'sealed', vb_l: 20 }));
    const f = analyze(s).figures;
    expect(f.fcHz).toBeCloseTo(30 * Math.sqrt(3), 6);
    expect(f.qtc).toBeCloseTo(0.35 * Math.sqrt(3), 6);
  });

  it.each([
    // Exact F3 of the 2nd-order high-pass, f3/fc (table derived from Small's equation)
    [0.5, 1.5538],
    [0.577, 1.2731],
    [0.7071, 1.0],
    [0.8, 0.8972],
    [0.9, 0.8295],
    [1.0, 0.7862],
    [1.2, 0.7358],
  ])('Qtc %f gives f3/fc = %f', (qtc, ratio) => {
    const s = sealedWithQtc(qtc);
    const fcHz = analyze(s).figures.fcHz!;
    expect(rolloffHz(s, bare(s), HALF_POWER_DB) / fcHz).toBeCloseTo(ratio, 3);
    expect(sealedF3Ratio(qtc)).toBeCloseTo(ratio, 3);
  });

  it.each([
    [1.0, 1.25],
    [1.2, 2.41],
  ])('Qtc %f peaks %f dB above the passband: 20·log10(Qtc^2/sqrt(Qtc^2 - 0.25))', (qtc, peakDb) => {
    const s = sealedWithQtc(qtc);
    const a = analyze(s, { fMinHz: 20, fMaxHz: 400, pointsPerOctave: 400 });
    const peak = Math.max(...a.curves.splDb) - a.figures.passbandSplDb;
    expect(peak).toBeCloseTo(peakDb, 2);
  });

  it('has the impedance peak Re·(1 + Qms/Qes) at fc with Le = 0', () => {
    const qes = qesFor(0.35, qms);
    const s = system(doc({ fs_hz: 30, qes, qms, vas_l: 40 }, { type: 'sealed', vb_l: 20 }));
    const fcHz = 30 * Math.sqrt(3);
    expect(abs(respond(s, bare(s), fcHz, 1).impedance)).toBeCloseTo(6 * (1 + qms / qes), 6);
  });

  it('moves Bl·e/(Re·Kms·(1 + alpha)) at low frequency: 1.038 mm peak for Bl 7, Re 6, Kms 1500, alpha 2, 2.83 V rms', () => {
    // Derived check value from Small's closed-box excursion function.
    const cmsMmPerN = 1000 / 1500;
    const s = system(doc({ bl_tm: 7, mms_g: 20, cms_mm_per_n: cmsMmPerN, rms_kg_s: 1.5 }, { type: 'sealed', vb_l: 1 }));
    const vasL = woofer(s).driver.vas * 1000;
    const s2 = system(doc({ bl_tm: 7, mms_g: 20, cms_mm_per_n: cmsMmPerN, rms_kg_s: 1.5 }, { type: 'sealed', vb_l: vasL / 2 }));
    const xPeakMm = Math.SQRT2 * abs(respond(s2, bare(s2), 0.5, 2.83).excursion) * 1000;
    expect(xPeakMm).toBeCloseTo(1.038, 2);
  });

  it('loses level to series resistance as Qes rises with it', () => {
    const base = doc({ fs_hz: 30, qes: 0.4, qms, vas_l: 40 }, { type: 'sealed', vb_l: 20 });
    const withRs = { ...base, amplifier: { ...base.amplifier, rs_ohm: 0.6 } };
    const a = analyze(system(base)).figures;
    const b = analyze(system(withRs)).figures;
    // Passband voltage divider Re/(Re + Rs) (the circuit of Small 1972)
    expect(b.sensitivityDb - a.sensitivityDb).toBeCloseTo(20 * Math.log10(6 / 6.6), 6);
    const qtsRs = 1 / (1 / (0.4 * 1.1) + 1 / qms);
    expect(b.qtc).toBeCloseTo(qtsRs * Math.sqrt(1 + 2), 6);
  });

  it('approaches the passband level predicted by the reference efficiency far above fc', () => {
    const s = sealedWithQtc(0.707);
    expect(splDb(abs(respond(s, bare(s), 600, 2.83).pressure))).toBeCloseTo(splDb(passbandPressure(s, bare(s), 2.83)), 1);
  });
});
