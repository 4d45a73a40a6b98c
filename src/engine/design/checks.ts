// Plausibility checks on a built system: warnings (and a few errors) with numbers.
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { error, fmt, warning, type Issue } from '../issues.ts';
import { respond } from '../response/frequency.ts';
import { abs } from '../complex.ts';
import { ladderPassesBass } from '../response/ladder.ts';

/**
 * Rough volume a driver itself occupies, 0.35·Sd^1.5 (gives about 0.5 l for a 6.5 inch woofer and
 * 3.7 l for a 12 inch; common practice, no source).
 */
export const estimatedDriverDisplacement = (sd: number): number => 0.35 * sd ** 1.5;

export function plausibility(system: SpeakerSystem): Issue[] {
  const out: Issue[] = [];
  system.ways.forEach((way, k) => {
    if (way.kind === 'driver') out.push(...wayPlausibility(system, way, `ways[${k}]`));
  });
  return out;
}

function wayPlausibility(system: SpeakerSystem, way: DriverWay, at: string): Issue[] {
  const out: Issue[] = [];
  const { unit: d, box } = way;
  // A way without a high-pass, or with a low-pass, plays bass: the bass-driver checks apply.
  const bass = way.network ? ladderPassesBass(way.network) : way.filter.lowpass !== null || way.filter.highpass === null;
  const xmaxMm = d.xmax * 1000;
  // Home bass drivers have a few mm of travel, large PA bass drivers about 25 mm (common practice, no source).
  if (xmaxMm > 30)
    out.push(warning(`${at}.driver.xmax_mm`, `${fmt(xmaxMm)} mm is beyond even large PA bass drivers (about 25 mm); check the value`));
  if (xmaxMm < 0.3 && d.sd > 30e-4)
    out.push(warning(`${at}.driver.xmax_mm`, `${fmt(xmaxMm)} mm is very little travel for a ${fmt(d.sd * 1e4)} cm² cone; check the value`));
  if (bass && (d.fs < 10 || d.fs > 300))
    out.push(warning(`${at}.driver.fs_hz`, `${fmt(d.fs)} Hz is unusual for a bass driver (10 to 300 Hz)`));
  if (d.qts > 1.5) out.push(warning(`${at}.driver.qes`, `Qts ${fmt(d.qts)} is very high; the box response will peak strongly`));
  const displacement = way.count * estimatedDriverDisplacement(d.sd);
  if (box.vbNet < displacement) {
    out.push(
      error(
        `${at}.box.vb_l`,
        `${fmt(box.vbNet * 1000)} l is smaller than the driver's own displacement of about ${fmt(displacement * 1000)} l`,
      ),
    );
  } else if (box.vbNet < 3 * displacement) {
    out.push(
      warning(
        `${at}.box.vb_l`,
        `${fmt(box.vbNet * 1000)} l is barely larger than the driver's own displacement of about ${fmt(displacement * 1000)} l`,
      ),
    );
  }
  if (box.type !== 'sealed') {
    const h = box.fb / d.fs;
    if (h > 3 || h < 0.3)
      out.push(
        warning(
          box.type === 'vented' ? `${at}.box.fb_hz` : `${at}.box.radiator`,
          `fb ${fmt(box.fb)} Hz is far from fs ${fmt(d.fs)} Hz (ratio ${fmt(h)})`,
        ),
      );
  }
  if (box.type === 'vented') {
    // Port air speed with the rated power into Re: over 10% of c the port is unusable.
    const volts = Math.sqrt(way.driver.pe * way.driver.re);
    let worst = 0;
    let worstHz = 0;
    for (let f = 10; f <= 300; f *= 1.02) {
      const speed = (Math.SQRT2 * abs(respond(system, way, f, volts).outletFlow)) / box.sv;
      if (speed > worst) [worst, worstHz] = [speed, f];
    }
    if (worst > 0.1 * system.air.c) {
      out.push(
        warning(
          `${at}.box.ports`,
          `at the rated ${fmt(d.pe)} W the port air speed reaches ${fmt(worst)} m/s near ${fmt(worstHz)} Hz, over 10% of the speed of sound; use a larger port area`,
        ),
      );
    }
  }
  return out;
}
