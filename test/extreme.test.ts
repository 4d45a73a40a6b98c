// Extreme but valid designs and inputs: each either works (finite, bounded, not silent without
// reason) or is refused with a message. Values are deliberately at the edges of what the schema allows.
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../src/engine/design/validate.ts';
import { renderBuffer } from '../src/engine/render/index.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { doc, type V1Doc } from './helpers/designs.ts';
import type { DesignDoc } from '../src/engine/design/document.ts';

const tone = (sr: number, seconds: number, hz: number, amp = 0.5) =>
  Float32Array.from({ length: Math.max(1, Math.round(sr * seconds)) }, (_, k) => amp * Math.sin((2 * Math.PI * hz * k) / sr));

function check(d: DesignDoc | V1Doc, channels: Float32Array[], sr: number) {
  const parsed = parseDesign(d);
  if (!parsed.ok) {
    expect(parsed.errors[0].message.length).toBeGreaterThan(5);
    return 'refused' as const;
  }
  const a = analyze(parsed.system);
  for (const v of a.curves.splDb) expect(Number.isFinite(v)).toBe(true);
  const r = renderBuffer(parsed.system, channels, sr, { voltsFs: 10, extraStreams: true });
  let peak = 0;
  for (const ch of [...r.audio, ...r.linear!, ...r.residual!]) {
    expect(ch.length).toBe(channels[0].length);
    for (let k = 0; k < ch.length; k++) {
      if (!Number.isFinite(ch[k])) throw new Error(`non-finite sample at ${k}`);
      peak = Math.max(peak, Math.abs(ch[k]));
    }
  }
  expect(peak).toBeLessThanOrEqual(1);
  return { peak, summary: r.summary };
}

const driver = { fs_hz: 40, qes: 0.4, qms: 4, vas_l: 30 };

describe('extreme but valid designs', () => {
  it.each([
    ['Le = 0', doc({ ...driver, le_mh: 0 }, { type: 'sealed', vb_l: 20 })],
    ['large Le (5 mH)', doc({ ...driver, le_mh: 5 }, { type: 'sealed', vb_l: 20 })],
    ['very high Qms (lossless suspension)', doc({ ...driver, qms: 50000 }, { type: 'sealed', vb_l: 20 })],
    ['tiny sealed box', doc({ ...driver, sd_cm2: 30 }, { type: 'sealed', vb_l: 0.3 })],
    ['vented, fb far above fs', doc(driver, { type: 'vented', vb_l: 20, fb_hz: 110, ports: [{ diameter_cm: 8 }] })],
    ['vented, fb far below fs', doc(driver, { type: 'vented', vb_l: 60, fb_hz: 15, ports: [{ diameter_cm: 5 }] })],
    ['lossless vented box', doc(driver, { type: 'vented', vb_l: 20, fb_hz: 40, ql: null, ports: [{ diameter_cm: 6 }] })],
    [
      'lossless passive radiator',
      doc(driver, {
        type: 'passive-radiator',
        vb_l: 20,
        ql: null,
        radiator: { sd_cm2: 200, mmp_g: 80, cmp_mm_per_n: 0.5, qmp: null, xmax_mm: 10 },
      }),
    ],
  ])('%s renders finite, bounded audio at 48 kHz', (_name, d) => {
    const out = check(d, [tone(48000, 0.3, 50)], 48000);
    expect(out).not.toBe('refused');
    if (out !== 'refused') expect(out.peak).toBeGreaterThan(1e-4);
  });

  it.each([8000, 192000])('works at %i Hz', (sr) => {
    const out = check(doc(driver, { type: 'vented', vb_l: 20, fb_hz: 40, ports: [{ diameter_cm: 6 }] }), [tone(sr, 0.2, 45)], sr);
    expect(out).not.toBe('refused');
  });

  it('renders a 1-sample file and an 8-channel file', () => {
    const d = doc(driver, { type: 'sealed', vb_l: 20 });
    expect(check(d, [new Float32Array([0.5])], 48000)).not.toBe('refused');
    const eight = Array.from({ length: 8 }, (_, c) => tone(48000, 0.05, 40 + 10 * c));
    expect(check(d, eight, 48000)).not.toBe('refused');
  });

  it('refuses 9 channels and silly sample rates with a message', () => {
    const d = parseDesign(doc(driver, { type: 'sealed', vb_l: 20 }));
    if (!d.ok) throw new Error('design');
    expect(() =>
      renderBuffer(
        d.system,
        Array.from({ length: 9 }, () => tone(48000, 0.01, 50)),
        48000,
        { voltsFs: 1 },
      ),
    ).toThrow(/must have 1 to 8 channels/);
    expect(() => renderBuffer(d.system, [tone(4000, 0.01, 50)], 4000, { voltsFs: 1 })).toThrow(/the sample rate must be/);
  });

  it('explains silence: a silent input gives silent output and no events', () => {
    const out = check(doc(driver, { type: 'sealed', vb_l: 20 }), [new Float32Array(4800)], 48000);
    if (out === 'refused') throw new Error('refused');
    expect(out.peak).toBe(0);
    expect(out.summary.events).toEqual([]);
  });
});
