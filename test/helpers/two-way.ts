// An invented two-way active design for tests: our 6.5-inch woofer in a sealed 14 l box and our own
// closed-back tweeter (fs 800 Hz, Re 5 ohm, Sd 7 cm², Xmax 0.3 mm, 10 W, in 0.1 l), crossed with
// Linkwitz-Riley 4th order at 2.2 kHz; the tweeter plays about 3 dB hotter and is padded by -3 dB.
import type { DesignDoc } from '../../src/engine/design/document.ts';
import { AIR_20C } from './designs.ts';

export const CROSSOVER_HZ = 2200;

export function twoWayDoc(opts: { wooferOffsetMm?: number; tweeterDelayMs?: number; rsOhm?: number } = {}): DesignDoc {
  return {
    format: 'preheard-design',
    version: 2,
    name: 'two-way test',
    ways: [
      {
        kind: 'driver',
        name: 'woofer',
        driver: { fs_hz: 42, qes: 0.42, qms: 3.6, vas_l: 24, re_ohm: 5.6, le_mh: 0.45, sd_cm2: 132, xmax_mm: 5.5, xlim_mm: 10, pe_w: 60 },
        box: { type: 'sealed', vb_l: 14 },
        filter: { type: 'active', lowpass: { shape: 'lr4', hz: CROSSOVER_HZ } },
        offset_mm: opts.wooferOffsetMm ?? 0,
      },
      {
        kind: 'driver',
        name: 'tweeter',
        driver: { fs_hz: 800, qes: 0.8, qms: 2, mms_g: 0.25, re_ohm: 5, le_mh: 0.05, sd_cm2: 7, xmax_mm: 0.3, xlim_mm: 0.6, pe_w: 10 },
        box: { type: 'sealed', vb_l: 0.1 },
        filter: {
          type: 'active',
          highpass: { shape: 'lr4', hz: CROSSOVER_HZ },
          gain_db: -3,
          ...(opts.tweeterDelayMs ? { delay_ms: opts.tweeterDelayMs } : {}),
        },
      },
    ],
    amplifier: { power_w: 100, load_ohm: 8, rs_ohm: opts.rsOhm ?? 0.1 },
    listening: { distance_m: 2, space: 'half', level: { mode: 'volts', volts_fs: 1 } },
    air: AIR_20C,
  } as DesignDoc;
}
