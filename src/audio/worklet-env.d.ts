// The AudioWorkletGlobalScope names the DOM typings lack (the processor file uses them).
declare class AudioWorkletProcessor {
  readonly port: MessagePort;
  constructor(options?: unknown);
}
declare function registerProcessor(name: string, ctor: new (options?: unknown) => AudioWorkletProcessor): void;
/** The rendering context's sample rate, a global of the worklet scope. */
declare const sampleRate: number;
