// Audio channels that worker threads read without a copy: each channel a Float32Array over a whole
// SharedArrayBuffer of its own, so a worker rebuilds it with `new Float32Array(sab)`.

/** `count` channels of `frames` zeros; over SharedArrayBuffers when `shared`. */
export function newChannels(count: number, frames: number, shared = false): Float32Array[] {
  return Array.from({ length: count }, () => (shared ? new Float32Array(new SharedArrayBuffer(4 * frames)) : new Float32Array(frames)));
}

/** The channels as SharedArrayBuffers for workers: a channel already spanning one is handed on as it is, any other is copied. */
export function sharedBuffers(channels: Float32Array[]): SharedArrayBuffer[] {
  return channels.map((ch) => {
    if (ch.buffer instanceof SharedArrayBuffer && ch.byteOffset === 0 && ch.byteLength === ch.buffer.byteLength) return ch.buffer;
    const sab = new SharedArrayBuffer(ch.byteLength);
    new Float32Array(sab).set(ch);
    return sab;
  });
}
