// @vitest-environment happy-dom
// Client sheet, Presentation mode, the print chart and the Headroom probe's page side, in a DOM.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen, within } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/fake-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store, stateOf } from '../src/ui/store.ts';
import { Autosave, memoryBackend, type SavedState } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { validate } from '../src/ui/engine.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { verdict } from '../src/engine/verdict/verdict.ts';
import { CAUTIONS } from '../src/ui/Cautions.tsx';
import { buildCharts } from '../src/ui/charts/specs.ts';
import { PrintChart, niceStep, yRange } from '../src/ui/sheet/PrintChart.tsx';
import { HeadroomProbe, type WorkerLike } from '../src/ui/sheet/probe.ts';
import { probeHeadroom, type HeadroomJob, type HeadroomReply } from '../src/audio/headroom.worker.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';

function mount(screenId: 'sheet' | 'present' | 'headroom', backend: ReturnType<typeof memoryBackend> = memoryBackend()) {
  const store = new Store(demoPair);
  store.dispatch({ type: 'settings', patch: { cautionsDismissed: true, screen: screenId } });
  const autosave = new Autosave(backend);
  autosave.attach(store);
  render(<App store={store} autosave={autosave} />);
  return { store, autosave, backend };
}

/** The engine's own verdict for the demo pair, computed here independently of the screens. */
function demoVerdict(): string[] {
  const d = demoPair();
  const sys = (x: unknown) => {
    const r = validate(x);
    if (!r.ok) throw new Error('demo invalid');
    return r.system;
  };
  return verdict(analyze(sys(d.a), {}), analyze(sys(d.b), {}), ['A', 'B']).map((l) => l.text);
}

afterEach(() => cleanup());

describe('Client sheet', () => {
  it('says so when a planned level is beyond the amplifier, with the shortfall the analysis found', () => {
    const { store } = mount('sheet');
    act(() => store.dispatch({ type: 'edit', slot: 'b', path: 'listening.level.spl_db', value: 110 }));
    const paper = screen.getByTestId('client-sheet');
    const note = within(paper).getByTestId('sheet-unreachable').textContent ?? '';
    expect(note).toMatch(/^Design B's planned level is beyond the amplifier: needs [\d.]+ V peaks, it gives 40\.0 V \([\d.]+ dB short\)/);
    expect(note).not.toMatch(/Design A/);
    expect(within(paper).getByTestId('sheet-params').textContent).toMatch(
      /110 dB\(C\) long-term average at the seat — beyond the amplifier/,
    );
  });

  it('shows only the verdict the engine computed, says headroom was not measured, and carries every caution and the date', () => {
    mount('sheet');
    const paper = screen.getByTestId('client-sheet');
    const lines = [...within(paper).getByTestId('sheet-verdict').querySelectorAll('li')].map((li) => li.textContent);
    expect(lines).toEqual(demoVerdict());
    expect(lines.some((l) => /louder cleanly/.test(l ?? ''))).toBe(false);
    expect(paper.textContent).toMatch(/Headroom on a music track was not measured/);
    for (const c of CAUTIONS) expect(paper.textContent).toContain(c.text);
    expect(screen.getByTestId('paper-date').textContent).toContain(String(new Date().getFullYear()));
    // Key parameters from the demo design files: 14 l sealed, 20 l vented tuned to 40 Hz.
    const params = within(paper).getByTestId('sheet-params');
    expect(params.textContent).toMatch(/Sealed, 14\.0 l net/);
    expect(params.textContent).toMatch(/Vented, 20\.0 l net/);
    // Every way of both designs is listed: each demo design is a woofer and the flat upper band.
    expect(within(params).getByTestId('sheet-way-0').textContent).toMatch(/woofer: Kestrel 165.*woofer: Kestrel 165/);
    expect(within(params).getByTestId('sheet-way-1').textContent).toMatch(/upper band.*upper band/);
    expect(params.textContent).toMatch(/low-pass LR 24 dB at 2200 Hz/);
    expect(params.textContent).toMatch(/an ideal flat band/);
    expect(params.textContent).toMatch(/40\.0 Hz/);
    // Four curves, drawn as SVG with real text for print.
    expect(paper.querySelectorAll('svg.print-chart').length).toBe(4);
  });

  it('keeps the title and notes in the store, autosaved and restored', async () => {
    const { store, autosave, backend } = mount('sheet');
    // Autosave writes only after the stored state was read (here: nothing stored yet).
    await act(async () => {
      await autosave.load();
    });
    await act(() => {
      fireEvent.input(screen.getByTestId('sheet-title'), { target: { value: 'Two boxes for the Okafor shelf' } });
      fireEvent.input(screen.getByTestId('sheet-notes'), { target: { value: 'Port at the front.\nSecond line.' } });
    });
    expect(screen.getByTestId('paper-title').textContent).toBe('Two boxes for the Okafor shelf');
    expect(screen.getByTestId('paper-notes').textContent).toBe('Port at the front.\nSecond line.');
    await autosave.flush();
    const saved = backend.value as SavedState;
    expect(saved.state.settings.sheetTitle).toBe('Two boxes for the Okafor shelf');
    cleanup();
    // A fresh page restores the saved state.
    const store2 = new Store(demoPair);
    store2.dispatch({ type: 'restore', state: stateOf(saved.state.project, saved.state.settings) });
    render(<App store={store2} autosave={new Autosave(memoryBackend())} />);
    expect((screen.getByTestId('sheet-title') as HTMLInputElement).value).toBe('Two boxes for the Okafor shelf');
    expect(store.get().settings.sheetNotes).toBe('Port at the front.\nSecond line.');
  });

  it('falls back to a plain title when none is given', () => {
    mount('sheet');
    expect(screen.getByTestId('paper-title').textContent).toBe('Loudspeaker design comparison');
  });
});

describe('print chart', () => {
  const d = demoPair();
  const an = (x: unknown) => {
    const r = validate(x);
    if (!r.ok) throw new Error('demo invalid');
    return { analysis: analyze(r.system, {}), system: r.system };
  };
  const charts = buildCharts({ a: an(d.a), b: an(d.b) });
  const spl = charts.find((c) => c.id === 'spl')!;

  it('steps the y axis by 1, 2, 2.5 or 5 times a power of ten (common practice, no source)', () => {
    expect(niceStep(47)).toBe(10);
    expect(niceStep(12)).toBe(2.5);
    expect(niceStep(0.9)).toBe(0.2);
    const [lo, hi] = yRange(spl);
    const step = niceStep(hi - lo);
    expect(Number.isInteger(lo / step) && Number.isInteger(hi / step)).toBe(true);
    // The SPL chart shows about the top 50 dB (rounded out to whole steps): the passband sits inside.
    let top = -Infinity;
    for (const s of spl.series) if (s.values) for (let i = 0; i < s.values.length; i++) top = Math.max(top, s.values[i]);
    expect(hi).toBeGreaterThan(top);
    expect(lo).toBeGreaterThanOrEqual(top - 50 - step);
    expect(lo).toBeLessThanOrEqual(top - 50);
  });

  it('places frequencies on a log axis: 100 Hz sits where log10(100/f0)/log10(f1/f0) says', () => {
    const { container } = render(<PrintChart spec={spl} width={340} height={200} />);
    const svg = container.querySelector('svg')!;
    const label = [...svg.querySelectorAll('text')].find((t) => t.textContent === '100')!;
    const f0 = spl.freqHz[0];
    const f1 = spl.freqHz[spl.freqHz.length - 1];
    const plotW = 340 - 40 - 8;
    expect(Number(label.getAttribute('x'))).toBeCloseTo(40 + (plotW * Math.log10(100 / f0)) / Math.log10(f1 / f0), 6);
    // One line per series with values: A, B and the ideal reference.
    const paths = svg.querySelectorAll('g[clip-path] path');
    expect(paths.length).toBe(spl.series.filter((s) => s.values).length);
    expect(paths[0].getAttribute('d')!.split(/[ML]/).filter(Boolean).length).toBe(spl.freqHz.length);
  });
});

describe('Presentation mode', () => {
  it('offers only A, B and the reference, with the level and the verdict; Esc leads back to the Client sheet', async () => {
    const { store } = mount('present');
    const pres = screen.getByTestId('presentation');
    expect([...pres.querySelectorAll('.present-lane-label')].map((e) => e.textContent)).toEqual(['A', 'B', 'Reference']);
    expect(screen.getByTestId('present-level').textContent).toMatch(/A 85 dB at the seat · B 85 dB at the seat/);
    expect([...screen.getByTestId('present-verdict').querySelectorAll('li')].map((li) => li.textContent)).toEqual(demoVerdict());
    await act(() => {
      fireEvent.keyDown(window, { key: 'Escape' });
    });
    expect(store.get().settings.screen).toBe('sheet');
    expect(screen.queryByTestId('presentation')).toBeNull();
  });
});

describe('Headroom probe, page side', () => {
  /** A stand-in for the Worker that runs the worker's own code on the message it is sent. */
  function fakeWorkers() {
    const made: { w: WorkerLike; terminated: boolean; job?: HeadroomJob }[] = [];
    const factory = (): WorkerLike => {
      const rec = { w: null as unknown as WorkerLike, terminated: false, job: undefined as HeadroomJob | undefined };
      rec.w = {
        onmessage: null,
        onerror: null,
        terminate: () => {
          rec.terminated = true;
        },
        postMessage: (m: HeadroomJob) => {
          rec.job = m;
          setTimeout(() => {
            const send = (r: HeadroomReply) => !rec.terminated && rec.w.onmessage?.({ data: r } as MessageEvent<HeadroomReply>);
            const result = probeHeadroom(m.system, m.channels, m.sampleRate, (passes, estimate) =>
              send({ type: 'progress', id: m.id, passes, estimate }),
            );
            send({ type: 'result', id: m.id, result });
          }, 0);
        },
      };
      made.push(rec);
      return rec.w;
    };
    return { made, factory };
  }
  const systems = () => {
    const d = demoPair();
    const s = (x: unknown) => {
      const r = validate(x);
      if (!r.ok) throw new Error('demo invalid');
      return r.system;
    };
    return { a: s(d.a), b: s(d.b) } as Record<'a' | 'b', SpeakerSystem>;
  };
  // 1 s of a loud 40 Hz tone after 0.5 s of near silence, 8 kHz is plenty for these bass limits.
  const SR = 8000;
  const tone = new Float32Array(SR * 1.5).map((_, k) => (k < SR / 2 ? 0.001 : 0.9) * Math.sin((2 * Math.PI * 40 * k) / SR));
  const track = { name: 'tone', source: 'file' as const, channels: [tone], sampleRate: SR, durationS: 1.5, key: {} };

  it('runs one worker per design, reports progress, keeps the results, and gives them to the verdict only for the same designs and track', async () => {
    const { made, factory } = fakeWorkers();
    const probe = new HeadroomProbe(factory);
    const seen: number[] = [];
    probe.subscribe(() => seen.push(probe.progress()));
    const sys = systems();
    probe.start(sys, track);
    expect(made.length).toBe(2);
    expect(probe.state.status).toBe('running');
    await vi.waitFor(() => expect(probe.state.status).toBe('done'), { timeout: 20_000 });
    for (const s of ['a', 'b'] as const) expect(probe.state.slots[s].result).toEqual(probeHeadroom(sys[s], [tone], SR));
    expect(made.every((m) => m.terminated)).toBe(true);
    // Progress rises and ends at 1.
    expect(seen.some((p) => p > 0 && p < 1)).toBe(true);
    expect(probe.progress()).toBe(1);
    const f = probe.findings(sys, track.key)!;
    expect(f[1]!.cleanSplDb).toBe(probe.state.slots.b.result!.clean_spl_db);
    expect(probe.findings(sys, {})).toBeUndefined();
    expect(probe.findings({ ...sys, a: systems().a }, track.key)).toBeUndefined();
  });

  it('searches again only the design that changed, alone on two threads where the page allows, and nothing when neither changed', async () => {
    const { made, factory } = fakeWorkers();
    const probe = new HeadroomProbe(factory);
    const sys = systems();
    probe.start(sys, track);
    await vi.waitFor(() => expect(probe.state.status).toBe('done'), { timeout: 20_000 });
    const first = probe.state.slots.a.result;
    // B edited: only B runs, alone, and may take a second thread; A keeps its finding.
    const edited = { a: structuredClone(sys.a), b: structuredClone(sys.b) };
    edited.b.listening.level = { mode: 'spl', splDb: 80 };
    probe.start(edited, track);
    expect(made.length).toBe(3);
    expect(made[2].job?.system).toBe(edited.b);
    expect(made.map((m) => m.job?.threads)).toEqual([1, 1, 2]);
    await vi.waitFor(() => expect(probe.state.status).toBe('done'), { timeout: 20_000 });
    expect(probe.state.slots.a.result).toBe(first);
    expect(probe.state.slots.b.result).toEqual(probeHeadroom(edited.b, [tone], SR));
    expect(probe.findings(edited, track.key)).toBeDefined();
    const done = probe.state.slots.b;
    const keptTrack = probe.state.track!;
    // Neither changed (fresh copies of the same designs): done at once, no worker.
    probe.start(structuredClone(edited), track);
    expect(made.length).toBe(3);
    expect(probe.state.status).toBe('done');
    // Another track: both run again.
    probe.start(edited, { ...track, key: {} });
    expect(made.length).toBe(5);
    probe.cancel();
    // Findings kept from an earlier visit (perhaps of an older app) are searched again when asked.
    probe.state = { ...probe.state, status: 'done', slots: { a: done, b: done }, systems: edited, track: { ...keptTrack }, restored: true };
    probe.start(edited, track);
    expect(made.length).toBe(7);
    probe.cancel();
  });

  it('cancel stops both workers and keeps nothing', () => {
    const { made, factory } = fakeWorkers();
    const probe = new HeadroomProbe(factory);
    probe.start(systems(), track);
    probe.cancel();
    expect(made.every((m) => m.terminated)).toBe(true);
    expect(probe.state.status).toBe('cancelled');
    expect(probe.findings(systems(), track.key)).toBeUndefined();
  });
});
