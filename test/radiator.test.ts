import { describe, expect, it } from 'vitest';
import { analyze, unfiltered } from '../src/engine/response/analyze.ts';
import { respond, passbandPressure } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { bulkModulus } from '../src/engine/air.ts';
import { doc, qesFor, system, woofer } from './helpers/designs.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';

// Small, "Passive-Radiator Loudspeaker Systems", JAES 1974; Hurlburt, JAES 2000.
const fs = 35;
const qms = 1e4;
const qts = 0.35;
const vasL = 50;
/** The driver in its box alone: no way filter. */
const bare = (s: SpeakerSystem) => unfiltered(woofer(s));
const NO_CROSSOVER = { crossover: { type: 'none' as const } };
const radiator = (cmp: number, mmpG = 60, vbL = 30, qmp: number | null = null) =>
  system(
    doc(
      { fs_hz: fs, qes: qesFor(qts, qms), qms, vas_l: vasL, sd_cm2: 200, xmax_mm: 6 },
      { type: 'passive-radiator', vb_l: vbL, ql: null, radiator: { sd_cm2: 300, mmp_g: mmpG, cmp_mm_per_n: cmp, qmp, xmax_mm: 12 } },
      NO_CROSSOVER,
    ),
  );

describe('passive radiator (Small 1974)', () => {
  it('tunes to sqrt((Kmp + rho c^2 Sp^2/Vb)/Mmp)/(2 pi) and notches at its own resonance fp', () => {
    const s = radiator(0.5);
    const box = woofer(s).box;
    if (box.type !== 'passive-radiator') throw new Error('box type');
    const kmp = 1 / 0.5e-3;
    const fb = Math.sqrt((kmp + (bulkModulus(s.air) * 0.03 ** 2) / 0.03) / 0.06) / (2 * Math.PI);
    const fp = Math.sqrt(kmp / 0.06) / (2 * Math.PI);
    expect(box.fb).toBeCloseTo(fb, 9);
    expect(box.fp).toBeCloseTo(fp, 9);
    const ref = passbandPressure(s, bare(s), 1);
    expect(abs(respond(s, bare(s), fp, 1).pressure) / ref).toBeLessThan(1e-6);
    expect(abs(respond(s, bare(s), fp * 1.2, 1).pressure) / ref).toBeGreaterThan(0.05);
  });

  it('matches the published lossless response G(s) = s^2 (s^2 + wp^2) / D(s)', () => {
    const s = radiator(0.5);
    const box = woofer(s).box;
    if (box.type !== 'passive-radiator') throw new Error('box type');
    const ws = 2 * Math.PI * fs;
    const wp = 2 * Math.PI * box.fp;
    const alpha = woofer(s).driver.vas / box.vb;
    const delta = (bulkModulus(s.air) * box.sp ** 2) / box.kmp / box.vb; // Vap/Vb
    const ref = passbandPressure(s, bare(s), 1);
    for (const f of [12, 20, 28, 40, 55, 90, 200]) {
      const w = 2 * Math.PI * f;
      // s = jw: numerator s^2(s^2 + wp^2) = -w^2 (wp^2 - w^2); evaluate D(jw) as complex
      const numerator = Math.abs(-w * w * (wp * wp - w * w));
      const dRe = w ** 4 - (ws * ws * (1 + alpha) + wp * wp * (1 + delta)) * w * w + ws * ws * wp * wp * (1 + alpha + delta);
      const dIm = -(ws / qts) * w ** 3 + ((ws * wp * wp * (1 + delta)) / qts) * w;
      const g = numerator / Math.hypot(dRe, dIm);
      expect(20 * Math.log10(abs(respond(s, bare(s), f, 1).pressure) / ref)).toBeCloseTo(20 * Math.log10(g), 3);
    }
  });

  it('reduces to the vented box as the radiator compliance grows without bound', () => {
    const pr = radiator(1000, 60, 30);
    const box = woofer(pr).box;
    if (box.type !== 'passive-radiator') throw new Error('box type');
    const fb = box.fb;
    const vent = system(
      doc(
        { fs_hz: fs, qes: qesFor(qts, qms), qms, vas_l: vasL, sd_cm2: 200, xmax_mm: 6 },
        { type: 'vented', vb_l: 30, fb_hz: fb, ql: null, ports: [{ diameter_cm: 10 }] },
        NO_CROSSOVER,
      ),
    );
    for (const f of [15, 25, 35, 60]) {
      const a = 20 * Math.log10(abs(respond(pr, bare(pr), f, 1).pressure));
      const b = 20 * Math.log10(abs(respond(vent, bare(vent), f, 1).pressure));
      expect(a).toBeCloseTo(b, 1); // within 0.05 dB: the residual radiator stiffness is 0.2% of the box air spring
    }
  });

  it("reports radiator excursion, which exceeds the cone's near fb", () => {
    const a = analyze(radiator(0.5));
    const k = a.curves.freqHz.findIndex((f) => f >= (a.figures.fbHz ?? 0));
    expect(a.curves.radiatorExcursionMm![k]).toBeGreaterThan(a.curves.excursionMm[k]);
    expect(a.figures.fpHz).not.toBeNull();
  });
});
