// True-peak guard: a look-ahead limiter on the estimated true peak (4x oversampled, as in
// ITU-R BS.1770-4 Annex 2), linked across channels, so the rendered file never clips digitally and
// any action is reported. The gain follows the running minimum of the needed gain over the
// look-ahead, smoothed by a moving average of the same length: it reaches the needed value exactly
// at the peak and never steps.

import { besselI0 } from '../filters/kaiser.ts';
import { keepShape } from '../keep-shape.ts';

const PHASES = 4; // the peak estimate in processFrame runs phases 1 to 3 by hand
const TAPS = 12; // per phase
const HALF = TAPS / 2;

function interpolationTaps(): Float64Array {
  // Kaiser-windowed sinc (beta 6) for phases 1..3 of 4.
  const t = new Float64Array(PHASES * TAPS);
  const beta = 6,
    i0b = besselI0(beta);
  for (let ph = 0; ph < PHASES; ph++) {
    for (let k = 0; k < TAPS; k++) {
      const pos = k - (HALF - 1) - ph / PHASES; // sample offset from the interpolated point
      const sinc = pos === 0 ? 1 : Math.sin(Math.PI * pos) / (Math.PI * pos);
      const r = pos / (HALF + 0.5);
      const w = Math.abs(r) < 1 ? besselI0(beta * Math.sqrt(1 - r * r)) / i0b : 0;
      t[ph * TAPS + k] = sinc * w;
    }
  }
  return t;
}

const TAP_TABLE = interpolationTaps();

export class TruePeakGuard {
  readonly channels: number;
  readonly lookahead: number;
  /** Frames of delay from input to output. */
  readonly latency: number;
  readonly ceiling: number;
  private readonly release: number;
  // Audio history per channel (ring of length `len`, stored twice for contiguous windows).
  private readonly len: number;
  private readonly hist: Float64Array[];
  private pos = 0;
  // Running-minimum deque over needed gains (values and frame indices).
  private readonly dqVal: Float64Array;
  private readonly dqIdx: Float64Array;
  private dqHead = 0;
  private dqTail = 0;
  private readonly avg: Float64Array;
  private avgPos = 0;
  private avgSum: number;
  private rel = 1;
  private frame = 0;
  private loudCount = 0;
  private readonly loudRing: Uint8Array;
  /** Where the next frame's loudness goes in loudRing (frame index modulo TAPS). */
  private loudPos = 0;
  /** Smallest gain applied so far (1 = never acted). */
  minGain = 1;
  /** Frames during which the gain was below 1. */
  activeFrames = 0;

  constructor(channels: number, sampleRate: number, ceilingDb = -0.1, lookaheadMs = 1.5, releaseMs = 80) {
    this.channels = channels;
    this.ceiling = Math.pow(10, ceilingDb / 20);
    this.lookahead = Math.max(8, Math.round((lookaheadMs / 1000) * sampleRate));
    this.release = 1 - Math.exp(-1 / ((releaseMs / 1000) * sampleRate));
    this.latency = this.lookahead + HALF;
    this.len = this.latency + TAPS + 2;
    this.hist = [];
    for (let c = 0; c < channels; c++) this.hist.push(new Float64Array(2 * this.len));
    this.dqVal = new Float64Array(this.lookahead + 4);
    this.dqIdx = new Float64Array(this.lookahead + 4);
    this.avg = new Float64Array(this.lookahead).fill(1);
    this.avgSum = this.lookahead;
    this.loudRing = new Uint8Array(TAPS);
    keepShape(this);
  }

  reset(): void {
    for (const h of this.hist) h.fill(0);
    this.pos = 0;
    this.dqHead = this.dqTail = 0;
    this.avg.fill(1);
    this.avgSum = this.lookahead;
    this.avgPos = 0;
    this.rel = 1;
    this.frame = 0;
    this.loudCount = 0;
    this.loudRing.fill(0);
    this.loudPos = 0;
    this.minGain = 1;
    this.activeFrames = 0;
  }

  /**
   * Pushes one frame (frame[c] for each channel) and overwrites it with the guarded output of the
   * frame `latency` frames earlier.
   */
  processFrame(frame: Float64Array): void {
    const len = this.len;
    this.pos = this.pos === 0 ? len - 1 : this.pos - 1;
    const p = this.pos;
    let loud = 0;
    for (let c = 0; c < this.channels; c++) {
      const x = frame[c];
      const h = this.hist[c];
      h[p] = x;
      h[p + len] = x;
      if (x > 0.5 || x < -0.5) loud = 1;
    }
    const lr = this.loudPos;
    this.loudCount += loud - this.loudRing[lr];
    this.loudRing[lr] = loud;
    this.loudPos = lr + 1 === TAPS ? 0 : lr + 1;
    // Peak estimate of the frame HALF-1 back (window hist[p .. p+TAPS-1] holds the newest TAPS frames).
    let peak = 0;
    if (this.loudCount > 0) {
      for (let c = 0; c < this.channels; c++) {
        const h = this.hist[c];
        const s0 = h[p + HALF - 1];
        const a0 = s0 < 0 ? -s0 : s0;
        if (a0 > peak) peak = a0;
        // Phases 1 to 3 side by side: three sums that do not wait on each other (one after the
        // other, each tap waited for the last add; a loud frame took three times as long). Each is
        // still added tap by tap, newest (k = 0 -> offset -(HALF-1)) to oldest.
        let acc1 = 0,
          acc2 = 0,
          acc3 = 0;
        for (let k = 0; k < TAPS; k++) {
          const v = h[p + k];
          acc1 += TAP_TABLE[TAPS + k] * v;
          acc2 += TAP_TABLE[2 * TAPS + k] * v;
          acc3 += TAP_TABLE[3 * TAPS + k] * v;
        }
        const a1 = acc1 < 0 ? -acc1 : acc1,
          a2 = acc2 < 0 ? -acc2 : acc2,
          a3 = acc3 < 0 ? -acc3 : acc3;
        if (a1 > peak) peak = a1;
        if (a2 > peak) peak = a2;
        if (a3 > peak) peak = a3;
      }
    }
    const need = peak > this.ceiling ? this.ceiling / peak : 1;
    // Running minimum over the last lookahead+2 needs: covers both output frames around each peak.
    // The deque's indices step around a ring of `cap` entries (a compare, not a remainder: an
    // integer division per step was a large part of a loud frame's cost).
    const f = this.frame;
    const cap = this.dqVal.length;
    let tail = this.dqTail,
      head = this.dqHead;
    for (;;) {
      if (tail === head) break;
      const last = tail === 0 ? cap - 1 : tail - 1;
      if (this.dqVal[last] < need) break;
      tail = last;
    }
    this.dqVal[tail] = need;
    this.dqIdx[tail] = f;
    tail = tail + 1 === cap ? 0 : tail + 1;
    while (this.dqIdx[head] < f - this.lookahead - 1) head = head + 1 === cap ? 0 : head + 1;
    this.dqTail = tail;
    this.dqHead = head;
    const hmin = this.dqVal[this.dqHead];
    this.rel = hmin < this.rel ? hmin : this.rel + this.release * (hmin - this.rel);
    this.avgSum += this.rel - this.avg[this.avgPos];
    this.avg[this.avgPos] = this.rel;
    this.avgPos = this.avgPos + 1 === this.lookahead ? 0 : this.avgPos + 1;
    let g = this.avgSum / this.lookahead;
    if (g > 1) g = 1;
    if (g < this.minGain) this.minGain = g;
    if (g < 1 - 1e-12) this.activeFrames++;
    const d = p + this.latency;
    for (let c = 0; c < this.channels; c++) frame[c] = this.hist[c][d] * g;
    this.frame = f + 1;
  }

  private readonly frameBuf: Float64Array = new Float64Array(8);

  /**
   * A block: in[c][k]·scale are the input frames; out[c][offset + k] receive the guarded frames
   * (`latency` frames later).
   */
  processBlock(input: Float64Array[], n: number, scale: number, out: (Float32Array | Float64Array)[], offset: number): void {
    const nCh = this.channels;
    // Idle: nothing loud in the block, nothing loud in the look-ahead window, the gain fully
    // released. Then the guard is a plain delay, and its bookkeeping can be skipped.
    if (this.loudCount === 0 && this.rel >= 1 && this.avgSum >= this.lookahead - 1e-9) {
      let peak = 0;
      for (let c = 0; c < nCh; c++) {
        const x = input[c];
        for (let k = 0; k < n; k++) {
          const v = x[k] < 0 ? -x[k] : x[k];
          if (v > peak) peak = v;
        }
      }
      if (peak * scale <= 0.5) {
        this.delayBlock(input, n, scale, out, offset);
        return;
      }
    }
    const f = this.frameBuf;
    for (let k = 0; k < n; k++) {
      for (let c = 0; c < nCh; c++) f[c] = input[c][k] * scale;
      this.processFrame(f);
      for (let c = 0; c < nCh; c++) out[c][offset + k] = f[c];
    }
  }

  private delayBlock(input: Float64Array[], n: number, scale: number, out: (Float32Array | Float64Array)[], offset: number): void {
    const len = this.len,
      lat = this.latency;
    // Frame k leaves as frame k - lat came in: from the history for k < lat, else straight from the
    // input (the same product the history would hold). Only the last len frames are kept.
    const fromHistory = Math.min(n, lat),
      keepFrom = Math.max(0, n - len);
    const pos = this.pos;
    let p = pos;
    for (let c = 0; c < this.channels; c++) {
      const h = this.hist[c],
        x = input[c],
        o = out[c];
      p = pos;
      for (let k = 0; k < fromHistory; k++) {
        p = p === 0 ? len - 1 : p - 1;
        o[offset + k] = h[p + lat];
      }
      for (let k = lat; k < n; k++) o[offset + k] = x[k - lat] * scale;
      // The ring one step down per frame: before frame keepFrom it stood keepFrom steps below pos.
      p = (((pos - keepFrom) % len) + len) % len;
      for (let k = keepFrom; k < n; k++) {
        p = p === 0 ? len - 1 : p - 1;
        const v = x[k] * scale;
        h[p] = v;
        h[p + len] = v;
      }
    }
    this.pos = p;
    // The need of every skipped frame was 1: the deque holds one entry, the newest.
    const f = this.frame + n - 1;
    this.dqHead = 0;
    this.dqTail = 1;
    this.dqVal[0] = 1;
    this.dqIdx[0] = f;
    this.frame = f + 1;
    this.loudRing.fill(0);
    this.loudPos = this.frame % TAPS;
  }

  /** Largest gain reduction so far, dB (>= 0). */
  reductionDb(): number {
    return this.minGain < 1 ? -20 * Math.log10(this.minGain) : 0;
  }
}
