// Checks and summaries of a track for the listening bench: pure functions over plain arrays.

/** Largest file the bench opens, bytes. */
export const MAX_FILE_BYTES = 1024 * 1024 * 1024;
/** Longest decoded track, s: three copies of it live in memory (page, worklet, worker). */
export const MAX_TRACK_S = 20 * 60;
/** Points of the waveform overview. */
export const OVERVIEW_BINS = 2400;

/** The mixed-down min/max envelope of a track, for the overview. */
export function overviewOf(channels: Float32Array[], bins = OVERVIEW_BINS): { min: Float32Array; max: Float32Array } {
  const n = channels[0].length;
  const nb = Math.max(1, Math.min(bins, n));
  const min = new Float32Array(nb),
    max = new Float32Array(nb);
  for (let b = 0; b < nb; b++) {
    const s = Math.floor((b * n) / nb),
      e = Math.max(s + 1, Math.floor(((b + 1) * n) / nb));
    let lo = 0,
      hi = 0;
    for (const ch of channels) {
      for (let j = s; j < e; j++) {
        const v = ch[j];
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
    }
    min[b] = lo;
    max[b] = hi;
  }
  return { min, max };
}

/** A size in MB with as many decimals as it takes to differ from `other` (then in bytes). */
export function sizeWords(bytes: number, other: number): string {
  for (let digits = 0; digits <= 2; digits++) {
    const a = (bytes / 2 ** 20).toFixed(digits);
    if (a !== (other / 2 ** 20).toFixed(digits)) return `${a} MB`;
  }
  return `${bytes.toLocaleString('en')} bytes`;
}

/** Checks a file before decoding; returns the message for the user, or null when it may be tried. */
export function fileProblem(file: { name: string; size: number }): string | null {
  if (file.size === 0) return `“${file.name}” is empty (0 bytes): there is no audio in it.`;
  if (file.size > MAX_FILE_BYTES)
    return `“${file.name}” is ${sizeWords(file.size, MAX_FILE_BYTES)}, more than the ${sizeWords(MAX_FILE_BYTES, file.size)} the bench opens. Shorten it or convert it to a compressed format.`;
  return null;
}

/** Checks what decoding gave; returns the message for the user, or null when it can be used. */
export function decodedProblem(name: string, durationS: number, channels: Float32Array[]): string | null {
  if (durationS > MAX_TRACK_S)
    return `“${name}” is ${(durationS / 60).toFixed(1)} minutes long; the bench takes up to ${MAX_TRACK_S / 60} minutes. Cut the part you want to hear.`;
  if (channels.length === 0 || channels[0].length === 0) return `“${name}” decodes to no audio at all (0 samples).`;
  for (const ch of channels) for (let j = 0; j < ch.length; j++) if (ch[j] !== 0) return null;
  return `“${name}” is silent from start to end: there is nothing to hear or to set a level from.`;
}

/**
 * A WAV file that ends before its data chunk says (a cut-off download or copy): how long the
 * header says the audio is and how much of it is in the file, s. Null for other files, complete WAV
 * files and streaming headers (a data size of 0 or 0xFFFFFFFF, written before the length was known).
 */
export function wavTruncation(bytes: ArrayBuffer): { statedS: number; presentS: number } | null {
  const v = new DataView(bytes);
  const tag = (at: number) => String.fromCharCode(v.getUint8(at), v.getUint8(at + 1), v.getUint8(at + 2), v.getUint8(at + 3));
  if (bytes.byteLength < 12 || tag(0) !== 'RIFF' || tag(8) !== 'WAVE') return null;
  let byteRate = 0;
  for (let at = 12; at + 8 <= bytes.byteLength; ) {
    const id = tag(at),
      size = v.getUint32(at + 4, true);
    if (id === 'fmt ' && at + 16 <= bytes.byteLength) byteRate = v.getUint32(at + 16, true);
    if (id === 'data') {
      const present = bytes.byteLength - (at + 8);
      if (size === 0 || size === 0xffffffff || size <= present || !(byteRate > 0)) return null;
      return { statedS: size / byteRate, presentS: present / byteRate };
    }
    at += 8 + size + (size % 2);
  }
  return null;
}
