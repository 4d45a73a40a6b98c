// Amplifier: the rail from rated power into the nominal load, V = sqrt(2·P·Z) (REFERENCES.md:
// 100 W / 8 ohm -> 40.0 V, 50 W / 4 ohm -> 20.0 V, 200 W / 8 ohm -> 56.57 V), hard and soft clipping.
import { describe, expect, it } from 'vitest';
import { clipVolts, OversampledClipper, railVolts } from '../src/engine/render/amplifier.ts';
import { RENDER_HALFBAND } from '../src/engine/filters/halfband.ts';

/** Amplitude at f with a Hann window (sidelobes fall 18 dB/octave, so the strong tone does not leak). */
function hannAmplitude(x: Float64Array, start: number, len: number, f: number, fs: number): number {
  let c = 0,
    s = 0,
    wsum = 0;
  for (let k = 0; k < len; k++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * k) / len);
    c += w * x[start + k] * Math.cos((2 * Math.PI * f * k) / fs);
    s += w * x[start + k] * Math.sin((2 * Math.PI * f * k) / fs);
    wsum += w;
  }
  return (2 * Math.hypot(c, s)) / wsum;
}

describe('amplifier rails', () => {
  it('sqrt(2PZ)', () => {
    expect(railVolts(100, 8)).toBeCloseTo(40.0, 2);
    expect(railVolts(50, 4)).toBeCloseTo(20.0, 2);
    expect(railVolts(200, 8)).toBeCloseTo(56.57, 2);
  });
  it('hard clipping holds the rail; soft clipping is linear below 80% and never passes the rail', () => {
    expect(clipVolts(55, 40, false)).toBe(40);
    expect(clipVolts(-55, 40, false)).toBe(-40);
    expect(clipVolts(12, 40, true)).toBe(12);
    for (const u of [33, 40, 60, 1e4]) {
      expect(clipVolts(u, 40, true)).toBeLessThanOrEqual(40);
      expect(clipVolts(-u, 40, true)).toBeGreaterThanOrEqual(-40);
    }
  });
  it('the oversampled clipping stage is a pure delay below the rail and keeps aliases 60 dB down when it clips hard', () => {
    const fs = 44100,
      n = 1 << 15;
    const f = (fs * 441) / n; // a bin-centred tone near 594 Hz
    const u = new Float64Array(n),
      c = new Float64Array(n),
      d = new Float64Array(n);
    for (let k = 0; k < n; k++) u[k] = 3 * Math.sin((2 * Math.PI * f * k) / fs);
    const stage = new OversampledClipper(RENDER_HALFBAND);
    stage.process(u, n, 100, false, c, d);
    for (let k = 200; k < n; k++) expect(Math.abs(c[k] - u[k - stage.delay])).toBeLessThan(1e-12);
    // Driven 10 dB into a hard clip: energy off the tone's harmonics (aliases) vs the fundamental.
    for (let k = 0; k < n; k++) u[k] = 120 * Math.sin((2 * Math.PI * f * k) / fs);
    stage.process(u, n, 38, false, c, d);
    const start = 4096,
      len = n - 4096 - 4096;
    const fund = hannAmplitude(c, start, len, f, fs);
    let worst = 0;
    for (let probe = 100; probe < 0.4 * fs; probe += 37.3) {
      const h = probe / f;
      if (Math.abs(h - Math.round(h)) * f < 60) continue; // skip the harmonics themselves
      worst = Math.max(worst, hannAmplitude(c, start, len, probe, fs));
    }
    expect(20 * Math.log10(worst / fund)).toBeLessThan(-60);
  });
});
