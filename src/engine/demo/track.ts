// The built-in demo track: our own music, synthesised so the bench works with no file at all.
// Kick drum, bass line, pad and hats at 120 BPM in E minor; eight quiet bars, then eight loud ones
// with a deeper kick, so a design's low-frequency limits show up in the second half.

export interface DemoTrack {
  sampleRate: number;
  channels: [Float32Array, Float32Array];
  /** Where the loud section begins, s. */
  loudFromS: number;
  durationS: number;
}

const BPM = 120;
const BEAT_S = 60 / BPM;
const BAR_S = 4 * BEAT_S;
const QUIET_BARS = 8;
const LOUD_BARS = 8;
/** Quiet section level relative to the loud one (linear): -14 dB. */
const QUIET_GAIN = 10 ** (-14 / 20);
/** Peak level of the whole track: -1 dBFS. */
const PEAK = 10 ** (-1 / 20);

// Bass line, one note per half beat over two bars (MIDI numbers; E1 = 28).
const BASS = [28, 28, 40, 28, 31, 31, 43, 31, 33, 33, 45, 33, 35, 35, 47, 38];
// Pad chords per bar: Em, C, G, D (MIDI).
const PAD = [
  [52, 55, 59, 64],
  [48, 52, 55, 60],
  [55, 59, 62, 67],
  [50, 54, 57, 62],
];

const midiHz = (n: number) => 440 * 2 ** ((n - 69) / 12);

/** A small deterministic PRNG (mulberry32) for the hats, so every render of the demo is identical. */
function noise(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296 - 0.5;
  };
}

export function synthesizeDemoTrack(sampleRate: number): DemoTrack {
  const durationS = (QUIET_BARS + LOUD_BARS) * BAR_S;
  const n = Math.round(durationS * sampleRate);
  const left = new Float32Array(n);
  const right = new Float32Array(n);
  const mix = new Float64Array(2 * n);
  const loudFrom = QUIET_BARS * BAR_S;
  const rand = noise(0x5eed);

  // Kick on every beat: a sine sweeping down to its body pitch with a fast decay.
  for (let beat = 0; beat < (QUIET_BARS + LOUD_BARS) * 4; beat++) {
    const t0 = beat * BEAT_S;
    const loud = t0 >= loudFrom;
    const body = loud ? 42 : 55;
    const gain = (loud ? 1 : QUIET_GAIN) * 0.9;
    const len = Math.round(0.45 * sampleRate);
    const start = Math.round(t0 * sampleRate);
    let phase = 0;
    for (let k = 0; k < len && start + k < n; k++) {
      const t = k / sampleRate;
      const f = body + 110 * Math.exp(-t / 0.03);
      phase += (2 * Math.PI * f) / sampleRate;
      const v = gain * Math.sin(phase) * Math.exp(-t / (loud ? 0.18 : 0.12));
      mix[2 * (start + k)] += v;
      mix[2 * (start + k) + 1] += v;
    }
  }

  // Bass: a few harmonics (a soft saw) per half-beat note with a short release.
  const noteS = BEAT_S / 2;
  const totalNotes = Math.floor(durationS / noteS);
  for (let i = 0; i < totalNotes; i++) {
    const t0 = i * noteS;
    const loud = t0 >= loudFrom;
    const f = midiHz(BASS[i % BASS.length]);
    const gain = (loud ? 1 : QUIET_GAIN) * 0.45;
    const start = Math.round(t0 * sampleRate);
    const len = Math.round(noteS * sampleRate);
    for (let k = 0; k < len && start + k < n; k++) {
      const t = k / sampleRate;
      const env = Math.min(1, t / 0.005) * Math.min(1, (noteS - t) / 0.02);
      let v = 0;
      for (let h = 1; h <= 5; h++) v += Math.sin(2 * Math.PI * f * h * t) / (h * h);
      mix[2 * (start + k)] += gain * env * v;
      mix[2 * (start + k) + 1] += gain * env * v;
    }
  }

  // Pad: detuned sines, left and right slightly apart, a slow swell each bar.
  for (let bar = 0; bar < QUIET_BARS + LOUD_BARS; bar++) {
    const t0 = bar * BAR_S;
    const loud = t0 >= loudFrom;
    const chord = PAD[bar % PAD.length];
    const gain = (loud ? 1 : QUIET_GAIN) * 0.06;
    const start = Math.round(t0 * sampleRate);
    const len = Math.round(BAR_S * sampleRate);
    for (let k = 0; k < len && start + k < n; k++) {
      const t = k / sampleRate;
      const env = Math.sin((Math.PI * t) / BAR_S) ** 2;
      let l = 0;
      let r = 0;
      for (const note of chord) {
        const f = midiHz(note);
        l += Math.sin(2 * Math.PI * f * 0.998 * (t0 + t));
        r += Math.sin(2 * Math.PI * f * 1.002 * (t0 + t));
      }
      mix[2 * (start + k)] += gain * env * l;
      mix[2 * (start + k) + 1] += gain * env * r;
    }
  }

  // Hats on the off-beats: first-difference noise (a gentle high-pass), short decay.
  for (let beat = 0; beat < (QUIET_BARS + LOUD_BARS) * 4; beat++) {
    const t0 = (beat + 0.5) * BEAT_S;
    const gain = (t0 >= loudFrom ? 1 : QUIET_GAIN) * 0.12;
    const start = Math.round(t0 * sampleRate);
    const len = Math.round(0.06 * sampleRate);
    let prev = 0;
    for (let k = 0; k < len && start + k < n; k++) {
      const x = rand();
      const v = gain * (x - prev) * Math.exp(-k / sampleRate / 0.015);
      prev = x;
      mix[2 * (start + k)] += v * 0.8;
      mix[2 * (start + k) + 1] += v;
    }
  }

  let peak = 0;
  for (let k = 0; k < mix.length; k++) peak = Math.max(peak, Math.abs(mix[k]));
  const g = peak > 0 ? PEAK / peak : 0;
  for (let k = 0; k < n; k++) {
    left[k] = mix[2 * k] * g;
    right[k] = mix[2 * k + 1] * g;
  }
  return { sampleRate, channels: [left, right], loudFromS: loudFrom, durationS };
}
