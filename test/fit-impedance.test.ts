// Driver parameters from impedance, checked on synthetic sweeps (helpers/impedance-sweep.ts).
import { describe, expect, it } from 'vitest';
import { fitImpedance } from '../src/engine/fit/impedance-fit.ts';
import { parseImpedanceTable } from '../src/engine/fit/impedance-table.ts';
import { addedMassMms, closedBoxVas, mechanicalSet } from '../src/engine/fit/mechanical.ts';
import { withFittedFields } from '../src/engine/fit/driver-fields.ts';
import { air, D, rhoC2, sweep, truth } from './helpers/impedance-sweep.ts';

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('impedance fit', () => {
  it('recovers Re, fs, Qes, Qms within 1% from a noisy sweep with phase (0.5% noise, three seeds)', () => {
    for (const seed of [1, 2, 3]) {
      const fit = fitImpedance(sweep({ seed }));
      expect(fit.coil).toBe('semi');
      expect(rel(fit.params.re, D.re)).toBeLessThan(0.01);
      expect(rel(fit.params.fs, truth.fs)).toBeLessThan(0.01);
      expect(rel(fit.params.qes, truth.qes)).toBeLessThan(0.01);
      expect(rel(fit.params.qms, truth.qms)).toBeLessThan(0.01);
      expect(rel(fit.params.le, D.le)).toBeLessThan(0.1);
      expect(rel(fit.params.l2, D.l2)).toBeLessThan(0.1);
      // The residual is the noise: 0.5% per component.
      expect(fit.residualRmsPct).toBeGreaterThan(0.35);
      expect(fit.residualRmsPct).toBeLessThan(0.65);
      // The reported errors are of the size of the actual errors (within a factor of 4 or so).
      expect(Math.abs(fit.params.fs - truth.fs)).toBeLessThan(4 * fit.sigma.fs);
      expect(fit.sigma.qms / fit.params.qms).toBeLessThan(0.01);
    }
  });

  it('recovers Re, fs, Qes, Qms within 1% from magnitude alone', () => {
    const fit = fitImpedance(sweep({ phase: false, seed: 11 }));
    expect(fit.usedPhase).toBe(false);
    expect(rel(fit.params.re, D.re)).toBeLessThan(0.01);
    expect(rel(fit.params.fs, truth.fs)).toBeLessThan(0.01);
    expect(rel(fit.params.qes, truth.qes)).toBeLessThan(0.01);
    expect(rel(fit.params.qms, truth.qms)).toBeLessThan(0.01);
  });

  it('keeps Le alone for a coil without semi-inductance when asked, and its fit is worse', () => {
    const semi = fitImpedance(sweep(), 'auto');
    const le = fitImpedance(sweep(), 'le');
    expect(le.coil).toBe('le');
    expect(le.params.l2).toBe(0);
    expect(le.residualRmsPct).toBeGreaterThan(2 * semi.residualRmsPct);
  });

  it('refuses a curve with no resonance in it', () => {
    const t = sweep();
    const top = { freq: t.freq.slice(150), magnitude: t.magnitude.slice(150), phaseDeg: null };
    expect(() => fitImpedance(top)).toThrow(/no resonance/);
  });
});

describe('Vas by the published closed forms', () => {
  it('added mass: Mms = M/((fs/fm)^2 - 1) gives the true Mms for exact resonances', () => {
    const m = 0.02;
    const fm = 1 / (2 * Math.PI * Math.sqrt((D.mms + m) * D.cms));
    expect(rel(addedMassMms(truth.fs, fm, m), D.mms)).toBeLessThan(1e-12);
  });

  it('closed box: Vas = Vb·(fc·Qec/(fs·Qes) - 1) gives the true Vas for exact resonances', () => {
    const vb = 0.01;
    const cab = vb / (rhoC2 * D.sd ** 2);
    const ct = (D.cms * cab) / (D.cms + cab);
    const wc = 1 / Math.sqrt(D.mms * ct);
    const qec = (wc * D.mms * D.re) / D.bl ** 2;
    expect(rel(closedBoxVas(vb, truth.fs, truth.qes, wc / (2 * Math.PI), qec), truth.vas)).toBeLessThan(1e-12);
  });

  it('added-mass sweep: Vas within 3%, Bl and Mms close', () => {
    const free = fitImpedance(sweep({ seed: 21 }));
    const loaded = fitImpedance(sweep({ seed: 22, mms: D.mms + 0.02 }));
    const r = mechanicalSet(free, { kind: 'added-mass', massKg: 0.02, fit: loaded }, D.sd, null, air);
    expect(rel(r.vas as number, truth.vas)).toBeLessThan(0.03);
    expect(rel(r.mms as number, D.mms)).toBeLessThan(0.03);
    expect(rel(r.set?.bl as number, D.bl)).toBeLessThan(0.02);
    expect(r.vasSigma as number).toBeGreaterThan(0);
    expect(r.vasSigma as number).toBeLessThan(0.03 * truth.vas);
  });

  it('closed-box sweep: Vas within 3%', () => {
    const vb = 0.012;
    const cab = vb / (rhoC2 * D.sd ** 2);
    const free = fitImpedance(sweep({ seed: 31 }));
    const boxed = fitImpedance(sweep({ seed: 32, cms: (D.cms * cab) / (D.cms + cab) }));
    const r = mechanicalSet(free, { kind: 'closed-box', vbM3: vb, fit: boxed }, D.sd, null, air);
    expect(rel(r.vas as number, truth.vas)).toBeLessThan(0.03);
    expect(rel(r.set?.cms as number, D.cms)).toBeLessThan(0.03);
  });

  it('refuses an added-mass sweep whose resonance did not fall', () => {
    const free = fitImpedance(sweep({ seed: 41 }));
    expect(() => mechanicalSet(free, { kind: 'added-mass', massKg: 0.02, fit: free }, D.sd, null, air)).toThrow(/clearly below/);
  });
});

describe('impedance table reader', () => {
  const rows = (sep: string, comma = false) =>
    sweep({ noise: 0 })
      .freq.map((f, i, all) => {
        const t = sweep({ noise: 0 });
        const cells = [f, t.magnitude[i], t.phaseDeg?.[i] ?? 0].map((x) => x.toFixed(4));
        return (comma ? cells.map((c) => c.replace('.', ',')) : cells).join(sep) + (i === all.length - 1 ? '' : '');
      })
      .join('\n');

  it('reads white space, commas, semicolons with decimal commas, and comment lines', () => {
    for (const text of [
      `# measured on the bench\n* jig 2\nFreq Ohm Deg\n${rows(' ')}`,
      `Frequency (Hz), Impedance (Ohm), Phase (deg)\n${rows(', ')}`,
      `; export\n${rows(';', true)}`,
      rows('\t', true),
      rows(' ', true),
    ]) {
      const r = parseImpedanceTable(text);
      expect(r.ok).toBe(true);
      if (!r.ok) continue;
      expect(r.table.freq.length).toBe(265);
      expect(r.table.freq[0]).toBeCloseTo(10, 6);
      expect(r.table.magnitude[0]).toBeGreaterThan(D.re);
      expect(r.table.phaseDeg).not.toBeNull();
    }
  });

  it('finds the columns in another order, from the header or from the numbers', () => {
    const t = sweep({ noise: 0 });
    const body = t.freq.map((f, i) => `${t.phaseDeg?.[i].toFixed(3)} ${f.toFixed(3)} ${t.magnitude[i].toFixed(4)}`).join('\n');
    for (const text of [`Phase Freq Impedance\n${body}`, body]) {
      const r = parseImpedanceTable(text);
      if (!r.ok) throw new Error(r.message);
      expect(r.table.freq[10]).toBeCloseTo(t.freq[10], 3);
      expect(r.table.magnitude[10]).toBeCloseTo(t.magnitude[10], 3);
      expect(r.table.phaseDeg?.[10]).toBeCloseTo(t.phaseDeg?.[10] as number, 2);
    }
  });

  it('names the line of a bad table', () => {
    const good = rows(' ').split('\n');
    const cases: [string, number, RegExp][] = [
      [['Hz Ohm', ...good.slice(0, 5), '20 x 3', ...good.slice(5)].join('\n'), 7, /not a number/],
      [['Hz Ohm Deg', ...good.slice(0, 5), '1 2', ...good.slice(5)].join('\n'), 7, /2 columns/],
      [[...good.slice(0, 30), good[2]].join('\n'), 31, /does not rise/],
      [good.slice(0, 5).join('\n'), 5, /at least 20/],
      ['# nothing\n', 2, /no rows/],
    ];
    for (const [text, line, message] of cases) {
      const r = parseImpedanceTable(text);
      expect(r.ok).toBe(false);
      if (r.ok) continue;
      expect(r.line).toBe(line);
      expect(r.message).toMatch(message);
    }
  });
});

describe('fitted fields in a driver', () => {
  const base = { re_ohm: 6, sd_cm2: 130, xmax_mm: 5, pe_w: 60, fs_hz: 40, qes: 0.5, qms: 4, bl_tm: 7, mms_g: 20, l2_mh: 1, r2_ohm: 5 };
  it('replaces the small-signal fields, keeps one mechanical figure and drops what would contradict it', () => {
    const next = withFittedFields(base, { re_ohm: 5.8, fs_hz: 42.1, qes: 0.65, qms: 5.3, le_mh: 0.35 });
    expect(next).toEqual({ re_ohm: 5.8, sd_cm2: 130, xmax_mm: 5, pe_w: 60, fs_hz: 42.1, qes: 0.65, qms: 5.3, mms_g: 20, le_mh: 0.35 });
    const withVas = withFittedFields(base, {
      re_ohm: 5.8,
      fs_hz: 42.1,
      qes: 0.65,
      qms: 5.3,
      le_mh: 0.35,
      l2_mh: 0.9,
      r2_ohm: 6.5,
      vas_l: 16.3,
    });
    expect(withVas.vas_l).toBe(16.3);
    expect(withVas.mms_g).toBeUndefined();
    expect(withVas.bl_tm).toBeUndefined();
    expect(withVas.l2_mh).toBe(0.9);
  });
});
