// Types of build-wasm.mjs for the tests that import it.
export declare const WAT_PATH: string;
export declare const WASM_TS_PATH: string;
export declare function assembleWooferPair(): Promise<Buffer>;
export declare function wasmModuleSource(bytes: Buffer): string;
