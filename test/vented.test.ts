import { describe, expect, it } from 'vitest';
import { analyze, HALF_POWER_DB, rolloffHz, splDb, unfiltered } from '../src/engine/response/analyze.ts';
import { respond, passbandPressure } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { ventedAlignment } from '../src/engine/align/index.ts';
import { doc, qesFor, system, woofer } from './helpers/designs.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';

// Thiele, "Loudspeakers in Vented Boxes", JAES 1971; Small, "Vented-Box Loudspeaker Systems", JAES 1973.
const fs = 30;
const qms = 1e4; // lossless driver suspension so Qt is the whole loss, as in Thiele's table
const vasL = 60;
/** The driver in its box alone: no way filter. */
const bare = (s: SpeakerSystem) => unfiltered(woofer(s));
const vented = (qt: number, alpha: number, h: number, ql: number | null = null) =>
  system(
    doc(
      { fs_hz: fs, qes: qesFor(qt, qms), qms, vas_l: vasL, sd_cm2: 300 },
      { type: 'vented', vb_l: vasL / alpha, fb_hz: h * fs, ql, ports: [{ diameter_cm: 8 }] },
      { crossover: { type: 'none' } },
    ),
  );

/** |G| of Small's normalised 4th-order high-pass with leakage QL. */
function smallVentedMagnitude(f: number, qt: number, alpha: number, h: number, ql: number): number {
  const sh = Math.sqrt(h);
  const a1 = (ql + h * qt) / (sh * ql * qt);
  const a2 = (h + (alpha + 1 + h * h) * ql * qt) / (h * ql * qt);
  const a3 = (h * ql + qt) / (sh * ql * qt);
  const w = f / (sh * fs);
  const re = w ** 4 - a2 * w * w + 1;
  const im = -a1 * w ** 3 + a3 * w;
  return w ** 4 / Math.hypot(re, im);
}

describe('vented box (Thiele 1971, Small 1973)', () => {
  it('B4 (Qt 0.383, alpha 1.414, fb = fs) has f3 = fs and is 3.01 dB down there', () => {
    const s = vented(0.38268, Math.SQRT2, 1);
    expect(rolloffHz(s, bare(s), HALF_POWER_DB) / fs).toBeCloseTo(1, 3);
    const rel = splDb(abs(respond(s, bare(s), fs, 1).pressure)) - splDb(passbandPressure(s, bare(s), 1));
    expect(rel).toBeCloseTo(-3.01, 2);
  });

  it.each([
    // Thiele's table (QL infinite): type, Qt, alpha, h, f3/fs
    ['QB3', 0.18, 10.48, 2.0, 2.68],
    ['QB3', 0.209, 7.48, 1.73, 2.28],
    ['QB3', 0.259, 4.46, 1.42, 1.77],
    ['QB3', 0.303, 2.95, 1.23, 1.45],
    ['B4', 0.383, 1.414, 1.0, 1.0],
    ['C4', 0.415, 1.055, 0.927, 0.867],
  ])('%s Qt %f alpha %f h %f has f3/fs %f, and the alignment solver finds alpha and h', (name, qt, alpha, h, ratio) => {
    // The table's 3-digit rounding leaves about 1% in f3.
    const s = vented(qt, alpha, h);
    const f3 = rolloffHz(s, bare(s), HALF_POWER_DB);
    expect(f3 / fs).toBeCloseTo(ratio, 1);
    expect(Math.abs(f3 / fs / ratio - 1)).toBeLessThan(0.012);
    const solved = ventedAlignment(qt)!;
    expect(solved.name).toBe(name);
    expect(Math.abs(solved.alpha / alpha - 1)).toBeLessThan(0.012);
    expect(Math.abs(solved.h / h - 1)).toBeLessThan(0.006);
  });

  it("follows Small's 4th-order response with leakage QL 7", () => {
    const [qt, alpha, h, ql] = [0.4, 1.2, 1.1, 7];
    const s = vented(qt, alpha, h, ql);
    const ref = passbandPressure(s, bare(s), 1);
    for (const f of [15, 22, 30, 40, 60, 120]) {
      const ours = abs(respond(s, bare(s), f, 1).pressure) / ref;
      expect(20 * Math.log10(ours)).toBeCloseTo(20 * Math.log10(smallVentedMagnitude(f, qt, alpha, h, ql)), 2);
    }
  });

  it('has |Z| = Re at fb in a lossless box with Le = 0', () => {
    const s = vented(0.38268, Math.SQRT2, 1);
    expect(abs(respond(s, bare(s), fs, 1).impedance)).toBeCloseTo(6, 6);
  });

  it('the port carries the output below fb: cone and port are in antiphase far below tuning', () => {
    const s = vented(0.38268, Math.SQRT2, 1);
    const r = respond(s, bare(s), 8, 1);
    expect(abs(r.outletFlow) / (abs(r.coneVelocity) * bare(s).driver.sd)).toBeGreaterThan(0.85);
    expect(abs(r.pressure)).toBeLessThan(0.2 * abs(r.conePressure));
  });

  it('reports port air speed as volume velocity over port area', () => {
    const s = vented(0.38268, Math.SQRT2, 1);
    const a = analyze(s);
    const k = a.curves.freqHz.findIndex((f) => f >= 30);
    const r = respond(s, bare(s), a.curves.freqHz[k], a.driveV);
    const box = woofer(s).box;
    if (box.type !== 'vented') throw new Error('box type');
    expect(a.curves.portAirSpeed![k]).toBeCloseTo((Math.SQRT2 * abs(r.outletFlow)) / box.sv, 9);
  });
});
