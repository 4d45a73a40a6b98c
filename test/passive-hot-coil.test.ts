// The coil's heat changes a passive crossover: the time-domain network coupled to the driver's
// large-signal model with a hot coil against the small-signal ABCD analysis with the hot Re
// (Re·(1 + alpha·rise), the coil's resistance law; annealed copper alpha from IEC 60028).
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseDesign } from '../src/engine/design/validate.ts';
import type { DriverWay, SpeakerSystem } from '../src/engine/system.ts';
import { respond } from '../src/engine/response/frequency.ts';
import { abs } from '../src/engine/complex.ts';
import { LadderSim, wayParams } from '../src/engine/sim/ladder.ts';
import { WooferSim } from '../src/engine/sim/woofer.ts';

function example(): SpeakerSystem {
  const r = parseDesign(readFileSync('public/examples/bookshelf-two-way-passive.json', 'utf8'));
  if (!r.ok) throw new Error('example does not parse');
  return r.system;
}

const hot = (way: DriverWay, rise: number): DriverWay => ({
  ...way,
  driver: { ...way.driver, re: way.driver.re * (1 + way.driver.thermal.alphaR * rise) },
});

/** Steady-state peak seat pressure of the way's model with its coil `rise` K over ambient, for a 0.25 V peak tone. */
function simulatedPeak(sys: SpeakerSystem, way: DriverWay, f: number, rise: number): number {
  const sr = 96000;
  const p = wayParams(sys, way, 1 / sr);
  const sim = new WooferSim(p);
  sim.setCoilRise(rise, 0);
  const net = new LadderSim(way.network!, sys.amplifier.rs, p.h);
  const n = Math.round(sr * 0.2);
  const u = Float64Array.from({ length: n }, (_, k) => 0.25 * Math.sin((2 * Math.PI * f * k) / sr));
  const out = new Float64Array(n);
  sim.processBlock(u, n, out, new Float64Array(n), undefined, net);
  const span = Math.floor(Math.floor(n / 2 / (sr / f)) * (sr / f));
  let ss = 0;
  for (let k = n - span; k < n; k++) ss += out[k] * out[k];
  return Math.sqrt((2 * ss) / span);
}

describe('a hot coil behind a passive network', () => {
  const sys = example();
  const tweeter = sys.ways[1] as DriverWay;
  it('the tweeter at 120 K rise: the model follows the hot-Re small-signal curve within 0.1 dB, which differs from the cold one', () => {
    for (const f of [1200, 2200, 3500, 8000]) {
      const cold = abs(respond(sys, tweeter, f, 0.25).pressure);
      const expected = abs(respond(sys, hot(tweeter, 120), f, 0.25).pressure);
      const got = simulatedPeak(sys, tweeter, f, 120);
      expect(Math.abs(20 * Math.log10(got / expected)), `${f} Hz`).toBeLessThan(0.1);
      // Heat costs level (1 to 3 dB here), more where the network leans on the driver's impedance.
      expect(20 * Math.log10(cold / expected), `${f} Hz`).toBeGreaterThan(0.5);
    }
    // ...and moves the crossover: the drop differs between the slope and the passband.
    const drop = (f: number) =>
      20 * Math.log10(abs(respond(sys, tweeter, f, 1).pressure) / abs(respond(sys, hot(tweeter, 120), f, 1).pressure));
    expect(Math.abs(drop(1200) - drop(8000))).toBeGreaterThan(0.2);
  });
});
