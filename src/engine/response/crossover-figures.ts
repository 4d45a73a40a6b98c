// The figures a crossover is judged by, from curves already computed: where each way's acoustic
// output (through its filter, at the seat) lies 6 dB under the sum's passband level, and how far
// the sum strays from flat over its passband.

export interface WayBand {
  name: string;
  /** The way's acoustic -6 dB points below and above its own peak, Hz; null where it does not fall 6 dB within the grid. */
  lowHz: number | null;
  highHz: number | null;
}

export interface CrossoverFigures {
  ways: WayBand[];
  /** The sum's largest deviation from its passband level, dB (signed: the larger magnitude), and where, over [fromHz, toHz]. */
  deviationDb: number;
  deviationHz: number;
  fromHz: number;
  toHz: number;
}

/** Frequency where a curve crosses `level` between grid points k and k + 1 (log-linear interpolation). */
function crossing(freqHz: Float64Array, splDb: Float64Array, k: number, level: number): number {
  const t = (level - splDb[k]) / (splDb[k + 1] - splDb[k]);
  return freqHz[k] * (freqHz[k + 1] / freqHz[k]) ** t;
}

export function crossoverFigures(
  freqHz: Float64Array,
  sumSplDb: Float64Array,
  ways: { name: string; splDb: Float64Array }[],
  passbandDb: number,
  fromHz: number,
): CrossoverFigures {
  const n = freqHz.length;
  const level = passbandDb - 6;
  const bands = ways.map((w) => {
    let peak = 0;
    for (let k = 1; k < n; k++) if (w.splDb[k] > w.splDb[peak]) peak = k;
    let lowHz: number | null = null,
      highHz: number | null = null;
    for (let k = peak - 1; k >= 0; k--) {
      if (w.splDb[k] < level && w.splDb[k + 1] >= level) {
        lowHz = crossing(freqHz, w.splDb, k, level);
        break;
      }
    }
    for (let k = peak; k < n - 1; k++) {
      if (w.splDb[k] >= level && w.splDb[k + 1] < level) {
        highHz = crossing(freqHz, w.splDb, k, level);
        break;
      }
    }
    return { name: w.name, lowHz, highHz };
  });
  const toHz = Math.min(freqHz[n - 1], 20000);
  let deviationDb = 0,
    deviationHz = fromHz;
  for (let k = 0; k < n; k++) {
    if (freqHz[k] < fromHz || freqHz[k] > toHz) continue;
    const d = sumSplDb[k] - passbandDb;
    if (Math.abs(d) > Math.abs(deviationDb)) [deviationDb, deviationHz] = [d, freqHz[k]];
  }
  return { ways: bands, deviationDb, deviationHz, fromHz, toHz };
}
