// One side of `preheard compare`: a design's render at its matched level and its headroom on the
// track. Run in the main thread for design A and in a worker thread (compare-thread.ts) for B, so
// the two designs use two cores.
import { findHeadroom, renderBuffer, type Headroom, type RenderSummary } from '../engine/render/index.ts';
import type { SpeakerSystem } from '../engine/system.ts';

/** The level a side renders at: its drive, the shared calibration and the track's Leq per volt. */
export interface SideLevel {
  voltsFs: number;
  paPerFs: number;
  leqPerVoltDb: number;
}

export interface SideResult {
  audio: Float32Array[];
  summary: RenderSummary;
  headroom: Headroom;
}

export function renderSide(
  system: SpeakerSystem,
  channels: Float32Array[],
  sampleRate: number,
  level: SideLevel,
  progress?: { render?: (fraction: number) => void; headroomTick?: () => void },
): SideResult {
  const res = renderBuffer(system, channels, sampleRate, { ...level, onProgress: progress?.render });
  const headroom = findHeadroom(system, channels, sampleRate, { onRender: progress?.headroomTick, leqPerVoltDb: level.leqPerVoltDb });
  return { audio: res.audio, summary: res.summary, headroom };
}
