// The room stage's cost, measured side by side in one run: the resonator bank the renderer uses (at
// its low rate, with its filters at the audio rate) against the same room as an FIR convolved by the engine's uniformly partitioned convolver (fir/partitioned-convolver.ts) at the
// audio rate and at a low rate (the low rate's resampling filters not counted), and the whole
// large-signal render with and without the room.
import { readFileSync } from 'node:fs';
import { parseDesign } from '../../src/engine/design/validate.ts';
import { renderBuffer } from '../../src/engine/render/index.ts';
import { roomModel } from '../../src/engine/room/modes.ts';
import { RoomStage } from '../../src/engine/room/stage.ts';
import { synthesizeDemoTrack } from '../../src/engine/demo/track.ts';
import { PartitionedConvolver } from '../../src/engine/fir/partitioned-convolver.ts';
import type { SpeakerSystem } from '../../src/engine/system.ts';
import type { BenchResult } from './ui-redraw.ts';

const now = () => performance.now();

function vented(withRoom: boolean): SpeakerSystem {
  const doc = JSON.parse(readFileSync('public/examples/living-room-vented.json', 'utf8'));
  if (withRoom) doc.listening.room = JSON.parse(readFileSync('public/examples/living-room-vented-in-room.json', 'utf8')).listening.room;
  const r = parseDesign(doc);
  if (!r.ok) throw new Error('the example does not parse');
  return r.system;
}

function nsPerSample(fs: number, seconds: number, run: (block: Float64Array) => void, b = 256): number {
  const block = new Float64Array(b);
  const blocks = Math.ceil((fs * seconds) / b);
  let best = Infinity;
  for (let rep = 0; rep < 3; rep++) {
    const t0 = now();
    for (let k = 0; k < blocks; k++) {
      for (let j = 0; j < b; j++) block[j] = Math.sin(j + k);
      run(block);
    }
    best = Math.min(best, ((now() - t0) * 1e6) / (blocks * b));
  }
  return best;
}

function impulseResponse(stage: RoomStage, n: number): Float64Array {
  const ir = new Float64Array(n);
  ir[0] = 1;
  for (let s = 0; s < n; s += 256) stage.process(ir.subarray(s, Math.min(n, s + 256)), Math.min(256, n - s));
  return ir;
}

export async function bench(): Promise<BenchResult[]> {
  const sys = vented(true);
  const model = roomModel(sys.listening, sys.air)!;
  const path = model.paths[0];
  const fs = 48000;
  const bank = new RoomStage(path, fs);
  const bankNs = nsPerSample(fs, 5, (x) => bank.process(x, x.length));
  // The FIR holds the response until it is 60 dB down: one T60.
  const firFull = new PartitionedConvolver(impulseResponse(new RoomStage(path, fs), Math.ceil(model.reverb.t60 * fs)), 256);
  const firFullNs = nsPerSample(fs, 5, (x) => firFull.process(x, x.length));
  const low = 1500;
  const firLow = new PartitionedConvolver(impulseResponse(new RoomStage(path, low), Math.ceil(model.reverb.t60 * low)), 32);
  // Per audio-rate sample: the low rate runs fs/low times fewer samples.
  const firLowNs = (nsPerSample(low, 60, (x) => firLow.process(x, x.length), 32) * low) / fs;
  const track = synthesizeDemoTrack(fs);
  const rt = (s: SpeakerSystem) => {
    renderBuffer(s, track.channels, fs, { splDb: 90 });
    let best = 0;
    for (let k = 0; k < 2; k++) best = Math.max(best, renderBuffer(s, track.channels, fs, { splDb: 90 }).summary.realtime_factor);
    return best;
  };
  const free = rt(vented(false));
  const room = rt(sys);
  return [
    {
      name: `room resonator bank (${path.w.length} modes at 48 kHz / ${bank.decimation})`,
      value: bankNs,
      unit: 'ns/sample',
      target: 'measured',
    },
    {
      name: `room FIR, ${Math.ceil(model.reverb.t60 * fs)} taps, partitioned FFT, 48 kHz`,
      value: firFullNs,
      unit: 'ns/sample',
      target: '',
    },
    { name: `room FIR at ${low} Hz (resampling not counted)`, value: firLowNs, unit: 'ns/sample', target: '' },
    { name: 'render with the room / without, stereo 48 kHz', value: room / free, unit: 'x speed', target: 'measured' },
  ];
}
