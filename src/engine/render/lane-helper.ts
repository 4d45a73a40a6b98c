// The helper thread's side of a shared render (lane-share.ts): the shell's thread calls
// runLaneJob(job) with the job the engine handed to its LaneHelper.
import { runLevelLanes } from '../level/calibration.ts';
import { forEachBlock, type LaneJob, type RenderLaneJob } from './lane-share.ts';
import { createRenderer } from './renderer.ts';
import { SlotRing } from './slot-ring.ts';

/** Runs the job's lanes into its ring until the input ends or the other side stops it; a failure, or an end before the other side's, is passed on through the ring. */
export function runLaneJob(job: LaneJob): void {
  const ring = SlotRing.attach(job.ring);
  try {
    if (job.kind === 'level') runLevelLanes(job, ring);
    else runRenderLanes(job, ring);
  } catch (e) {
    ring.fail(e instanceof Error ? e.message : String(e));
  } finally {
    ring.finish();
  }
}

function runRenderLanes(job: RenderLaneJob, ring: SlotRing): void {
  const r = createRenderer(job.system, job.renderer);
  r.shareLanes('helper', ring, job.lanes, job.twinsOnHelper);
  const reads = r.helperPlan(job.lanes).reads;
  const scratch = job.channels.map(() => new Float32Array(job.block));
  forEachBlock(
    job.channels,
    job.frames,
    job.total,
    job.block,
    scratch,
    (views, _s, n) => {
      r.process(views, [], n);
      return !ring.stopped;
    },
    reads,
  );
}
