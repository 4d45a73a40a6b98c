// The baffle step of a free-standing cabinet: a first-order shelf rising 6.02 dB (4 pi to 2 pi
// radiation) centred near 115/W Hz for a baffle W metres wide (common practice, from memory).
import { describe, expect, it } from 'vitest';
import { systemPressure } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { renderBuffer } from '../src/engine/render/index.ts';
import { baffleStepHz } from '../src/engine/filters/room.ts';
import { doc, system } from './helpers/designs.ts';
import { parseDesign } from '../src/engine/design/validate.ts';

const plain = doc(
  { fs_hz: 40, qes: 0.4, qms: 4, vas_l: 30 },
  { type: 'sealed', vb_l: 20 },
  {
    crossover: { type: 'lr4', fx_hz: 5000 },
    listening: { distance_m: 2, space: 'full' },
  },
);
const stepped = { ...plain, listening: { ...plain.listening, baffle_width_cm: 25 } };

describe('baffle step', () => {
  const a = system(plain);
  const b = system(stepped);
  const rel = (f: number) => 20 * Math.log10(abs(systemPressure(b, f, 1)) / abs(systemPressure(a, f, 1)));

  it('leaves the bass in full space, adds 6.02 dB (a doubled pressure) far above, and 3.01 dB at its centre', () => {
    expect(baffleStepHz(0.25)).toBeCloseTo(460, 9);
    expect(rel(20)).toBeCloseTo(0, 1);
    expect(rel(20000)).toBeCloseTo(20 * Math.log10(2), 1);
    expect(rel(460)).toBeCloseTo(10 * Math.log10(2), 6);
  });

  it('is rendered with the same shape as the small-signal curve, within 0.1 dB', () => {
    const sr = 48000;
    for (const f of [100, 460, 1200]) {
      const n = sr / 2;
      const tone = Float32Array.from({ length: n }, (_, k) => 0.25 * Math.sin((2 * Math.PI * f * k) / sr));
      const out = renderBuffer(b, [tone], sr, { voltsFs: 0.4, paPerFs: 1, mode: 'linear' }).audio[0];
      let ss = 0;
      for (let k = n / 2; k < n; k++) ss += out[k] * out[k];
      const peakPa = Math.sqrt((2 * ss) / (n / 2));
      const expected = abs(systemPressure(b, f, 1)) * 0.4 * 0.25;
      expect(Math.abs(20 * Math.log10(peakPa / expected))).toBeLessThan(0.1);
    }
  });

  it('warns when combined with a boundary, and is off without a width', () => {
    const r = parseDesign({ ...stepped, listening: { ...stepped.listening, space: 'half' } });
    expect(r.ok && r.warnings.find((w) => w.path === 'listening.baffle_width_cm')?.message).toMatch(/free-standing/);
    expect(parseDesign(stepped).warnings.some((w) => w.path === 'listening.baffle_width_cm')).toBe(false);
    expect(a.listening.baffleWidth).toBe(0);
  });
});
