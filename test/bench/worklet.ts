// Benchmark: the listening bench's worklet processor for A + B + reference, called in Node exactly as
// the browser calls it (one process() per 128-frame render quantum) through a fake
// AudioWorkletGlobalScope. Target: at most 25% of a quantum's real time on this machine.
import { exampleSystem } from '../helpers/audio-bench.ts';
import { synthesizeDemoTrack } from '../../src/engine/demo/track.ts';
import { resolveVolts } from '../../src/engine/render/index.ts';

export interface BenchRow {
  name: string;
  value: number;
  unit: string;
  target: string;
}

type Proc = { port: { onmessage: ((e: { data: unknown }) => void) | null }; process(i: Float32Array[][], o: Float32Array[][]): boolean };

async function processorClass(sampleRate: number): Promise<new () => Proc> {
  const g = globalThis as Record<string, unknown>;
  let ctor: (new () => Proc) | null = null;
  g.AudioWorkletProcessor ??= class {
    port = { onmessage: null as unknown, postMessage() {} };
  };
  g.registerProcessor = (_name: string, c: new () => Proc) => (ctor = c);
  g.sampleRate = sampleRate;
  await import('../../src/audio/processor.worklet.ts');
  if (!ctor) throw new Error('the processor did not register');
  return ctor;
}

export async function bench(): Promise<BenchRow[]> {
  const sr = 48000;
  const Ctor = await processorClass(sr);
  const demo = synthesizeDemoTrack(sr);
  const a = exampleSystem('sealed'),
    b = exampleSystem('vented');
  const va = resolveVolts(a, demo.channels, sr, {}).volts,
    vb = resolveVolts(b, demo.channels, sr, {}).volts;
  const p = new Ctor();
  const send = (m: unknown) => p.port.onmessage!({ data: m });
  send({ type: 'track', channels: demo.channels.map((c) => c.slice()) });
  send({ type: 'design', slot: 'a', system: a, voltsFs: va });
  send({ type: 'design', slot: 'b', system: b, voltsFs: vb });
  send({ type: 'monitor', gainDb: -24 });
  // Start in the loud half, where the models work hardest.
  send({ type: 'seek', frame: Math.round(demo.loudFromS * sr) });
  send({ type: 'play', playing: true });
  const out = [new Float32Array(128), new Float32Array(128)];
  const quanta = Math.round((12 * sr) / 128);
  for (let q = 0; q < 400; q++) p.process([[]], [out]);
  const t0 = performance.now();
  for (let q = 0; q < quanta; q++) {
    if (q % 750 === 0) send({ type: 'lane', lane: q % 1500 === 0 ? 'b' : 'a' });
    p.process([[]], [out]);
  }
  const ms = performance.now() - t0;
  const quantumMs = (128 / sr) * 1000;
  const perQuantum = ms / quanta;
  return [
    {
      name: 'worklet process(), A + B + reference, per 128-frame quantum',
      value: Number((perQuantum * 1000).toFixed(1)),
      unit: 'µs',
      target: `quantum is ${(quantumMs * 1000).toFixed(0)} µs`,
    },
    {
      name: 'worklet load: process() time / quantum real time',
      value: Number((perQuantum / quantumMs).toFixed(4)),
      unit: 'ratio',
      target: '<= 0.25',
    },
  ];
}

// Run alone: npx tsx test/bench/worklet.ts
if (process.argv[1] && /worklet\.ts$/.test(process.argv[1])) {
  bench().then((rows) => console.table(rows));
}
