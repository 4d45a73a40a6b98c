// The Stress strip's density lanes: for each design, the share of each second of the track spent in
// each kind of stress event. At a high level the events overlap into one solid bar; the shares
// still tell a passage that overloads now and then from one that never stops.
import type { EventKind, StressEvent } from '../../engine/render/index.ts';
import type { DesignSlot } from '../../audio/protocol.ts';

export interface DensityLane {
  slot: DesignSlot;
  /** Width of one bin, s (1 s, wider only when the track has more bins than the lane can show). */
  binS: number;
  bins: number;
  /** Per kind present, the share 0..1 of each bin covered by that kind's events (all ways together). */
  share: Map<EventKind, Float32Array>;
}

/** Bin width for a track: one second, or whole seconds enough to keep at most `maxBins` bins. */
export function binWidth(durationS: number, maxBins: number): number {
  return Math.max(1, Math.ceil(durationS / Math.max(1, maxBins)));
}

/**
 * The covered share of each bin for one design's events: the events of a kind are merged first
 * (two ways in excursion at once count once), then each merged span adds its overlap with each bin.
 */
export function densityLane(slot: DesignSlot, events: readonly StressEvent[], durationS: number, binS: number): DensityLane {
  const bins = Math.max(1, Math.ceil(durationS / binS - 1e-9));
  const byKind = new Map<EventKind, [number, number][]>();
  for (const e of events) {
    const start = Math.max(0, e.start_s);
    const end = Math.min(durationS, e.end_s);
    if (!(end > start)) continue;
    const spans = byKind.get(e.kind);
    if (spans) spans.push([start, end]);
    else byKind.set(e.kind, [[start, end]]);
  }
  const share = new Map<EventKind, Float32Array>();
  for (const [kind, spans] of byKind) {
    spans.sort((x, y) => x[0] - y[0]);
    const out = new Float32Array(bins);
    let [s0, s1] = spans[0];
    const add = (a: number, b: number) => {
      for (let i = Math.floor(a / binS); i < bins && i * binS < b; i++) {
        const lo = Math.max(a, i * binS);
        const hi = Math.min(b, (i + 1) * binS, durationS);
        if (hi > lo) out[i] += (hi - lo) / Math.min(binS, durationS - i * binS);
      }
    };
    for (let k = 1; k < spans.length; k++) {
      const [a, b] = spans[k];
      if (a <= s1) s1 = Math.max(s1, b);
      else {
        add(s0, s1);
        [s0, s1] = [a, b];
      }
    }
    add(s0, s1);
    for (let i = 0; i < bins; i++) out[i] = Math.min(1, out[i]);
    share.set(kind, out);
  }
  return { slot, binS, bins, share };
}

/** The kinds' shares in one bin, largest first (for the hover text). */
export function sharesAt(lane: DensityLane, bin: number): { kind: EventKind; share: number }[] {
  const out: { kind: EventKind; share: number }[] = [];
  for (const [kind, s] of lane.share) if (bin >= 0 && bin < lane.bins && s[bin] > 0) out.push({ kind, share: s[bin] });
  return out.sort((x, y) => y.share - x.share);
}
