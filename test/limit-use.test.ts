// What the amplifier delivers and the coils take at the planned level, and each limit's share.
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { analyze, parseDesign } from '../src/engine/index.ts';
import { amplifierPowerW, coilHeatW, limitUse } from '../src/engine/response/limit-use.ts';
import type { DriverWay, SpeakerSystem } from '../src/engine/system.ts';
import { respond } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';

function load(file: string): SpeakerSystem {
  const r = parseDesign(JSON.parse(readFileSync(`public/examples/${file}`, 'utf8')));
  if (!r.ok) throw new Error('example invalid');
  return r.system;
}

describe('amplifier power and coil heat', () => {
  it('an active woofer: at the impedance peak (phase near 0) the heat is the power times Re/|Z|', () => {
    const sys = load('living-room-sealed.json');
    const way = sys.ways[0] as DriverWay;
    const an = analyze(sys, {});
    const c = an.curves;
    const v = 4;
    const p = amplifierPowerW(way, c, v);
    const heat = coilHeatW(sys, way, c, v);
    let k = 0;
    for (let i = 0; i < c.freqHz.length; i++) if (c.freqHz[i] < 500 && c.impedanceOhm[i] > c.impedanceOhm[k]) k = i;
    // A series circuit (common practice, no source): the current is U/|Z + rs| with U = v·|H|, H the
    // example's 2.2 kHz LR4 low-pass, |H| = 1/(1 + (f/fc)^4) (a squared Butterworth-2, common practice),
    // the heat |I|²·Re; the power into Z is U²·cos(phase)/|Z|. Checked at the peak and at 1 kHz.
    expect(Math.abs(c.phaseDeg[k])).toBeLessThan(5);
    const rs = sys.amplifier.rs;
    const j1k = c.freqHz.findIndex((f) => f >= 1000);
    for (const i of [k, j1k]) {
      const ph = (c.phaseDeg[i] * Math.PI) / 180;
      const u = v / (1 + (c.freqHz[i] / 2200) ** 4);
      const zr = c.impedanceOhm[i] * Math.cos(ph) + rs;
      const zi = c.impedanceOhm[i] * Math.sin(ph);
      expect(heat[i] / ((u * u * way.driver.re) / (zr * zr + zi * zi))).toBeCloseTo(1, 7);
      expect(p[i] / ((u * u * Math.cos(ph)) / c.impedanceOhm[i])).toBeCloseTo(1, 9);
    }
    // The small-signal circuit's own coil current (respond) gives the same heat everywhere.
    for (let i = 0; i < c.freqHz.length; i += 17) {
      const cur = abs(respond(sys, way, c.freqHz[i], v, false).current);
      expect(heat[i] / (cur * cur * way.driver.re)).toBeCloseTo(1, 6);
    }
    // Everywhere: heat never exceeds the power delivered (the rest moves the cone), both positive.
    for (let i = 0; i < c.freqHz.length; i++) {
      expect(heat[i]).toBeGreaterThan(0);
      expect(heat[i]).toBeLessThanOrEqual(p[i] * (1 + 1e-6) + 1e-12);
    }
  });

  it('a passive two-way: the network between amplifier and coil takes its share too', () => {
    const sys = load('bookshelf-two-way-passive.json');
    const an = analyze(sys, {});
    for (const w of an.ways) {
      const way = w.way as DriverWay;
      const p = amplifierPowerW(way, w.curves, 2.83);
      const heat = coilHeatW(sys, way, w.curves, 2.83);
      for (let i = 0; i < p.length; i++) expect(heat[i]).toBeLessThanOrEqual(p[i] * (1 + 1e-6) + 1e-12);
      // Through the network: the same heat as the circuit's coil current.
      for (let i = 0; i < p.length; i += 23) {
        const cur = abs(respond(sys, way, w.curves.freqHz[i], 2.83, false).current);
        expect(heat[i] / (cur * cur * way.driver.re)).toBeCloseTo(1, 4);
      }
    }
  });
});

describe('share of each limit', () => {
  it('excursion over Xmax matches the planned peak figure; the port share uses 17 m/s; heat over Pe', () => {
    const sys = load('living-room-vented.json');
    const way = sys.ways[0] as DriverWay;
    const an = analyze(sys, {});
    const use = limitUse(sys, way, an.curves, an.figures.plannedVoltsRms);
    const xmaxMm = way.unit.xmax * 1000;
    let top = 0;
    for (let i = 0; i < use.excursionPct.length; i++) if (an.curves.freqHz[i] >= 20) top = Math.max(top, use.excursionPct[i]);
    expect(top).toBeCloseTo((100 * an.figures.plannedPeakExcursionMm) / xmaxMm, 6);
    expect(use.portPct).not.toBeNull();
    const i40 = an.curves.freqHz.findIndex((f) => f >= 40);
    expect(use.portPct![i40]).toBeCloseTo((100 * an.curves.plannedPortAirSpeed![i40]) / 17, 9);
    const heat = coilHeatW(sys, way, an.curves, an.figures.plannedVoltsRms);
    expect(use.heatPct![i40]).toBeCloseTo((100 * heat[i40]) / way.driver.pe, 9);
  });
});
