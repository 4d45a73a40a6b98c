// Types of build-wasm.mjs for the test that imports it.
export interface WasmModule {
  wat: string;
  ts: string;
  name: string;
  watPath: string;
  tsPath: string;
}
export declare const MODULES: WasmModule[];
export declare function assemble(module: WasmModule): Promise<Buffer>;
export declare function moduleSource(module: WasmModule, bytes: Buffer): string;
