// The sample rate an audio file was stored at, read from its own header: decodeAudioData hands back
// the audio at the audio context's rate, so the file's rate (a 22.05 kHz MP3) is found here. WAV's
// format chunk is read directly; MP3, AAC (ADTS), FLAC and Ogg headers through codec-parser.
import CodecParser, { type MimeType } from 'codec-parser';

/** Bytes looked at: the headers sit at the start (after an ID3 tag, skipped first). */
const HEAD_BYTES = 1 << 16;

const tag = (b: Uint8Array, at: number) => String.fromCharCode(b[at], b[at + 1], b[at + 2], b[at + 3]);

/** A RIFF/WAVE file's rate from its "fmt " chunk, or null. */
function wavRate(b: Uint8Array): number | null {
  if (b.length < 12 || tag(b, 0) !== 'RIFF' || tag(b, 8) !== 'WAVE') return null;
  const v = new DataView(b.buffer, b.byteOffset, b.byteLength);
  for (let at = 12; at + 16 <= b.length; ) {
    const size = v.getUint32(at + 4, true);
    // fmt: format tag (2 bytes), channels (2), then the sample rate (4), little-endian.
    if (tag(b, at) === 'fmt ') return v.getUint32(at + 12, true) || null;
    at += 8 + size + (size % 2);
  }
  return null;
}

/** The size of an ID3v2 tag at the start (10-byte header, synchsafe size, optional footer), else 0. */
function id3Length(b: Uint8Array): number {
  if (b.length < 10 || b[0] !== 0x49 || b[1] !== 0x44 || b[2] !== 0x33) return 0;
  const size = ((b[6] & 0x7f) << 21) | ((b[7] & 0x7f) << 14) | ((b[8] & 0x7f) << 7) | (b[9] & 0x7f);
  return 10 + size + (b[5] & 0x10 ? 10 : 0);
}

function mimeOf(b: Uint8Array): MimeType | null {
  if (b.length < 4) return null;
  if (tag(b, 0) === 'fLaC') return 'audio/flac';
  if (tag(b, 0) === 'OggS') return 'audio/ogg';
  // A frame sync (11 set bits): layer bits 00 mark AAC in ADTS, any other MPEG audio.
  if (b[0] === 0xff && (b[1] & 0xe0) === 0xe0) return (b[1] & 0x06) === 0 ? 'audio/aac' : 'audio/mpeg';
  return null;
}

/**
 * The sample rate stored in a file's header, Hz, or null when the format is not one read here (MP4
 * and others) or the header cannot be read. Only the first 64 KiB are read (after an ID3 tag, which
 * cover art can make large).
 */
export async function fileSampleRate(file: Blob): Promise<number | null> {
  const read = async (from: number) => new Uint8Array(await file.slice(from, from + HEAD_BYTES).arrayBuffer());
  let head = await read(0);
  const wav = wavRate(head);
  if (wav !== null) return wav;
  const skip = id3Length(head);
  if (skip > 0) head = await read(skip);
  const mime = mimeOf(head);
  if (!mime) return null;
  let rate: number | null = null;
  try {
    const parser = new CodecParser(mime, {
      onCodecUpdate: (header) => {
        if (rate === null && header.sampleRate > 0) rate = header.sampleRate;
      },
    });
    const frames = parser.parseAll(head);
    if (rate === null) {
      const first = frames[0];
      const header = first && 'codecFrames' in first ? first.codecFrames[0]?.header : first?.header;
      if (header && header.sampleRate > 0) rate = header.sampleRate;
    }
  } catch {
    return null;
  }
  return rate;
}
