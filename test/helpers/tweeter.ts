// Our invented 25 mm dome tweeter in a closed back chamber as a way, and a two-way test design made
// from an example: its woofer way and this tweeter, crossed over with LR4 at 2.2 kHz and padded 3 dB.
import { readFileSync } from 'node:fs';
import { parseDesign } from '../../src/engine/design/validate.ts';
import type { DesignDoc, DriverWayDoc } from '../../src/engine/design/document.ts';

/** Invented: fs 800 Hz, Re 5 ohm, Sd 7 cm², Xmax 0.3 mm, Pe 10 W; about 3 dB above the examples' woofer. */
export const TWEETER_DRIVER = { fs_hz: 800, qes: 0.7, qms: 2.5, vas_l: 0.0103, re_ohm: 5, sd_cm2: 7, xmax_mm: 0.3, xlim_mm: 0.6, pe_w: 10 };

export const tweeterWay = (): DriverWayDoc => ({
  kind: 'driver',
  name: 'tweeter',
  driver: { ...TWEETER_DRIVER },
  box: { type: 'sealed', vb_l: 0.03 },
  filter: { type: 'active', highpass: { shape: 'lr4', hz: 2200 }, gain_db: -3 },
});

/** A shipped example (a woofer and the flat upper band) with the tweeter in place of the flat band. */
export function twoWayFrom(examplePath: string): DesignDoc {
  const r = parseDesign(readFileSync(examplePath, 'utf8'));
  if (!r.ok) throw new Error(`${examplePath} does not parse`);
  const d = structuredClone(r.design);
  d.ways[1] = tweeterWay();
  return d;
}
