// The engine's WebAssembly modules (hand-written .wat, assembled by scripts/build-wasm.mjs into
// base64 text in a TypeScript file beside each): compiled synchronously where they are first
// needed. Each stands in for TypeScript code that gives the same numbers bit for bit, so a host
// without WebAssembly's SIMD, or one that refuses to compile, runs that code instead.

function base64Bytes(text: string): Uint8Array<ArrayBuffer> {
  const digits = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
  const clean = text.replace(/=+$/, '');
  const out = new Uint8Array(Math.floor((clean.length * 3) / 4));
  let acc = 0,
    bits = 0,
    k = 0;
  for (const ch of clean) {
    acc = (acc << 6) | digits.indexOf(ch);
    bits += 6;
    if (bits >= 8) {
      bits -= 8;
      out[k++] = (acc >> bits) & 0xff;
    }
  }
  return out;
}

/** The module's instance with its exports, or null where it cannot run here. */
export function instantiateModule(base64: string): WebAssembly.Exports | null {
  try {
    if (typeof WebAssembly !== 'object') return null;
    const bytes = base64Bytes(base64);
    if (!WebAssembly.validate(bytes)) return null;
    return new WebAssembly.Instance(new WebAssembly.Module(bytes)).exports;
  } catch {
    // A host that refuses to compile here (a page's main thread limits synchronous compiles, a
    // Content-Security-Policy without 'wasm-unsafe-eval'): the TypeScript path.
    return null;
  }
}

/** A module's `run` export and its memory seen as doubles. */
export interface WasmLoop<Run> {
  run: Run;
  mem: Float64Array;
}

/**
 * The module's loop, compiled on the first call in each thread (and kept), or null where it cannot
 * run here: the caller then takes the TypeScript path.
 */
export function loopOnce<Run>(base64: string): () => WasmLoop<Run> | null {
  let loop: WasmLoop<Run> | null | undefined;
  return () => {
    if (loop !== undefined) return loop;
    const exports = instantiateModule(base64);
    loop = exports ? { run: exports.run as Run, mem: new Float64Array((exports.memory as WebAssembly.Memory).buffer) } : null;
    return loop;
  };
}
