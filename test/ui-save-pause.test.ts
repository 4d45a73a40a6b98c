// The app's save timing (persist.ts afterEditsPause): a change on its own is written at once; a burst
// of edits is written after the edits pause, or within SAVE_WITHIN_MS when they never do; nothing is lost.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { afterEditsPause, Autosave, EDIT_PAUSE_MS, memoryBackend, SAVE_WITHIN_MS } from '../src/ui/persist.ts';
import { Store } from '../src/ui/store.ts';
import { demoPair } from '../src/ui/demo.ts';

const volumeOf = (v: unknown) =>
  (v as { state: { project: { variants: { design: { ways: { box: { vb_l: number } }[] } }[] } } }).state.project.variants[0].design.ways[0]
    .box.vb_l;

async function started(backend = memoryBackend()) {
  const save = new Autosave(backend, Date.now, afterEditsPause());
  const store = new Store(demoPair);
  await save.load();
  save.attach(store);
  const edit = (vb: number) => store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: vb });
  return { backend, save, store, edit };
}

describe('saves wait for a pause in the edits', () => {
  beforeEach(() => vi.useFakeTimers());
  afterEach(() => vi.useRealTimers());

  it('writes a change that comes alone at once', async () => {
    const { backend, save, edit } = await started();
    edit(12);
    await vi.advanceTimersByTimeAsync(20);
    expect(backend.writes).toBe(1);
    expect(save.status.kind).toBe('saved');
    expect(volumeOf(backend.value)).toBe(12);
  });

  it('writes the rest of a burst once, after the edits pause, with the last value', async () => {
    const { backend, save, edit } = await started();
    for (let i = 0; i < 10; i++) {
      edit(10 + i);
      await vi.advanceTimersByTimeAsync(100);
    }
    // One second of edits 100 ms apart: the first was written at once, the nine after it wait for a
    // pause, and the status says so.
    expect(backend.writes).toBe(1);
    expect(volumeOf(backend.value)).toBe(10);
    expect(save.status.kind).toBe('saving');
    await vi.advanceTimersByTimeAsync(EDIT_PAUSE_MS + 50);
    expect(backend.writes).toBe(2);
    expect(save.status.kind).toBe('saved');
    expect(volumeOf(backend.value)).toBe(19);
  });

  it('writes edits that never pause every SAVE_WITHIN_MS or so', async () => {
    const { backend, edit } = await started();
    const writesAt: number[] = [];
    for (let t = 0; t < 3 * SAVE_WITHIN_MS; t += 50) {
      edit(10 + t * 1e-4);
      const before = backend.writes;
      await vi.advanceTimersByTimeAsync(50);
      if (backend.writes > before) writesAt.push(t + 50);
    }
    // Six seconds of edits 50 ms apart (120 edits): the first at once, then one write about every
    // SAVE_WITHIN_MS, not one per edit.
    expect(writesAt[0]).toBeLessThanOrEqual(50);
    expect(writesAt.length).toBeGreaterThanOrEqual(3);
    expect(writesAt.length).toBeLessThanOrEqual(4);
    for (let k = 1; k < writesAt.length; k++) {
      expect(writesAt[k] - writesAt[k - 1]).toBeGreaterThanOrEqual(SAVE_WITHIN_MS);
      expect(writesAt[k] - writesAt[k - 1]).toBeLessThanOrEqual(SAVE_WITHIN_MS + 100);
    }
  });

  it('still writes a burst when the clock is set back an hour in the middle of it', async () => {
    const { backend, edit } = await started();
    edit(10);
    await vi.advanceTimersByTimeAsync(100);
    edit(11);
    await vi.advanceTimersByTimeAsync(100);
    // Set back while the burst's save waits for its pause: measured by the clock, the last edit now
    // lies an hour ahead.
    vi.setSystemTime(Date.now() - 3_600_000);
    await vi.advanceTimersByTimeAsync(SAVE_WITHIN_MS + 100);
    expect(volumeOf(backend.value)).toBe(11);
  });

  it('keeps an edit not yet written in the journal when the page goes', async () => {
    const { backend, save, edit } = await started();
    edit(23);
    await vi.advanceTimersByTimeAsync(100);
    edit(23.5);
    await vi.advanceTimersByTimeAsync(100);
    // The second edit of the burst is not written yet; the page going journals it.
    expect(volumeOf(backend.value)).toBe(23);
    save.flushNow();
    expect(volumeOf(backend.journaled)).toBe(23.5);
  });

  it('says "saving" while edits made during a slow write are not yet written', async () => {
    // A backend that takes 80 ms per write; edits every 40 ms.
    const slow = memoryBackend();
    const write = slow.save.bind(slow);
    slow.save = async (value, good) => {
      await new Promise((r) => setTimeout(r, 80));
      await write(value, good);
    };
    const { backend, save, edit } = await started(slow);
    const seen: { t: number; status: string; stored: number | undefined }[] = [];
    for (let t = 0; t < 1200; t += 40) {
      edit(10 + t / 40);
      await vi.advanceTimersByTimeAsync(40);
      seen.push({ t, status: save.status.kind, stored: backend.value === undefined ? undefined : volumeOf(backend.value) });
    }
    const last = 10 + 1160 / 40;
    // Never "saved" while the stored value is behind the last edit.
    for (const x of seen) if (x.status === 'saved') expect(x.stored).toBe(10 + x.t / 40);
    await vi.advanceTimersByTimeAsync(SAVE_WITHIN_MS + 500);
    expect(save.status.kind).toBe('saved');
    expect(volumeOf(backend.value)).toBe(last);
  });

  it("writes the user's own last edit, never the link's designs, when a shared link comes on view during a burst's wait", async () => {
    // No journal (localStorage unavailable): the write at hold() is all that keeps the edit.
    const bare = memoryBackend();
    bare.journal = undefined;
    const { backend, save, store, edit } = await started(bare);
    edit(10);
    await vi.advanceTimersByTimeAsync(100);
    edit(11);
    save.hold();
    // The link's designs come on view, then the user leaves without keeping them.
    store.dispatch({ type: 'edit', slot: 'a', path: 'ways.0.box.vb_l', value: 99 });
    await vi.advanceTimersByTimeAsync(50);
    expect(volumeOf(backend.value)).toBe(11);
    expect(save.status.kind).toBe('held');
    const writes = backend.writes;
    save.release(false);
    await vi.advanceTimersByTimeAsync(SAVE_WITHIN_MS + 500);
    expect(backend.writes).toBe(writes);
    expect(volumeOf(backend.value)).toBe(11);
  });

  it('starts a waiting save at once when the page is hidden or an update reloads it', async () => {
    const { backend, save, edit } = await started();
    edit(10);
    await vi.advanceTimersByTimeAsync(100);
    edit(11);
    await vi.advanceTimersByTimeAsync(10);
    expect(volumeOf(backend.value)).toBe(10);
    save.flushNow();
    await vi.advanceTimersByTimeAsync(5);
    expect(volumeOf(backend.value)).toBe(11);
    edit(12);
    await vi.advanceTimersByTimeAsync(10);
    const done = save.flush();
    await vi.advanceTimersByTimeAsync(5);
    await done;
    expect(volumeOf(backend.value)).toBe(12);
  });
});
