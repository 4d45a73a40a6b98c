// Driver parameters from impedance: sweeps synthesised here from a driver's mechanical elements
// (Bl, Mms, Cms, Rms, the coil), written out independently of the fit's own model, with noise.
import { describe, expect, it } from 'vitest';
import { airAt } from '../src/engine/air.ts';
import { fitImpedance } from '../src/engine/fit/impedance-fit.ts';
import { parseImpedanceTable, type ImpedanceTable } from '../src/engine/fit/impedance-table.ts';
import { addedMassMms, closedBoxVas, mechanicalSet } from '../src/engine/fit/mechanical.ts';

const air = airAt();
const rhoC2 = air.rho * air.c * air.c;

/** An invented 6.5-inch woofer. */
const D = { re: 5.8, le: 0.35e-3, l2: 0.9e-3, r2: 6.5, bl: 7.2, mms: 0.022, cms: 0.65e-3, rms: 1.1, sd: 0.0133 };
const ws = 1 / Math.sqrt(D.mms * D.cms);
const truth = {
  fs: ws / (2 * Math.PI),
  qes: (ws * D.mms * D.re) / D.bl ** 2,
  qms: (ws * D.mms) / D.rms,
  vas: rhoC2 * D.sd ** 2 * D.cms,
};

/** Seeded uniform numbers (mulberry32) and Box–Muller normals, so the noise is the same every run. */
function normals(seed: number): () => number {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(uniform() + 1e-300)) * Math.cos(2 * Math.PI * uniform());
}

/**
 * A sweep from 10 Hz to 20 kHz, 24 points an octave: Z = Re + jwLe + (jwL2 || R2) + Bl^2/Zm, with
 * Zm = Rms + jwM + 1/(jwC). Noise: each point multiplied by (1 + n1 + j·n2), n1, n2 normal with a
 * standard deviation of `noise` (0.5% by default: a careful bench measurement).
 */
function sweep(opts: { mms?: number; cms?: number; noise?: number; seed?: number; phase?: boolean } = {}): ImpedanceTable {
  const { mms = D.mms, cms = D.cms, noise = 0.005, seed = 7, phase = true } = opts;
  const n = normals(seed);
  const freq: number[] = [];
  const magnitude: number[] = [];
  const phaseDeg: number[] = [];
  for (let k = 0; k <= 11 * 24; k++) {
    const f = 10 * 2 ** (k / 24);
    const w = 2 * Math.PI * f;
    // L2 || R2: jwL2·R2/(R2 + jwL2)
    const den = D.r2 ** 2 + (w * D.l2) ** 2;
    const semiRe = (D.r2 * (w * D.l2) ** 2) / den;
    const semiIm = (w * D.l2 * D.r2 ** 2) / den;
    const xm = w * mms - 1 / (w * cms);
    const zmDen = D.rms ** 2 + xm ** 2;
    const motRe = (D.bl ** 2 * D.rms) / zmDen;
    const motIm = -(D.bl ** 2 * xm) / zmDen;
    let re = D.re + semiRe + motRe;
    let im = w * D.le + semiIm + motIm;
    const n1 = noise * n();
    const n2 = noise * n();
    [re, im] = [re * (1 + n1) - im * n2, im * (1 + n1) + re * n2];
    freq.push(f);
    magnitude.push(Math.hypot(re, im));
    phaseDeg.push((Math.atan2(im, re) * 180) / Math.PI);
  }
  return { freq, magnitude, phaseDeg: phase ? phaseDeg : null };
}

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
