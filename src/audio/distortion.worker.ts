// The Curves screen's distortion Worker (imported with `?worker`): the engine's stepped-sine curves
// for one design at each asked level (dB relative to its planned level), then the two-tone
// intermodulation figure at the planned level, with progress after each frequency. The very calls
// `preheard analyze --distortion` makes. The page cancels by terminating the worker.
import { distortionCurves, distortionFrequencies, type DistortionCurves } from '../engine/distortion/stepped-sine.ts';
import { intermodulation, type IntermodulationResult } from '../engine/distortion/two-tone.ts';
import { plannedVoltsRms } from '../engine/response/analyze.ts';
import type { SpeakerSystem } from '../engine/system.ts';

export interface DistortionJob {
  type: 'distortion';
  id: number;
  system: SpeakerSystem;
  /** Levels relative to the planned level, dB (0 = the planned level); [0] when absent. */
  levelsDb?: number[];
  /** The two tones of the intermodulation figure, Hz (low, high); none when absent. */
  tonePairHz?: [number, number];
}

export interface DistortionResult {
  /** One set of curves per asked level, in the order asked. */
  levels: { levelDb: number; curves: DistortionCurves }[];
  intermodulation: IntermodulationResult | null;
}

export type DistortionReply =
  | { type: 'progress'; id: number; done: number }
  | { type: 'result'; id: number; result: DistortionResult }
  | { type: 'error'; id: number; message: string };

/** The job's whole work, for the worker and for tests. */
export function runDistortionJob(job: DistortionJob, post: (m: DistortionReply) => void): void {
  try {
    const planned = plannedVoltsRms(job.system);
    const levelsDb = job.levelsDb?.length ? job.levelsDb : [0];
    // The two-tone figure weighs about as much as one level's sweep.
    const parts = levelsDb.length + (job.tonePairHz ? 1 : 0);
    const levels: DistortionResult['levels'] = [];
    for (const [i, levelDb] of levelsDb.entries()) {
      const curves = distortionCurves(job.system, distortionFrequencies(job.system), planned * 10 ** (levelDb / 20), {
        onProgress: (done) => {
          post({ type: 'progress', id: job.id, done: (i + done) / parts });
          return true;
        },
      });
      if (!curves) return;
      levels.push({ levelDb, curves });
    }
    const im = job.tonePairHz ? intermodulation(job.system, job.tonePairHz[0], job.tonePairHz[1], planned) : null;
    post({ type: 'result', id: job.id, result: { levels, intermodulation: im } });
  } catch (err) {
    post({ type: 'error', id: job.id, message: err instanceof Error ? err.message : String(err) });
  }
}

interface WorkerScope {
  postMessage(m: DistortionReply): void;
  onmessage: ((e: MessageEvent<DistortionJob>) => void) | null;
}

const scope = globalThis as unknown as Partial<WorkerScope> & { WorkerGlobalScope?: unknown; document?: unknown };
if (scope.WorkerGlobalScope !== undefined && scope.document === undefined) {
  scope.onmessage = (e) => {
    if (e.data?.type !== 'distortion') {
      scope.postMessage!({ type: 'error', id: e.data?.id ?? -1, message: 'unknown job type: expected "distortion"' });
      return;
    }
    runDistortionJob(e.data, (m) => scope.postMessage!(m));
  };
}
