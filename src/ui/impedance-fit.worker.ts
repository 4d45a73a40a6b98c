// The Driver sheet's impedance-fit Worker (imported with `?worker`): the fit takes 0.1 to 0.5 s,
// too long for the page's thread. Progress after each sweep; the page cancels by terminating it.
// `runFitJob` and the message types are exported for the page and the tests; the message handler
// is installed only inside a worker.
import { runFit, type FitOutcome, type FitRequest } from './impedance-fit.ts';

export interface FitJob {
  type: 'fit';
  id: number;
  request: FitRequest;
}

export type FitReply =
  | { type: 'progress'; id: number; done: number; of: number; what: string }
  | { type: 'result'; id: number; outcome: FitOutcome }
  | { type: 'error'; id: number; message: string };

/** The job's whole work, for the worker and for tests. */
export function runFitJob(job: FitJob, post: (m: FitReply) => void): void {
  try {
    const outcome = runFit(job.request, (done, of, what) => post({ type: 'progress', id: job.id, done, of, what }));
    post({ type: 'result', id: job.id, outcome });
  } catch (err) {
    post({ type: 'error', id: job.id, message: err instanceof Error ? err.message : String(err) });
  }
}

interface WorkerScope {
  postMessage(m: FitReply): void;
  onmessage: ((e: MessageEvent<FitJob>) => void) | null;
}

const scope = globalThis as unknown as Partial<WorkerScope> & { WorkerGlobalScope?: unknown; document?: unknown };
if (scope.WorkerGlobalScope !== undefined && scope.document === undefined) {
  scope.onmessage = (e) => {
    if (e.data?.type !== 'fit') {
      scope.postMessage!({ type: 'error', id: e.data?.id ?? -1, message: 'unknown job type: expected "fit"' });
      return;
    }
    runFitJob(e.data, (m) => scope.postMessage!(m));
  };
}
