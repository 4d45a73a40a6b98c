// The listening bench's Worker for offline work (imported with `?worker`): it keeps one copy of the
// track and runs the jobs of jobs.ts on it. A job runs to the end once started; the page cancels one
// by terminating this worker and starting a fresh one.
import { exportStream, levelsFor, renderBoth, TrackWork } from './jobs.ts';
import type { WorkerReply, WorkerRequest } from './render-protocol.ts';
import { startLaneHelper } from './lane-helper.ts';

// A second thread for every render and calibration here, where the page allows one.
const laneHelper = startLaneHelper();

// The track and the work done on it per design (calibrations and renders, reused by every job on this track).
let track: TrackWork | null = null;

const reply = (m: WorkerReply, transfer: Transferable[] = []) => (self as unknown as Worker).postMessage(m, transfer);

self.onmessage = (e: MessageEvent<WorkerRequest>) => {
  const m = e.data;
  try {
    if (m.type === 'track') {
      track = new TrackWork({ channels: m.channels, sampleRate: m.sampleRate }, laneHelper.helper);
      return;
    }
    if (!track) throw new RangeError('no track has been loaded into the render worker');
    const progress = (fraction: number) => reply({ type: 'progress', id: m.id, fraction });
    if (m.type === 'levels') reply({ type: 'levels', id: m.id, levels: levelsFor(track, m.systems) });
    else if (m.type === 'render') reply({ type: 'rendered', id: m.id, results: renderBoth(track, m.systems, progress) });
    else if (m.type === 'export') {
      const { bytes, frames } = exportStream(track, m.system, m.mode, m.format, progress);
      reply({ type: 'exported', id: m.id, bytes, frames, sampleRate: track.track.sampleRate }, [bytes.buffer as ArrayBuffer]);
    }
  } catch (err) {
    reply({ type: 'error', id: 'id' in m ? m.id : -1, message: err instanceof Error ? err.message : String(err) });
  }
};
