// @vitest-environment happy-dom
// The Blind trial screen against the listening bench's player (its methods observed, no audio
// device): X plays the hidden design, levels are matched, the loop is fixed, keys drive the rounds,
// and what X was is revealed only at the end.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen } from '@testing-library/preact';

vi.mock('uplot', () => import('./helpers/fake-uplot.ts'));

import { App } from '../src/ui/App.tsx';
import { Store } from '../src/ui/store.ts';
import { Autosave, memoryBackend } from '../src/ui/persist.ts';
import { demoPair } from '../src/ui/demo.ts';
import { benchAudio } from '../src/audio/bench.ts';
import { probabilityAtLeast } from '../src/engine/trial/binomial.ts';

afterEach(() => cleanup());

describe('Blind trial through the bench player', () => {
  it('plays the hidden design for X, matches levels, fixes the loop, and scores the rounds', async () => {
    const bench = benchAudio();
    const SR = 48000;
    // A started bench with a 32 s track whose loud part starts at 16 s (as the demo track has).
    vi.spyOn(bench, 'start').mockImplementation(async () => {
      bench.state = {
        ...bench.state,
        status: 'ready',
        sampleRate: SR,
        track: {
          name: 'Demo track (built in)',
          source: 'demo',
          frames: 32 * SR,
          sampleRate: SR,
          channels: 2,
          droppedChannels: 0,
          overview: { min: new Float32Array(1), max: new Float32Array(1) },
          loudFromS: 16,
        },
        levels: { a: { voltsFs: 12.5, splDb: 85 }, b: { voltsFs: 9.1, splDb: 85 } },
      };
    });
    const lanes: string[] = [];
    vi.spyOn(bench, 'selectLane').mockImplementation((l) => void lanes.push(l));
    const play = vi.spyOn(bench, 'play').mockImplementation(async () => {});
    vi.spyOn(bench, 'pause').mockImplementation(() => {});
    const match = vi.spyOn(bench, 'setMatch').mockImplementation(() => {});
    const loop = vi.spyOn(bench, 'setLoop').mockImplementation(() => {});
    vi.spyOn(bench, 'seek').mockImplementation(() => {});

    const store = new Store(demoPair);
    store.dispatch({ type: 'settings', patch: { cautionsDismissed: true, screen: 'trial', trialRounds: 6 } });
    render(<App store={store} autosave={new Autosave(memoryBackend())} />);
    // Six rounds can reach p < 0.05 (a perfect score: 0.5^6 = 1.6 %); three cannot (12.5 %), and the screen says so.
    expect(screen.queryByTestId('trial-rounds-warning')).toBeNull();
    await act(() => store.dispatch({ type: 'settings', patch: { trialRounds: 3 } }));
    expect(screen.getByTestId('trial-rounds-warning').textContent).toMatch(/12\.5 % chance by guessing.*at least 5 rounds/);
    await act(() => store.dispatch({ type: 'settings', patch: { trialRounds: 6 } }));
    await act(() => {
      fireEvent.click(screen.getByTestId('trial-start'));
    });
    await vi.waitFor(() => screen.getByTestId('trial-round'), { timeout: 5000 });
    expect(match).toHaveBeenCalledWith(true);
    expect(loop).toHaveBeenLastCalledWith({ startS: 16, endS: 24 });

    const heardForX: string[] = [];
    const answers = ['a', 'b', 'b', 'a', 'a', 'b'] as const;
    for (let i = 0; i < 6; i++) {
      expect(screen.getByTestId('trial-count').textContent).toBe(`Round ${i + 1} of 6`);
      expect(document.body.textContent).not.toMatch(/X was/);
      await act(() => {
        fireEvent.keyDown(window, { key: 'x' });
      });
      heardForX.push(lanes[lanes.length - 1]);
      await act(() => {
        fireEvent.keyDown(window, { key: 'a' });
        fireEvent.keyDown(window, { key: 'b' });
      });
      expect(lanes.slice(-2)).toEqual(['a', 'b']);
      await act(() => {
        fireEvent.keyDown(window, { key: answers[i] === 'a' ? '1' : '2' });
      });
    }
    expect(play).toHaveBeenCalled();
    const rows = [...document.querySelectorAll('.trial-table tbody tr')].map((tr) =>
      [...tr.querySelectorAll('td')].map((td) => td.textContent!.trim()),
    );
    expect(rows.length).toBe(6);
    // What X played in each round is what the table reveals as X.
    expect(rows.map((r) => r[1].toLowerCase())).toEqual(heardForX);
    const correct = rows.filter((r, i) => r[1].toLowerCase() === answers[i]).length;
    expect(screen.getByTestId('trial-score').textContent).toContain(`${correct} of 6 right`);
    // 6 rounds: P(at least k right by guessing) = sum over j >= k of C(6, j) / 64.
    const c6 = [1, 6, 15, 20, 15, 6, 1];
    const tail = c6.slice(correct).reduce((s, v) => s + v, 0) / 64;
    expect(probabilityAtLeast(correct, 6)).toBeCloseTo(tail, 12);
  });
});
