// One side of `preheard compare`: a design's render at its matched level, written to its file as it
// renders, and its headroom on the track. Run in the main thread for design A and in a worker
// thread (compare-thread.ts) for B, so the two designs use two cores.
import { findHeadroom, renderBuffer, type Headroom, type RenderSummary } from '../engine/render/index.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import { WavFileWriter, type WavFormat } from './wav.ts';

/** The level a side renders at: its drive, the shared calibration and the track's Leq per volt. */
export interface SideLevel {
  voltsFs: number;
  paPerFs: number;
  leqPerVoltDb: number;
}

/** Where a side's audio goes: a file written while it renders (the command's staging name). */
export interface SideOutput {
  path: string;
  format: WavFormat;
}

export interface SideResult {
  summary: RenderSummary;
  headroom: Headroom;
}

export function renderSide(
  system: SpeakerSystem,
  channels: Float32Array[],
  sampleRate: number,
  level: SideLevel,
  output: SideOutput,
  progress?: { render?: (fraction: number) => void; headroomTick?: () => void },
): SideResult {
  const out = new WavFileWriter(output.path, channels.length, sampleRate, output.format, channels[0]?.length ?? 0);
  let res: ReturnType<typeof renderBuffer>;
  try {
    res = renderBuffer(system, channels, sampleRate, { ...level, onProgress: progress?.render, onAudio: (frames) => out.write(frames) });
    out.finish();
  } catch (e) {
    out.abort();
    throw e;
  }
  const headroom = findHeadroom(system, channels, sampleRate, { onRender: progress?.headroomTick, leqPerVoltDb: level.leqPerVoltDb });
  return { summary: res.summary, headroom };
}
