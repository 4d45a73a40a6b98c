// The Curves screen's distortion Worker (imported with `?worker`): the engine's stepped-sine curves
// for one design at its planned level, with progress after each frequency. The very call
// `preheard analyze --distortion` makes. The page cancels by terminating the worker.
import { distortionCurves, distortionFrequencies, type DistortionCurves } from '../engine/distortion/stepped-sine.ts';
import { plannedVoltsRms } from '../engine/response/analyze.ts';
import type { SpeakerSystem } from '../engine/system.ts';

export interface DistortionJob {
  type: 'distortion';
  id: number;
  system: SpeakerSystem;
}

export type DistortionReply =
  | { type: 'progress'; id: number; done: number }
  | { type: 'result'; id: number; curves: DistortionCurves }
  | { type: 'error'; id: number; message: string };

/** The job's whole work, for the worker and for tests. */
export function runDistortionJob(job: DistortionJob, post: (m: DistortionReply) => void): void {
  try {
    const curves = distortionCurves(job.system, distortionFrequencies(job.system), plannedVoltsRms(job.system), {
      onProgress: (done) => {
        post({ type: 'progress', id: job.id, done });
        return true;
      },
    });
    if (curves) post({ type: 'result', id: job.id, curves });
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
