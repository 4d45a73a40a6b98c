// The sample rate a file stores its audio at. The browser decodes every file to the audio
// context's rate, so the bench shows both: a 22.05 kHz MP3 is not a 48 kHz track. WAV from its
// fmt chunk (RIFF/WAVE: Microsoft/IBM Multimedia Programming Interface 1.0, 1991); MP3, AAC, FLAC
// and Ogg from their first frame header, read by codec-parser (npm).
import CodecParser from 'codec-parser';

/** Bytes read for a compressed file's first frames (past an ID3 tag with cover art). */
const SNIFF_BYTES = 1 << 20;

type Mime = 'audio/mpeg' | 'audio/aac' | 'audio/flac' | 'application/ogg';

function tag(b: Uint8Array, at: number): string {
  return String.fromCharCode(b[at], b[at + 1], b[at + 2], b[at + 3]);
}

function wavRate(b: Uint8Array): number | null {
  const v = new DataView(b.buffer, b.byteOffset, b.byteLength);
  for (let at = 12; at + 16 <= b.length; ) {
    const size = v.getUint32(at + 4, true);
    if (tag(b, at) === 'fmt ') return at + 16 <= b.length ? v.getUint32(at + 12, true) : null;
    at += 8 + size + (size % 2);
  }
  return null;
}

/** The container by its first bytes (an ID3 tag is followed by MPEG audio). */
function mimeOf(b: Uint8Array): Mime | null {
  if (b.length < 4) return null;
  const t = tag(b, 0);
  if (t === 'fLaC') return 'audio/flac';
  if (t === 'OggS') return 'application/ogg';
  if (t.startsWith('ID3')) return 'audio/mpeg';
  // Frame sync: eleven set bits; layer bits 00 mark ADTS (AAC), anything else MPEG audio.
  if (b[0] === 0xff && (b[1] & 0xe0) === 0xe0) return (b[1] & 0x06) === 0 ? 'audio/aac' : 'audio/mpeg';
  return null;
}

/** The file's own sample rate in Hz, or null when its format is not one of these or its header cannot be read. */
export function fileSampleRate(bytes: ArrayBuffer | Uint8Array): number | null {
  const all = bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes);
  if (all.length >= 12 && tag(all, 0) === 'RIFF' && tag(all, 8) === 'WAVE') {
    const r = wavRate(all);
    return r && r >= 1000 && r <= 1_000_000 ? r : null;
  }
  const mime = mimeOf(all);
  if (!mime) return null;
  try {
    const parser = new CodecParser(mime, { enableLogging: false });
    type Header = { header?: { sampleRate?: number } };
    // An Ogg page holds its codec's frames (the first pages none); the others are frames themselves.
    for (const item of parser.parseAll(all.subarray(0, SNIFF_BYTES)) as (Header & { codecFrames?: Header[] })[]) {
      for (const frame of [item, ...(item.codecFrames ?? [])]) {
        const rate = frame.header?.sampleRate;
        if (rate && rate > 0) return rate;
      }
    }
  } catch {
    // A damaged header: the rate is simply not shown.
  }
  return null;
}
