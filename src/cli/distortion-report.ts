// The distortion part of `preheard analyze --distortion`: stepped-sine curves per way and for the
// sum at the planned level (or --volts), as JSON fields in snake case with units.
import { distortionCurves, distortionFrequencies, type DistortionPoint } from '../engine/distortion/stepped-sine.ts';
import { plannedVoltsRms } from '../engine/response/analyze.ts';
import type { SpeakerSystem } from '../engine/system.ts';

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
