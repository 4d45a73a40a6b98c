// Programme loudness, ITU-R BS.1770: K-weighting (a high shelf for the head, then a high-pass),
// mean square in 400 ms blocks overlapping by 75%, an absolute gate at -70 LKFS and a relative
// gate 10 LU under the ungated level. Used to show a track's loudness; the planned level itself is
// C-weighted SPL at the seat (calibration.ts).

/**
 * Analog parameters of the two K-weighting stages. From memory (the widely used derivation of the
 * published 48 kHz coefficients); the tests check they reproduce those coefficients.
 */
const SHELF = { f0: 1681.974450955533, gainDb: 3.999843853973347, q: 0.7071752369554196 };
const HIGHPASS = { f0: 38.13547087602444, q: 0.5003270373238773 };

/** The two K-weighting biquads at this rate, [b0, b1, b2, a1, a2] each (a0 = 1). */
export function kWeightingSections(sampleRate: number): [Float64Array, Float64Array] {
  let k = Math.tan((Math.PI * SHELF.f0) / sampleRate);
  const vh = 10 ** (SHELF.gainDb / 20);
  const vb = vh ** 0.4996667741545416;
  let a0 = 1 + k / SHELF.q + k * k;
  const shelf = Float64Array.of(
    (vh + (vb * k) / SHELF.q + k * k) / a0,
    (2 * (k * k - vh)) / a0,
    (vh - (vb * k) / SHELF.q + k * k) / a0,
    (2 * (k * k - 1)) / a0,
    (1 - k / SHELF.q + k * k) / a0,
  );
  k = Math.tan((Math.PI * HIGHPASS.f0) / sampleRate);
  a0 = 1 + k / HIGHPASS.q + k * k;
  const highpass = Float64Array.of(1, -2, 1, (2 * (k * k - 1)) / a0, (1 - k / HIGHPASS.q + k * k) / a0);
  return [shelf, highpass];
}

/** Channel weights: 1 for front channels; 1.41 for the surrounds of a 5.1 layout, whose LFE (index 3) is left out. */
function channelWeight(index: number, count: number): number {
  if (count === 6) return index === 3 ? 0 : index >= 4 ? 1.41 : 1;
  return 1;
}

/** Integrated loudness in LUFS (LKFS); -Infinity for silence or audio shorter than one 400 ms block. */
export function integratedLoudness(channels: ArrayLike<number>[], sampleRate: number): number {
  const n = channels[0]?.length ?? 0;
  const block = Math.round(0.4 * sampleRate);
  const hop = Math.round(0.1 * sampleRate);
  if (n < block) return -Infinity;
  const nHops = Math.floor(n / hop);
  // Mean square of the K-weighted signal per 100 ms hop, weighted and summed over channels.
  const hopPower = new Float64Array(nHops);
  const [s1, s2] = kWeightingSections(sampleRate);
  channels.forEach((x, c) => {
    const g = channelWeight(c, channels.length);
    if (g === 0) return;
    let z1 = 0,
      z2 = 0,
      w1 = 0,
      w2 = 0;
    for (let h = 0; h < nHops; h++) {
      let sum = 0;
      for (let k = h * hop; k < (h + 1) * hop; k++) {
        // Direct form II transposed, both stages.
        const v = x[k];
        const y1 = s1[0] * v + z1;
        z1 = s1[1] * v - s1[3] * y1 + z2;
        z2 = s1[2] * v - s1[4] * y1;
        const y2 = s2[0] * y1 + w1;
        w1 = s2[1] * y1 - s2[3] * y2 + w2;
        w2 = s2[2] * y1 - s2[4] * y2;
        sum += y2 * y2;
      }
      hopPower[h] += (g * sum) / hop;
    }
  });
  const perBlock = block / hop; // 4 hops make a 400 ms block
  const blocks: number[] = [];
  for (let h = 0; h + perBlock <= nHops; h++) {
    let p = 0;
    for (let j = 0; j < perBlock; j++) p += hopPower[h + j];
    blocks.push(p / perBlock);
  }
  const lufs = (p: number) => -0.691 + 10 * Math.log10(p);
  const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
  const absolute = blocks.filter((p) => lufs(p) > -70);
  if (absolute.length === 0) return -Infinity;
  const relativeGate = lufs(mean(absolute)) - 10;
  const gated = absolute.filter((p) => lufs(p) > relativeGate);
  return lufs(mean(gated));
}
