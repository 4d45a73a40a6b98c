// Level logic of the listening bench (src/audio/levels.ts).
// Decibels of a field quantity are 20·log10 of the amplitude ratio (ISO 80000-3:2006, IEC 60027-3):
// a factor of 2 in pressure is 6.0206 dB, a factor of sqrt(2) is 3.0103 dB.
import { describe, expect, it } from 'vitest';
import {
  commonPaPerFs,
  dbToGain,
  gainToDb,
  laneGains,
  MONITOR_CONFIRM_ABOVE_DB,
  MONITOR_START_DB,
  passbandDifferenceDb,
  passbandPa,
  requestMonitorGain,
  restoredMonitorGain,
} from '../src/audio/levels.ts';

describe('decibels', () => {
  it('follow the field-quantity definition (ISO 80000-3)', () => {
    expect(gainToDb(2)).toBeCloseTo(6.0206, 4);
    expect(gainToDb(Math.SQRT2)).toBeCloseTo(3.0103, 4);
    expect(dbToGain(-20)).toBeCloseTo(0.1, 12);
    expect(dbToGain(-24)).toBeCloseTo(0.0630957, 6);
  });
});

describe('match levels', () => {
  // A design 3 dB less sensitive (Pa/V down by sqrt 2) at the same volts: B is 3.01 dB quieter.
  const a = { passbandPaPerV: 0.2, voltsFs: 20 };
  const b = { passbandPaPerV: 0.2 / Math.SQRT2, voltsFs: 20 };

  it('passband pressure is Pa/V times the planned volts', () => {
    expect(passbandPa(a)).toBeCloseTo(4, 12);
    expect(passbandDifferenceDb(a, b)).toBeCloseTo(3.0103, 4);
  });

  it('with match on, brings the louder design down to the quieter one: equal passband, nothing raised', () => {
    const g = laneGains(a, b, true);
    expect(gainToDb(g.gains.a)).toBeCloseTo(-3.0103, 4);
    expect(g.gains.b).toBe(1);
    expect(g.gains.a * passbandPa(a)).toBeCloseTo(g.gains.b * passbandPa(b), 12);
    expect(g.referencePa).toBeCloseTo(passbandPa(b), 12);
    // A less sensitive design given more volts for the same planned SPL: both end up equal anyway.
    const bLoud = { passbandPaPerV: b.passbandPaPerV, voltsFs: 20 * Math.SQRT2 * 1.05 };
    const g2 = laneGains(a, bLoud, true);
    expect(g2.gains.a).toBe(1);
    expect(gainToDb(g2.gains.b)).toBeCloseTo(-gainToDb(1.05), 6);
  });

  it('with match off, plays each design as planned and the reference at A', () => {
    const g = laneGains(a, b, false);
    expect(g.gains).toEqual({ a: 1, b: 1, ref: 1 });
    expect(g.referencePa).toBeCloseTo(4, 12);
  });

  it('one calibration for both: the louder passband at -6.02 dBFS', () => {
    expect(gainToDb(passbandPa(a) / commonPaPerFs(a, b))).toBeCloseTo(-6.0206, 4);
    expect(commonPaPerFs(a, b)).toBe(commonPaPerFs(b, a));
  });

  it('refuses levels that are not positive numbers, naming the value', () => {
    expect(() => passbandPa({ passbandPaPerV: 0, voltsFs: 1 })).toThrow('passbandPaPerV must be a positive number, got 0');
    expect(() => passbandPa({ passbandPaPerV: 1, voltsFs: Number.NaN })).toThrow('voltsFs must be a positive number, got NaN');
  });
});

describe('monitor gain and the hearing caution (common practice, no source)', () => {
  it('starts low, below the caution threshold', () => {
    expect(MONITOR_START_DB).toBe(-24);
    expect(MONITOR_START_DB).toBeLessThan(MONITOR_CONFIRM_ABOVE_DB);
  });

  it('holds at the threshold until the user confirms, then allows up to 0 dB', () => {
    expect(requestMonitorGain(-18, false)).toEqual({ gainDb: -18, needsConfirmation: false, requestedDb: -18 });
    expect(requestMonitorGain(-12, false)).toEqual({ gainDb: -12, needsConfirmation: false, requestedDb: -12 });
    expect(requestMonitorGain(-6, false)).toEqual({ gainDb: -12, needsConfirmation: true, requestedDb: -6 });
    expect(requestMonitorGain(-6, true)).toEqual({ gainDb: -6, needsConfirmation: false, requestedDb: -6 });
    expect(requestMonitorGain(9, true).gainDb).toBe(0);
    expect(requestMonitorGain(-200, false).gainDb).toBe(-60);
    expect(() => requestMonitorGain(Number.NaN, true)).toThrow('monitor gain must be a number of dB, got NaN');
  });

  it('a restored gain never comes back loud', () => {
    expect(restoredMonitorGain(-3)).toBe(MONITOR_CONFIRM_ABOVE_DB);
    expect(restoredMonitorGain(-30)).toBe(-30);
    expect(restoredMonitorGain(undefined)).toBe(MONITOR_START_DB);
  });
});

describe('passband level as SPL', () => {
  it('a 1 Pa rms sine is 93.98 dB SPL (ISO 1683 reference 20 µPa)', async () => {
    const { fullScaleSineSplDb } = await import('../src/audio/levels.ts');
    expect(fullScaleSineSplDb(Math.SQRT2)).toBeCloseTo(93.9794, 4);
  });
});
