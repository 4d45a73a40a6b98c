// The listening bench's AudioWorklet processor: a thin shell over BenchCore. Loaded with
// `import url from './processor.worklet.ts?worker&url'`; no top-level export and no import.meta here,
// because the file is re-wrapped and loaded from a blob: URL.
import { BenchCore } from './bench-core.ts';
import { BENCH_PROCESSOR, parseToWorklet } from './protocol.ts';

const clock: () => number = (() => {
  const perf = (globalThis as { performance?: { now(): number } }).performance;
  return perf && typeof perf.now === 'function' ? () => perf.now() : () => Date.now();
})();

class PreheardBenchProcessor extends AudioWorkletProcessor {
  private readonly core = new BenchCore(sampleRate);

  constructor(options?: unknown) {
    super(options);
    this.port.onmessage = (e: MessageEvent) => {
      const r = parseToWorklet(e.data);
      if (r.ok) this.core.handle(r.msg);
      else this.port.postMessage({ type: 'error', message: r.error });
      this.flush();
    };
    this.port.postMessage({ type: 'ready', sampleRate, latencyFrames: 0 });
  }

  private flush(): void {
    const out = this.core.outbox;
    for (let i = 0; i < out.length; i++) this.port.postMessage(out[i]);
    out.length = 0;
  }

  process(_inputs: Float32Array[][], outputs: Float32Array[][]): boolean {
    const out = outputs[0];
    if (!out || out.length === 0) return true;
    const t0 = clock();
    this.core.process(out, out[0].length);
    this.core.noteLoad(clock() - t0, out[0].length);
    if (this.core.outbox.length) this.flush();
    return true;
  }
}

registerProcessor(BENCH_PROCESSOR, PreheardBenchProcessor);
