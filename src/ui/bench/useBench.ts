// The bench screens' door to the audio controller: its state as preact state, and the store's valid
// designs passed on whenever they change (while any screen is shown, once the bench has started).
import { useEffect, useState } from 'preact/hooks';
import { benchAudio, type BenchAudio, type BenchState } from '../../audio/bench.ts';
import { validate } from '../engine.ts';
import type { AppState, Store } from '../store.ts';

let attached: Store | null = null;

function systemsOf(state: AppState) {
  const a = validate(state.designs.a),
    b = validate(state.designs.b);
  return { a: a.ok ? a.system : null, b: b.ok ? b.system : null };
}

function attach(bench: BenchAudio, store: Store): void {
  if (attached === store) return;
  attached = store;
  let last = store.get();
  bench.setSystems(systemsOf(last));
  const saved = last.settings.bench;
  if (saved) {
    bench.setMatch(saved.match);
    bench.setMode(saved.mode);
  }
  store.subscribe((s) => {
    if (s.designs !== last.designs) bench.setSystems(systemsOf(s));
    last = s;
  });
}

export function useBench(store: Store): { bench: BenchAudio; state: BenchState } {
  const bench = benchAudio();
  const [state, setState] = useState(bench.state);
  useEffect(() => {
    const off = bench.subscribe(setState);
    attach(bench, store);
    void bench.start();
    setState(bench.state);
    return () => void off();
  }, [bench, store]);
  return { bench, state };
}

/** Redraws at the display's frame rate while `on` (the playhead). */
export function useAnimationFrame(on: boolean, fn: () => void): void {
  useEffect(() => {
    if (!on) {
      fn();
      return;
    }
    let id = 0;
    const loop = () => {
      fn();
      id = requestAnimationFrame(loop);
    };
    id = requestAnimationFrame(loop);
    return () => cancelAnimationFrame(id);
  }, [on, fn]);
}
