// Hand-built SI systems for the renderer's tests (an invented 6.5-inch woofer, our own numbers).
// Derived values use the standard relations: Cms = Vas/(rho c^2 Sd^2), Mms = 1/((2 pi fs)^2 Cms),
// Bl = sqrt(2 pi fs Mms Re / Qes), Rms = 2 pi fs Mms / Qms (Small, JAES 1972).
import type { SpeakerSystem, Box, DriverWay, Way } from '../src/engine/system.ts';
import { estimateThermal, ALPHA_R, drivenPaPerV } from '../src/engine/design/convert.ts';

export const AIR = { c: 343.2, rho: 1.2041, temperatureC: 20, pressurePa: 101325 };

export interface DriverSpec {
  fs?: number;
  qes?: number;
  qms?: number;
  vasL?: number;
  re?: number;
  leMh?: number;
  sdCm2?: number;
  xmaxMm?: number;
  xlimMm?: number;
  pe?: number;
}

export function driver(spec: DriverSpec = {}) {
  const fs = spec.fs ?? 40,
    qes = spec.qes ?? 0.42,
    qms = spec.qms ?? 3.2,
    vas = (spec.vasL ?? 22) / 1000;
  const re = spec.re ?? 5.8,
    le = (spec.leMh ?? 0.6) / 1000,
    sd = (spec.sdCm2 ?? 132) / 1e4;
  const cms = vas / (AIR.rho * AIR.c * AIR.c * sd * sd);
  const mms = 1 / ((2 * Math.PI * fs) ** 2 * cms);
  const bl = Math.sqrt((2 * Math.PI * fs * mms * re) / qes);
  const rms = (2 * Math.PI * fs * mms) / qms;
  const pe = spec.pe ?? 60;
  return {
    fs,
    qes,
    qms,
    qts: (qes * qms) / (qes + qms),
    vas,
    re,
    le,
    l2: 0,
    r2: 0,
    sd,
    bl,
    mms,
    cms,
    rms,
    xmax: (spec.xmaxMm ?? 5) / 1000,
    xlim: (spec.xlimMm ?? 10) / 1000,
    pe,
    blRelPerMm: [] as number[],
    kmsRelPerMm: [] as number[],
    leRelPerMm: [] as number[],
    nonlinearFitted: true,
    thermal: { ...estimateThermal(pe, 150, 20), alphaR: ALPHA_R.copper, material: 'copper' as const, coilMaxC: 150 },
  };
}

export function sealedBox(vbL = 14, ql: number | null = null): Box {
  const vb = vbL / 1000;
  return { type: 'sealed', vb, vbNet: vb, ral: Infinity, ql };
}

export function ventedBox(vbL = 28, fb = 38, ql: number | null = 7, portDiamCm = 7): Box {
  const vb = vbL / 1000;
  const r = portDiamCm / 200;
  const sv = Math.PI * r * r;
  const cab = vb / (AIR.rho * AIR.c * AIR.c);
  const wb = 2 * Math.PI * fb;
  const map = 1 / (wb * wb * cab);
  const leff = (map * sv) / AIR.rho;
  // Small 1973: QL = wb·Cab·Ral for the leakage loss.
  const ral = ql === null ? Infinity : ql / (wb * cab);
  return {
    type: 'vented',
    vb,
    vbNet: vb,
    ral,
    ql,
    fb,
    sv,
    portCount: 1,
    portArea: sv,
    portRadius: r,
    portLength: leff - 1.4616 * r,
    portLeff: leff,
    map,
    portLossK: 1,
  };
}

export function radiatorBox(vbL = 28, spCm2 = 200, mmpG = 120, cmpMmPerN = 0.6, qmp = 8, xmaxMm = 12): Box {
  const vb = vbL / 1000;
  const sp = spCm2 / 1e4,
    mmp = mmpG / 1000,
    kmp = 1000 / cmpMmPerN;
  const wp = Math.sqrt(kmp / mmp);
  const rmp = (wp * mmp) / qmp;
  const cab = vb / (AIR.rho * AIR.c * AIR.c);
  return {
    type: 'passive-radiator',
    vb,
    vbNet: vb,
    ral: Infinity,
    ql: null,
    sp,
    count: 1,
    mmp,
    kmp,
    rmp,
    qmp,
    xmax: xmaxMm / 1000,
    fp: wp / (2 * Math.PI),
    fb: Math.sqrt((kmp + (sp * sp) / cab) / mmp) / (2 * Math.PI),
  };
}

export function system(
  box: Box,
  opts: {
    d?: DriverSpec;
    fx?: number;
    xo?: 'lr2' | 'lr4' | 'lr8' | 'none';
    powerW?: number;
    rs?: number;
    clip?: 'hard' | 'soft';
    channels?: 'pair' | 'mono-sum';
  } = {},
): SpeakerSystem {
  const power = opts.powerW ?? 100,
    load = 8;
  const rs = opts.rs ?? 0.05;
  const type = opts.xo ?? 'lr4';
  const fx = opts.fx ?? 2000;
  const split = type !== 'none';
  const listening = {
    distance: 2,
    space: 'half' as const,
    omega: 2 * Math.PI,
    channels: opts.channels ?? 'pair',
    level: { mode: 'volts' as const, voltsFs: 10 },
    roomGainHz: 0,
  };
  const d = driver(opts.d);
  const none = { type: 'active' as const, highpass: null, lowpass: null, gain: 1, delay: 0 };
  const ways: Way[] = [
    {
      kind: 'driver',
      name: 'woofer',
      driver: d,
      unit: d,
      count: 1,
      wiring: 'parallel',
      box,
      filter: split ? { ...none, lowpass: { shape: type, hz: fx } } : none,
      polarity: 1,
      offset: 0,
    },
  ];
  if (split) {
    ways.push({
      kind: 'flat',
      name: 'upper band',
      filter: { ...none, highpass: { shape: type, hz: fx } },
      polarity: type === 'lr2' ? -1 : 1,
      offset: 0,
      paPerV: drivenPaPerV(d, rs, AIR, listening),
    });
  }
  return {
    name: 'test',
    air: AIR,
    ways,
    amplifier: { power, load, rs, vPeak: Math.sqrt(2 * power * load), clip: opts.clip ?? 'hard' },
    listening,
  };
}

/** The first (driver) way of a fixture system. */
export const wooferOf = (sys: SpeakerSystem): DriverWay => sys.ways[0] as DriverWay;
