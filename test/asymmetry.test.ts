// Optional even-order asymmetry of the default large-signal shapes (src/engine/sim/nonlinear.ts).
// A symmetric Bl(x) and Kms(x) make only odd harmonics; an offset Bl curve or an asymmetric
// suspension add the second harmonic ("Tutorial: Loudspeaker Nonlinearities — Causes, Parameters,
// Symptoms", JAES 54 (2006): asymmetric nonlinearities generate even-order distortion and a DC
// displacement; from memory). Measured here with a plain DFT of the steady-state output.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../src/engine/design/validate.ts';
import { renderBuffer } from '../src/engine/render/index.ts';
import { effectiveNonlinear } from '../src/engine/sim/nonlinear.ts';
import type { DriverWay } from '../src/engine/system.ts';

const fs = 48000;
const base = JSON.parse(readFileSync('public/examples/living-room-sealed.json', 'utf8'));

function system(extra: Record<string, number>) {
  const r = parseDesign({ ...base, driver: { ...base.driver, ...extra } });
  if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('; '));
  return r.system;
}

function bin(y: Float32Array, start: number, len: number, fr: number): number {
  let c = 0,
    s = 0;
  for (let k = 0; k < len; k++) {
    const w = (2 * Math.PI * fr * k) / fs;
    c += y[start + k] * Math.cos(w);
    s += y[start + k] * Math.sin(w);
  }
  return (2 * Math.hypot(c, s)) / len;
}

/** Second and third harmonics over the fundamental of a 40 Hz tone at 8 V peak. */
function harmonics(extra: Record<string, number>) {
  const n = fs * 2;
  const x = new Float32Array(n);
  for (let k = 0; k < n; k++) x[k] = Math.sin((2 * Math.PI * 40 * k) / fs) * Math.min(1, k / (0.1 * fs));
  const y = renderBuffer(system(extra), [x], fs, { voltsFs: 8 }).audio[0];
  const h1 = bin(y, n - fs, fs, 40);
  return { h2: bin(y, n - fs, fs, 80) / h1, h3: bin(y, n - fs, fs, 120) / h1 };
}

describe('even-order asymmetry of the default shapes', () => {
  it('zero asymmetry leaves the default shapes exactly as they were', () => {
    const a = effectiveNonlinear((system({}).ways[0] as DriverWay).driver);
    const b = effectiveNonlinear((system({ bl_offset_mm: 0, kms_asymmetry: 0 }).ways[0] as DriverWay).driver);
    expect(b).toEqual(a);
  });

  it('a Bl offset keeps Bl(0) and moves the peak of Bl to the offset', () => {
    const d = (system({ bl_offset_mm: 1.5 }).ways[0] as DriverWay).driver;
    const [c1, c2] = effectiveNonlinear(d).blRelPerMm;
    // Bl(x)/Bl(0) = 1 + c1·x + c2·x^2 peaks at x = -c1/(2·c2).
    expect(-c1 / (2 * c2)).toBeCloseTo(1.5, 9);
  });

  it('a Bl offset and a suspension asymmetry raise the second harmonic; the third stays', () => {
    const sym = harmonics({});
    const bl = harmonics({ bl_offset_mm: 1.5 });
    const kms = harmonics({ kms_asymmetry: 0.5 });
    expect(bl.h2).toBeGreaterThan(3 * sym.h2);
    expect(kms.h2).toBeGreaterThan(1.5 * sym.h2);
    expect(bl.h3 / sym.h3).toBeGreaterThan(0.5);
    expect(bl.h3 / sym.h3).toBeLessThan(2);
  });
});
