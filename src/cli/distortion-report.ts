// The distortion part of `preheard analyze --distortion`: stepped-sine curves per way and for the
// sum at the planned level (or --volts), and the two-tone intermodulation figure at one pair, as
// JSON fields in snake case with units.
import { distortionCurves, distortionFrequencies, type DistortionPoint } from '../engine/distortion/stepped-sine.ts';
import { intermodulation, TONE_RATIO, type IntermodulationFigure } from '../engine/distortion/two-tone.ts';
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

/** The pair the CLI and the app use unless told otherwise: f2 half-way between harmonics of f1. */
export const DEFAULT_TONE_PAIR_HZ: [number, number] = [40, 420];

const imColumns = (f: IntermodulationFigure) => ({
  im2_pct: r(f.im2Pct),
  im3_pct: r(f.im3Pct),
  total_pct: r(f.totalPct),
  im2_db: r(f.im2Db),
  im3_db: r(f.im3Db),
  total_db: r(f.totalDb),
  products: f.productsDb.map((p) => ({ freq_hz: p.freqHz, db: r(p.db) })),
});

export function distortionJson(
  system: SpeakerSystem,
  voltsRms: number | undefined,
  onProgress?: (done: number) => void,
  tonePairHz: [number, number] = DEFAULT_TONE_PAIR_HZ,
) {
  const volts = voltsRms ?? plannedVoltsRms(system);
  const curves = distortionCurves(system, distortionFrequencies(system), volts, {
    onProgress: (d) => {
      onProgress?.(d);
      return true;
    },
  });
  if (!curves) throw new Error('the distortion sweep stopped');
  const im = intermodulation(system, tonePairHz[0], tonePairHz[1], volts);
  return {
    volts_rms: r(volts),
    ways: curves.ways.map((w) => ({ name: w.name, ...columns(w.points) })),
    sum: columns(curves.sum),
    intermodulation: {
      method: `two tones at ${TONE_RATIO}:1, together at the peak of a sine at volts_rms; IEC 60268-5 modulation distortion: im2 = (|f2-f1| + |f2+f1|)/|f2|, im3 = (|f2-2f1| + |f2+2f1|)/|f2|, total their root sum of squares; products relative to f2`,
      f1_hz: im.sum.f1Hz,
      f2_hz: im.sum.f2Hz,
      volts_rms: r(volts),
      ways: im.ways.map((w) => ({ name: w.name, ...imColumns(w.figure) })),
      sum: imColumns(im.sum),
    },
  };
}
