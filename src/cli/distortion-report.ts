// The distortion part of `preheard analyze --distortion`: stepped-sine curves per way and for the
// sum at the planned level (or --volts), as JSON fields in snake case with units.
import { distortionCurves, type DistortionPoint } from '../engine/distortion/stepped-sine.ts';
import { plannedVoltsRms } from '../engine/response/analyze.ts';
import type { SpeakerSystem } from '../engine/system.ts';

/** Third-octave steps from 20 Hz to 2 kHz, to 16 kHz when more than one way has drivers. */
export function distortionFrequencies(system: SpeakerSystem): number[] {
  const top = system.ways.filter((w) => w.kind === 'driver').length > 1 ? 16000 : 2000;
  const out: number[] = [];
  for (let k = 0; 20 * 2 ** (k / 3) <= top * 1.001; k++) out.push(Number((20 * 2 ** (k / 3)).toPrecision(4)));
  return out;
}

const r = (x: number, d = 4) => (Number.isFinite(x) ? Number(x.toPrecision(d)) : null);
const columns = (pts: DistortionPoint[]) => ({
  freq_hz: pts.map((p) => p.freqHz),
  thd_pct: pts.map((p) => r(p.thdPct)),
  h2_db: pts.map((p) => r(p.h2Db)),
  h3_db: pts.map((p) => r(p.h3Db)),
  compression_db: pts.map((p) => r(p.compressionDb)),
});

export function distortionJson(system: SpeakerSystem, voltsRms: number | undefined, onProgress?: (done: number) => void) {
  const volts = voltsRms ?? plannedVoltsRms(system);
  const curves = distortionCurves(system, distortionFrequencies(system), volts, {
    onProgress: (d) => {
      onProgress?.(d);
      return true;
    },
  });
  if (!curves) throw new Error('the distortion sweep stopped');
  return {
    volts_rms: r(volts),
    ways: curves.ways.map((w) => ({ name: w.name, ...columns(w.points) })),
    sum: columns(curves.sum),
  };
}
