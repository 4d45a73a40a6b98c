// Track checks of the listening bench: clear messages for files that cannot be used, and the
// overview envelope (min and max of each bin over all channels).
import { describe, expect, it } from 'vitest';
import { decodedProblem, fileProblem, MAX_FILE_BYTES, MAX_TRACK_S, overviewOf, wavTruncation } from '../src/audio/track.ts';

describe('files the bench refuses', () => {
  it('says an empty or oversized file is empty or too big, by name and size', () => {
    expect(fileProblem({ name: 'a.wav', size: 0 })).toBe('“a.wav” is empty (0 bytes): there is no audio in it.');
    // The two sizes never read the same ("1024 MB, more than the 1024 MB" was the old wording).
    expect(fileProblem({ name: 'big.flac', size: MAX_FILE_BYTES + 1 })).toMatch(
      /^“big\.flac” is 1,073,741,825 bytes, more than the 1,073,741,824 bytes the bench opens/,
    );
    expect(fileProblem({ name: 'big.flac', size: MAX_FILE_BYTES + 3 * 2 ** 20 })).toMatch(/is 1027 MB, more than the 1024 MB/);
    expect(fileProblem({ name: 'big.flac', size: MAX_FILE_BYTES + 2 ** 18 })).toMatch(/is 1024.3 MB, more than the 1024.0 MB/);
    expect(fileProblem({ name: 'ok.mp3', size: 5e6 })).toBeNull();
  });

  it('says a decoded track is too long, empty or silent; accepts one with sound', () => {
    expect(decodedProblem('long.wav', MAX_TRACK_S + 60, [])).toBe(
      '“long.wav” is 21.0 minutes long; the bench takes up to 20 minutes. Cut the part you want to hear.',
    );
    expect(decodedProblem('e.wav', 0, [new Float32Array(0)])).toBe('“e.wav” decodes to no audio at all (0 samples).');
    expect(decodedProblem('s.wav', 1, [new Float32Array(100)])).toMatch(/silent from start to end/);
    const x = new Float32Array(100);
    x[99] = 1e-4;
    expect(decodedProblem('x.wav', 1, [new Float32Array(100), x])).toBeNull();
  });
});

describe('overview', () => {
  it('keeps the extremes of every bin across channels', () => {
    const l = new Float32Array([0, 0.5, 0, 0, -0.25, 0, 0, 0]);
    const r = new Float32Array([0, 0, -0.75, 0, 0, 0, 0, 0.9]);
    const o = overviewOf([l, r], 4);
    expect([...o.max]).toEqual([0.5, 0, 0, 0.8999999761581421]);
    expect([...o.min]).toEqual([0, -0.75, -0.25, 0]);
  });
});

describe('a WAV file that ends early', () => {
  /** A 16-bit stereo 48 kHz WAV header announcing `statedBytes` of data, followed by `presentBytes` of zeros. */
  function wav(statedBytes: number, presentBytes: number): ArrayBuffer {
    const b = new ArrayBuffer(44 + presentBytes);
    const v = new DataView(b);
    const put = (at: number, s: string) => {
      for (let k = 0; k < 4; k++) v.setUint8(at + k, s.charCodeAt(k));
    };
    put(0, 'RIFF');
    v.setUint32(4, 36 + statedBytes, true);
    put(8, 'WAVE');
    put(12, 'fmt ');
    v.setUint32(16, 16, true);
    v.setUint16(20, 1, true);
    v.setUint16(22, 2, true);
    v.setUint32(24, 48000, true);
    v.setUint32(28, 192000, true);
    v.setUint16(32, 4, true);
    v.setUint16(34, 16, true);
    put(36, 'data');
    v.setUint32(40, statedBytes, true);
    return b;
  }

  it('says how long the header announces and how much is in the file', () => {
    expect(wavTruncation(wav(384000, 192000))).toEqual({ statedS: 2, presentS: 1 });
  });

  it('is quiet for whole files, streaming headers and other formats', () => {
    expect(wavTruncation(wav(192000, 192000))).toBeNull();
    expect(wavTruncation(wav(0xffffffff, 192000))).toBeNull();
    expect(wavTruncation(wav(0, 192000))).toBeNull();
    expect(wavTruncation(new TextEncoder().encode('ID3 not a wave file at all').buffer as ArrayBuffer)).toBeNull();
  });
});
