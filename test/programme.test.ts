// The programme stand-in (level/programme.ts) against an independent time-domain measurement: a
// sum of random-phase tones with the stand-in's spectrum (pink, 24 tones per octave, Butterworth
// band edges), played through the renderer's own calibration path (the linear chain and the
// IEC 61672 C-weighting filter, level/calibration.ts), must give the same Leq,C at the seat as the
// closed-form integral. The Gaussian tail: P(|x| > 3.89σ) = 1.0e-4 (normal distribution table).
import { describe, expect, it } from 'vitest';
import {
  amplifierShortfalls,
  PROGRAMME_HIGH_PASS_HZ,
  PROGRAMME_LOW_PASS_HZ,
  PROGRAMME_PEAK_FACTOR,
  programmeLeqCPerVolt,
  programmeVoltsRms,
} from '../src/engine/level/programme.ts';
import { seatLeqCPerVolt } from '../src/engine/level/calibration.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { exampleSystem } from './helpers/audio-bench.ts';

const fs = 48000;

/** Random-phase tones with the stand-in's spectrum, 1 V rms, one channel. */
function standIn(seconds: number, seed: number): Float32Array {
  const n = Math.round(seconds * fs);
  const x = new Float64Array(n);
  let s = seed;
  const rand = () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return s / 2147483648;
  };
  const tones: { f: number; a: number }[] = [];
  for (let f = 10; f < 23000; f *= 2 ** (1 / 24)) {
    const h = (f / PROGRAMME_HIGH_PASS_HZ) ** 4,
      l = (f / PROGRAMME_LOW_PASS_HZ) ** 4;
    tones.push({ f: f * (1 + 0.01 * (rand() - 0.5)), a: Math.sqrt((h / (1 + h)) * (1 / (1 + l))) });
  }
  const power = tones.reduce((p, t) => p + (t.a * t.a) / 2, 0);
  for (const t of tones) {
    const w = (2 * Math.PI * t.f) / fs,
      ph = 2 * Math.PI * rand(),
      a = t.a / Math.sqrt(power);
    for (let k = 0; k < n; k++) x[k] += a * Math.sin(w * k + ph);
  }
  return Float32Array.from(x);
}

describe('the programme stand-in', () => {
  it('its closed-form Leq,C at the seat matches a time-domain measurement within 0.3 dB', () => {
    const left = standIn(4, 7),
      right = standIn(4, 99);
    for (const kind of ['sealed', 'vented'] as const) {
      const sys = exampleSystem(kind);
      const measured = seatLeqCPerVolt(sys, [left, right], fs);
      expect(programmeLeqCPerVolt(sys)).toBeCloseTo(measured, 0);
      expect(Math.abs(programmeLeqCPerVolt(sys) - measured)).toBeLessThan(0.3);
    }
  });

  it('its peak factor is the Gaussian one-in-10,000 level', () => {
    const x = standIn(4, 3);
    let over = 0,
      ms = 0;
    for (const v of x) ms += v * v;
    const rms = Math.sqrt(ms / x.length);
    for (const v of x) if (Math.abs(v) > PROGRAMME_PEAK_FACTOR * rms) over++;
    // 192,000 samples: 19 expected; a sum of tones is close to, not exactly, Gaussian.
    expect(over).toBeGreaterThan(4);
    expect(over).toBeLessThan(60);
  });

  it('the amplifier check: an error with the shortfall in dB and volts when the planned level is out of reach', () => {
    const sys = exampleSystem('vented');
    expect(amplifierShortfalls(sys)).toEqual([]);
    expect(analyze(sys).warnings.filter((w) => w.severity === 'error')).toEqual([]);
    const loud = { ...sys, listening: { ...sys.listening, level: { mode: 'spl' as const, splDb: 110 } } };
    const [s] = amplifierShortfalls(loud);
    // Peaks = 3.89 × the woofer channel's rms; the rms follows the level in dB.
    const vrms = programmeVoltsRms(loud);
    expect(vrms / programmeVoltsRms(sys)).toBeCloseTo(10 ** (25 / 20), 6);
    expect(s.railV).toBeCloseTo(40, 1); // 100 W into 8 ohm: sqrt(2·100·8) (REFERENCES, amplifier)
    expect(s.shortDb).toBeCloseTo(20 * Math.log10(s.needV / 40), 6);
    expect(s.needV).toBeGreaterThan(40);
    const errors = analyze(loud).warnings.filter((w) => w.severity === 'error');
    expect(errors).toHaveLength(1);
    expect(errors[0].message).toContain(`${Number(s.shortDb.toPrecision(3))} dB`);
    expect(errors[0].message).toContain('40 V');
  });

  it('is the planned level every figure quotes: the analysis drives its sine figures with its volts', () => {
    const sys = exampleSystem('sealed');
    const a = analyze(sys);
    expect(a.figures.plannedVoltsRms).toBeCloseTo(programmeVoltsRms(sys), 9);
    // The example plans 85 dB(C) at the seat (public/examples/living-room-sealed.json).
    expect(a.figures.plannedSplDb).toBeCloseTo(85, 6);
    expect(a.sum.figures.plannedSplDb).toBeCloseTo(85, 6);
    // The planned excursion curve is the 2.83 V curve scaled to that drive.
    const k = 40;
    expect(a.curves.plannedExcursionMm[k] / a.curves.excursionMm[k]).toBeCloseTo(programmeVoltsRms(sys) / 2.83, 9);
  });
});
