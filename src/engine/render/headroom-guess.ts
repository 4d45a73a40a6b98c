// A first guess at the headroom from one clean render: the stress that grows in proportion to the
// drive in the linear model (cone travel against Xmax, the port's air speed or the radiator's travel
// against their limits) is scaled up to where the largest of them would reach its limit; the
// output's distortion (residual against output energy) is scaled as second-order distortion grows,
// 1 dB per dB of drive (higher orders grow faster, so the guess errs high, where a probe is cheap:
// it stops at its first event). The search (render/index.ts) only uses it to place its first
// probes; every answer is still a render's.
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { BOX_KINDS } from '../box/index.ts';
import type { WaySummary } from './index.ts';
import { DISTORTION_WITHIN_DB } from './stress-meter.ts';

/**
 * Drive (V per full scale) at which the first limit would be reached, from a clean render at `volts`
 * with these way summaries and its peak residual level (dB against the output, the trace's
 * residualDb); null when no such stress showed (nothing to scale).
 */
export function linearHeadroomGuess(sys: SpeakerSystem, ways: WaySummary[], residualPeakDb: number, volts: number): number | null {
  const drivers = sys.ways.filter((w): w is DriverWay => w.kind === 'driver');
  let worst = 0;
  for (const s of ways) {
    const way = drivers.find((w) => w.name === s.name);
    if (!way) continue;
    if (way.driver.xmax > 0) worst = Math.max(worst, s.peak_excursion_mm / (way.driver.xmax * 1000));
    const probe = BOX_KINDS[way.box.type].probe(way.box);
    const outlet = probe?.kind === 'port-speed' ? s.peak_port_speed_m_s : probe?.kind === 'radiator' ? s.peak_radiator_mm : null;
    if (probe && outlet !== null && probe.limit > 0) worst = Math.max(worst, outlet / probe.limit);
  }
  // The distortion event fires above -DISTORTION_WITHIN_DB: as a ratio of drives, like the others.
  if (residualPeakDb > -120) worst = Math.max(worst, Math.pow(10, (residualPeakDb + DISTORTION_WITHIN_DB) / 20));
  return worst > 0 ? volts / worst : null;
}
