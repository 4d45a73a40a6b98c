// Small hooks the trial, probe, sheet and presentation screens share: the valid designs, the bench's
// and the probe's observable state, and the verdict built only from what was computed.
import { useEffect, useMemo, useState } from 'preact/hooks';
import { benchAudio, type BenchState } from '../../audio/bench.ts';
import { verdict, type VerdictLine } from '../../engine/verdict/verdict.ts';
import type { SpeakerSystem } from '../../engine/system.ts';
import { useApp } from '../context.ts';
import type { Slot } from '../store.ts';
import { headroomProbe, type ProbeState } from './probe.ts';

/** The systems being analysed (a design with errors keeps its last valid version, as the curves do). */
export function useSystems(): Record<Slot, SpeakerSystem | null> {
  const { derived } = useApp();
  const a = derived.a.system;
  const b = derived.b.system;
  return useMemo(() => ({ a, b }), [a, b]);
}

export function useBench(): BenchState {
  const bench = benchAudio();
  const [s, setS] = useState(bench.state);
  useEffect(() => bench.subscribe(setS), [bench]);
  return s;
}

export function useProbe(): ProbeState {
  const probe = headroomProbe();
  const [s, setS] = useState(probe.state);
  useEffect(() => probe.subscribe(setS), [probe]);
  // Findings kept from the last visit come back when they belong to these designs and the track.
  const systems = useSystems();
  useEffect(() => void probe.restore(systems), [probe, systems]);
  return s;
}

export interface VerdictView {
  lines: VerdictLine[];
  /** The headroom sentence is there: the probe ran on these designs and this track. */
  withHeadroom: boolean;
  /** The track the headroom was measured on. */
  trackName: string | null;
}

/** The verdict sentences (names as given), with the headroom only when it was measured for these designs. */
export function useVerdict(names: [string, string] = ['A', 'B']): VerdictView | null {
  const { derived } = useApp();
  const probe = useProbe();
  useBench(); // a new track on the bench makes earlier headroom findings stale
  const systems = useSystems();
  const a = derived.a.analysis;
  const b = derived.b.analysis;
  if (!a || !b) return null;
  const found = headroomProbe().findings(systems);
  const lines = verdict(a, b, names, found);
  return { lines, withHeadroom: !!found && lines.some((l) => l.id === 'headroom'), trackName: found ? (probe.track?.name ?? null) : null };
}
