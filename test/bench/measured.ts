// A measured response's cost, side by side in one run: the zero-latency partitioned convolver per
// sample on the correction's own taps (one stream, and the full and linear streams as a pair, in the
// render quantum's blocks), and the whole large-signal render of the sealed example (woofer alone,
// no low-pass) with and without a measured response, run in turns so a load from elsewhere falls on
// both alike; the best of each.
import { parseDesign } from '../../src/engine/design/validate.ts';
import { renderBuffer } from '../../src/engine/render/index.ts';
import { measuredCorrection } from '../../src/engine/response/frequency.ts';
import { PartitionedConvolver, partitionFor, RENDER_QUANTUM as QUANTUM } from '../../src/engine/fir/partitioned-convolver.ts';
import { synthesizeDemoTrack } from '../../src/engine/demo/track.ts';
import type { DriverWay, SpeakerSystem } from '../../src/engine/system.ts';
import { bareModel, db, logSpaced, sealedDoc } from '../helpers/measured.ts';
import type { BenchResult } from './ui-redraw.ts';

function systems(): { plain: SpeakerSystem; measured: SpeakerSystem } {
  const doc = sealedDoc();
  doc.ways = doc.ways.slice(0, 1);
  const way = doc.ways[0];
  if (way.kind !== 'driver') throw new Error('way 0 has no driver');
  way.filter = undefined;
  const model = bareModel(doc);
  const freqs = logSpaced(20, 20000, 300);
  const withTable = structuredClone(doc);
  const w = withTable.ways[0];
  if (w.kind !== 'driver') throw new Error('way 0 has no driver');
  w.measured_response = {
    blend_hz: 400,
    freq_hz: freqs,
    spl_db: freqs.map((f) => db(model(f)) - 4 * Math.exp(-((Math.log2(f / 1800) / 0.4) ** 2))),
  };
  const a = parseDesign(doc);
  const b = parseDesign(withTable);
  if (!a.ok || !b.ok) throw new Error('the bench designs do not parse');
  return { plain: a.system, measured: b.system };
}

export async function bench(): Promise<BenchResult[]> {
  const fs = 48000;
  const { plain, measured } = systems();
  const taps = measuredCorrection(measured, measured.ways[0] as DriverWay)!.taps(fs);
  const x = Float64Array.from({ length: fs }, (_, i) => Math.sin(i * 0.01));
  const rows: BenchResult[] = [];
  for (const streams of [1, 2] as const) {
    const conv = new PartitionedConvolver(taps, partitionFor(taps.length), streams);
    const a = new Float64Array(QUANTUM);
    const b = new Float64Array(QUANTUM);
    let best = Infinity;
    for (let round = 0; round < 3; round++) {
      const t0 = performance.now();
      for (let at = 0; at + QUANTUM <= x.length; at += QUANTUM) {
        a.set(x.subarray(at, at + QUANTUM));
        if (streams === 1) conv.process(a, QUANTUM);
        else {
          b.set(a);
          conv.processPair(a, b, QUANTUM);
        }
      }
      best = Math.min(best, ((performance.now() - t0) * 1e6) / x.length);
    }
    rows.push({
      name: `measured FIR, ${taps.length} taps, partition ${conv.partition}, ${streams === 1 ? 'one stream' : 'a pair of streams'}`,
      value: best,
      unit: 'ns/frame',
      target: 'measured',
    });
  }
  const track = synthesizeDemoTrack(fs);
  // Seconds of audio per second of this process's own CPU time: the other developers' jobs on the
  // shared cores stretch the wall clock far more than they stretch that.
  const seconds = track.channels[0].length / fs;
  const rt = (s: SpeakerSystem) => {
    const t0 = process.cpuUsage();
    renderBuffer(s, track.channels, fs, { splDb: 85 });
    const t = process.cpuUsage(t0);
    return seconds / ((t.user + t.system) * 1e-6);
  };
  let without = 0;
  let withIt = 0;
  for (let round = 0; round < 5; round++) {
    without = Math.max(without, rt(plain));
    withIt = Math.max(withIt, rt(measured));
  }
  rows.push(
    { name: 'render, sealed woofer alone', value: without, unit: '× realtime', target: 'measured (CPU time)' },
    { name: 'render, same with a measured response', value: withIt, unit: '× realtime', target: 'measured (CPU time)' },
    {
      name: 'render speed with / without',
      value: withIt / without,
      unit: 'ratio',
      target: '>= 0.8 (the FIR on the full and linear streams of each lane, and in the level calibration)',
    },
  );
  return rows;
}
