// A real compressed track in the bench: the app's own demo track, synthesised here by the app's code
// (bundled with esbuild), repeated to 4:50 and encoded as a 22.05 kHz stereo MP3 by
// @breezystack/lamejs (an encoder independent of the browser's decoder). The bench must decode it to
// the right length, play it, and keep it for the next visit.
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { build } from 'esbuild';
import { Mp3Encoder } from '@breezystack/lamejs';
import { ROOT } from './harness.mjs';
import { benchPage, tab } from './bench.e2e.mjs';

const RATE = 22050;
const SECONDS = 4 * 60 + 50;
const NAME = 'demo-4m50-22k.mp3';

/** The demo track at 22.05 kHz, repeated to 4:50, as MP3 bytes (64 kbit/s stereo, MPEG-2 layer III). */
async function demoMp3(dir) {
  const out = join(dir, 'demo-track.mjs');
  await build({
    entryPoints: [join(ROOT, 'src/engine/demo/track.ts')],
    bundle: true,
    format: 'esm',
    platform: 'neutral',
    outfile: out,
    logLevel: 'error',
  });
  const { synthesizeDemoTrack } = await import(pathToFileURL(out).href);
  const demo = synthesizeDemoTrack(RATE);
  const n = SECONDS * RATE;
  const enc = new Mp3Encoder(2, RATE, 64);
  const chunks = [];
  const bytes = (b) => Buffer.from(b.buffer, b.byteOffset, b.byteLength);
  const block = 1152 * 64;
  const l = new Int16Array(block);
  const r = new Int16Array(block);
  const len = demo.channels[0].length;
  for (let s = 0; s < n; s += block) {
    const m = Math.min(block, n - s);
    for (let k = 0; k < m; k++) {
      const j = (s + k) % len;
      l[k] = Math.max(-32768, Math.min(32767, Math.round(demo.channels[0][j] * 32767)));
      r[k] = Math.max(-32768, Math.min(32767, Math.round(demo.channels[1 % demo.channels.length][j] * 32767)));
    }
    chunks.push(bytes(enc.encodeBuffer(l.subarray(0, m), r.subarray(0, m))));
  }
  chunks.push(bytes(enc.flush()));
  return Buffer.concat(chunks);
}

export const tests = [
  {
    name: 'mp3: a 4:50 22.05 kHz MP3 of the demo track decodes to its length, plays, and is kept over a reload',
    fn: async (ctx) => {
      const dir = mkdtempSync(join(tmpdir(), 'preheard-mp3-'));
      try {
        const mp3 = await demoMp3(dir);
        // 64 kbit/s for 290 s is about 2.3 MB: well under the kept-track limit.
        assert.ok(mp3.length > 2_000_000 && mp3.length < 2_600_000, `MP3 of ${mp3.length} bytes`);
        const p = await benchPage(ctx);
        const line = p.getByTestId('track-name');
        const rate = Number(await line.getAttribute('data-rate'));
        await p.getByTestId('audio-file').setInputFiles({ name: NAME, mimeType: 'audio/mpeg', buffer: mp3 });
        await p.waitForSelector(`[data-testid=track-name]:has-text("${NAME}")`, { timeout: 60_000 });
        // Decoded at the bench's rate; the encoder's delay and padding add well under 0.1 s.
        const frames = Number(await line.getAttribute('data-frames'));
        assert.ok(Math.abs(frames / rate - SECONDS) < 0.1, `decoded ${frames / rate} s at ${rate} Hz`);
        assert.match(await line.innerText(), /4:50/);
        // The file's own rate beside the rate it plays at (the browser resamples to its own).
        if (rate !== RATE)
          assert.match(await line.innerText(), new RegExp(`22\\.05 kHz file, played at ${Number((rate / 1000).toPrecision(4))} kHz`));
        await p.waitForSelector('[data-testid=track-kept]:has-text("Kept on this device")', { timeout: 30_000 });
        // The planned levels come from the whole decoded track: finite volts for both designs.
        await p.waitForSelector('[data-testid=volts-a]:not(:has-text("—"))', { timeout: 60_000 });
        await p.waitForSelector('[data-testid=volts-b]:not(:has-text("—"))', { timeout: 60_000 });

        // It plays: the playhead moves. (Play waits until the track is ready to play.)
        const t0 = Date.now();
        await p.waitForSelector('[data-testid=play]:not([disabled])', { timeout: 90_000 });
        const readyMs = Date.now() - t0;
        await p.getByTestId('play').click();
        // The hearing caution comes before the first play of a visit.
        const caution = p.getByRole('dialog', { name: 'Mind your hearing' });
        await p.waitForSelector('[data-testid=play]:has-text("Pause"), [role=dialog]');
        if (await caution.isVisible()) await caution.getByRole('button', { name: 'Play at a low monitor level' }).click();
        await p.waitForSelector('[data-testid=play]:has-text("Pause")');
        const canvas = p.getByTestId('overview-canvas');
        await p.waitForFunction(
          () => Number(document.querySelector('[data-testid=overview-canvas]')?.getAttribute('aria-valuenow')) >= 1,
          null,
          {
            timeout: 10_000,
          },
        );
        assert.ok(Number(await canvas.getAttribute('aria-valuenow')) >= 1);
        console.log(`       (Play ready ${readyMs} ms after the levels; MP3 ${(mp3.length / 1e6).toFixed(2)} MB)`);
        await p.getByTestId('play').click();
        await p.waitForSelector('[data-testid=play]:has-text("Play")');

        // The kept file comes back after a reload, to the same length.
        await p.waitForTimeout(500);
        await p.reload();
        await tab(p, 'Listening bench');
        await p.waitForSelector(`[data-testid=track-name]:has-text("${NAME}")`, { timeout: 60_000 });
        assert.match(await p.getByTestId('track-kept').innerText(), /Brought back from your last visit/);
        assert.equal(Number(await p.getByTestId('track-name').getAttribute('data-frames')), frames);
        // Leave the demo track for the tests after this one (the kept file is forgotten).
        await p.getByRole('button', { name: 'Demo track' }).click();
        await p.waitForSelector('[data-testid=track-name]:has-text("Demo track")');
        assert.deepEqual(ctx.state.benchErrors, []);
        await p.close();
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    },
  },
];
