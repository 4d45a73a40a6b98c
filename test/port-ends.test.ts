// Port end shapes: the loss coefficient K of Δp = ½·rho·K·u·|u| (sharp edges K of order 1: Backman,
// AES 1995; rounded and flared ends lower: Salvatti, Devantier & Button, JAES 2002 — our values 0.5
// and 0.2 are estimates from memory) and what it does to port compression in the large-signal model.
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../src/engine/design/validate.ts';
import { wooferParams } from '../src/engine/sim/params.ts';
import { WooferSim } from '../src/engine/sim/woofer.ts';
import { LinearRecurrence } from '../src/engine/sim/linear.ts';
import { BOX_KINDS } from '../src/engine/box/index.ts';
import { PORT_LOSS_K } from '../src/engine/box/vented.ts';
import type { DriverWay, SpeakerSystem } from '../src/engine/system.ts';

function vented(shape: 'sharp' | 'rounded' | 'flared' | undefined): SpeakerSystem {
  const r = parseDesign({
    format: 'preheard-design',
    version: 2,
    name: 'port ends',
    ways: [
      {
        kind: 'driver',
        name: 'woofer',
        driver: { fs_hz: 38, qes: 0.38, qms: 4, vas_l: 40, re_ohm: 5.8, sd_cm2: 200, xmax_mm: 7, xlim_mm: 12, pe_w: 120 },
        box: { type: 'vented', vb_l: 40, fb_hz: 35, ports: [{ diameter_cm: 5, ...(shape ? { end_shape: shape } : {}) }] },
      },
    ],
    amplifier: { power_w: 400, load_ohm: 8 },
    listening: { distance_m: 1, space: 'half' },
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.system;
}

/** Level of the full model's output against its linear part for a tone at fb, dB (negative: compression). */
function compressionAtFb(sys: SpeakerSystem, volts: number): number {
  const way = sys.ways[0] as DriverWay;
  const rate = 48000,
    n = rate;
  const sim = new WooferSim(wooferParams(sys, way, 1 / rate));
  const lin = new LinearRecurrence(wooferParams(sys, way, 1 / rate, { linear: true }));
  const u = new Float64Array(n),
    p = new Float64Array(n),
    pl = new Float64Array(n),
    x = new Float64Array(n);
  for (let k = 0; k < n; k++) u[k] = volts * Math.SQRT2 * Math.sin((2 * Math.PI * 35 * k) / rate);
  sim.processBlock(u, n, p, x);
  lin.processBlock(u, pl, n);
  let e = 0,
    el = 0;
  for (let k = n / 2; k < n; k++) {
    e += p[k] * p[k];
    el += pl[k] * pl[k];
  }
  return 10 * Math.log10(e / el);
}

describe('port end shapes', () => {
  it('sets K: sharp 1 (the default), rounded 0.5, flared 0.2', () => {
    expect(PORT_LOSS_K).toEqual({ sharp: 1, rounded: 0.5, flared: 0.2 });
    const box = (shape?: 'sharp' | 'flared') => (vented(shape).ways[0] as DriverWay).box as { portLossK: number };
    expect(box().portLossK).toBe(1);
    expect(box('flared').portLossK).toBe(0.2);
  });

  it('flared ports compress less than sharp ones at high port speed', () => {
    const sharp = compressionAtFb(vented('sharp'), 12);
    const rounded = compressionAtFb(vented('rounded'), 12);
    const flared = compressionAtFb(vented('flared'), 12);
    expect(sharp).toBeLessThan(-1);
    expect(rounded).toBeGreaterThan(sharp + 0.3);
    expect(flared).toBeGreaterThan(rounded + 0.3);
  });

  it('reports the first pipe resonance c/(2·Leff) of the port', () => {
    const sys = vented(undefined);
    const box = (sys.ways[0] as DriverWay).box as { portLeff: number };
    const fig = BOX_KINDS.vented.figures(box, sys.air).find((f) => f.id === 'pipe-resonance');
    expect(fig?.value).toBeCloseTo(sys.air.c / (2 * box.portLeff), 9);
  });
});
