// A measured response's cost, side by side in one run: the zero-latency partitioned convolver per
// sample at three partition sizes on the correction's own taps, and the whole large-signal render of
// the sealed example (woofer alone, no low-pass) with and without a measured response.
import { parseDesign } from '../../src/engine/design/validate.ts';
import { renderBuffer } from '../../src/engine/render/index.ts';
import { measuredCorrection } from '../../src/engine/response/frequency.ts';
import { PartitionedConvolver } from '../../src/engine/fir/partitioned-convolver.ts';
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
  for (const p of [32, 64, 128]) {
    const conv = new PartitionedConvolver(taps, p);
    const buf = new Float64Array(256);
    let best = Infinity;
    for (let round = 0; round < 3; round++) {
      const t0 = performance.now();
      for (let at = 0; at < x.length; at += 256) {
        buf.set(x.subarray(at, at + 256));
        conv.process(buf, 256);
      }
      best = Math.min(best, ((performance.now() - t0) * 1e6) / x.length);
    }
    rows.push({ name: `measured FIR, ${taps.length} taps, partition ${p}`, value: best, unit: 'ns/sample', target: 'measured' });
  }
  const track = synthesizeDemoTrack(fs);
  const rt = (s: SpeakerSystem) => {
    let best = 0;
    for (let k = 0; k < 2; k++) best = Math.max(best, renderBuffer(s, track.channels, fs, { splDb: 85 }).summary.realtime_factor);
    return best;
  };
  const without = rt(plain);
  const withIt = rt(measured);
  rows.push(
    { name: 'render, sealed woofer alone', value: without, unit: '× realtime', target: 'measured' },
    { name: 'render, same with a measured response', value: withIt, unit: '× realtime', target: 'measured' },
    {
      name: 'render speed with / without',
      value: withIt / without,
      unit: 'ratio',
      target: 'measured (the FIR runs on the full and the linear stream of each lane)',
    },
  );
  return rows;
}
