// The Listening bench and the Stress strip in real headless chromium (started with
// --autoplay-policy=no-user-gesture-required by run.mjs), after the app's own tests.
// Stress events of the offline render are compared with `preheard render --events` on the same file
// and design (the CLI runs the same engine from Node: an independent path through decoding, level
// resolution and latency compensation).
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import wavefile from 'wavefile';

const { WaveFile } = wavefile;
import { ROOT } from './harness.mjs';

const SHOTS = join(ROOT, 'test', 'e2e', 'screenshots');
/** Event times of the browser and the CLI agree within this, s (the tolerance). */
const TIME_TOL_S = 0.02;

export async function benchPage(ctx) {
  if (ctx.state.benchPage && !ctx.state.benchPage.isClosed()) return ctx.state.benchPage;
  const p = await ctx.context.newPage();
  const errors = [];
  p.on('pageerror', (e) => errors.push(String(e)));
  p.on('console', (m) => m.type() === 'error' && errors.push(m.text()));
  ctx.state.benchErrors = errors;
  await p.setViewportSize({ width: 1440, height: 900 });
  await p.goto(ctx.server.origin + '/');
  const first = p.getByRole('button', { name: 'I understand' });
  if (await first.isVisible().catch(() => false)) await first.click();
  await tab(p, 'Listening bench');
  await p.waitForSelector('[data-testid=volts-a]:not(:has-text("—"))', { timeout: 30_000 });
  ctx.state.benchPage = p;
  return p;
}

export async function tab(p, label) {
  await p.getByRole('tab', { name: label, exact: true }).click();
  await p.waitForSelector(`[role=tab][aria-selected=true]:has-text("${label}")`);
}

async function streamBytes(stream) {
  const chunks = [];
  for await (const c of stream) chunks.push(c);
  return Buffer.concat(chunks);
}

/** A 32-bit float stereo WAV: a quiet 200 Hz tone with a loud 30 Hz burst from 1.2 s to 1.6 s. */
function burstWav(sampleRate) {
  const n = Math.round(3 * sampleRate);
  const l = new Float32Array(n);
  for (let k = 0; k < n; k++) {
    const t = k / sampleRate;
    l[k] = 0.03 * Math.sin(2 * Math.PI * 200 * t);
    if (t >= 1.2 && t < 1.6) l[k] += 0.9 * Math.sin(2 * Math.PI * 30 * (t - 1.2)) * Math.sin((Math.PI * (t - 1.2)) / 0.4) ** 2;
  }
  const w = new WaveFile();
  w.fromScratch(2, sampleRate, '32f', [l, l.slice()]);
  return { bytes: Buffer.from(w.toBuffer()), frames: n };
}

export const tests = [
  {
    name: 'bench: opens on the demo track; a WAV with a bass burst loads through the file input',
    fn: async (ctx) => {
      const p = await benchPage(ctx);
      const line = p.getByTestId('track-name');
      assert.match(await line.innerText(), /Demo track/);
      const rate = Number(await line.getAttribute('data-rate'));
      assert.ok(rate >= 22050 && rate <= 192000, `bench rate ${rate}`);
      const dir = mkdtempSync(join(tmpdir(), 'preheard-bench-'));
      const wav = burstWav(rate);
      writeFileSync(join(dir, 'burst.wav'), wav.bytes);
      Object.assign(ctx.state, { benchDir: dir, benchRate: rate, benchFrames: wav.frames });
      await p.getByTestId('audio-file').setInputFiles({ name: 'burst.wav', mimeType: 'audio/wav', buffer: wav.bytes });
      await p.waitForSelector('[data-testid=track-name]:has-text("burst.wav")');
      assert.equal(Number(await line.getAttribute('data-frames')), wav.frames);
      await p.waitForSelector('[data-testid=volts-a]:not(:has-text("—"))');
    },
  },
  {
    name: 'bench: offline render finds the stress events at the burst, the same kinds and times as preheard render --events',
    fn: async (ctx) => {
      const p = await benchPage(ctx);
      const dir = ctx.state.benchDir;
      // The design heard as A, as a file, from the app itself.
      await p.locator('[data-testid=files-menu] > summary').click();
      const [dl] = await Promise.all([p.waitForEvent('download'), p.getByRole('menuitem', { name: 'Export design A' }).click()]);
      writeFileSync(join(dir, 'a.json'), await streamBytes(await dl.createReadStream()));
      await p.getByTestId('render-offline').click();
      await p.waitForSelector('[data-testid=offline-results]', { timeout: 30_000 });
      // The page is cross-origin isolated, so on two cores or more the render worker runs a second
      // thread (src/audio/lane-helper.ts); the events below are then those of the two-thread render.
      const { isolated, cores } = await p.evaluate(() => ({ isolated: crossOriginIsolated, cores: navigator.hardwareConcurrency }));
      assert.equal(isolated, true, 'the page is not cross-origin isolated');
      assert.equal(await p.getByTestId('offline-results').getAttribute('data-threads'), cores > 1 ? '2' : '1');
      await tab(p, 'Stress strip');
      await p.waitForSelector('[data-testid=strip-source]:has-text("offline render")');
      const rows = await p
        .locator('[data-testid=event-list] tr[data-slot=a]')
        .evaluateAll((trs) => trs.map((tr) => ({ kind: tr.dataset.kind, start: Number(tr.dataset.start) })));
      const cli = spawnSync(
        process.execPath,
        [
          join(ROOT, 'src/cli/preheard.mjs'),
          'render',
          join(dir, 'a.json'),
          join(dir, 'burst.wav'),
          '-o',
          join(dir, 'out.wav'),
          '--events',
          join(dir, 'events.json'),
        ],
        { cwd: ROOT, encoding: 'utf8' },
      );
      assert.equal(cli.status, 0, cli.stderr);
      const ref = JSON.parse(readFileSync(join(dir, 'events.json'), 'utf8'));
      assert.ok(ref.length > 0, 'the CLI finds stress at the burst');
      for (const e of ref) assert.ok(e.start_s >= 1.15 && e.start_s <= 1.7, `${e.kind} at ${e.start_s} s lies in the burst`);
      assert.equal(rows.length, ref.length, `browser ${JSON.stringify(rows)} vs CLI ${JSON.stringify(ref)}`);
      for (const e of ref) {
        const twin = rows.find((r) => r.kind === e.kind && Math.abs(r.start - e.start_s) <= TIME_TOL_S);
        assert.ok(twin, `${e.kind} at ${e.start_s} s has a twin in the browser (${JSON.stringify(rows)})`);
      }
      // Hovering an event shows its cause, peak and limit.
      const canvas = p.getByTestId('stress-canvas');
      const box = await canvas.boundingBox();
      const gutter = Number(await canvas.getAttribute('data-gutter'));
      const plotW = Number(await canvas.getAttribute('data-plot-width'));
      const first = ref[0];
      const x = box.x + gutter + ((first.start_s + first.end_s) / 2 / 3) * plotW;
      await p.mouse.move(x, box.y + 76 + 6 + 15);
      const tip = p.getByTestId('strip-tip');
      await tip.waitFor();
      assert.match(await tip.innerText(), /peak .* limit/);
      await p.mouse.move(box.x + 5, box.y + 5);
    },
  },
  {
    name: 'bench: A/B switch during playback lands on a block boundary with no step beyond the crossfade',
    fn: async (ctx) => {
      const p = await benchPage(ctx);
      await tab(p, 'Listening bench');
      await p.getByTestId('play').click();
      const caution = p.getByRole('dialog', { name: 'Mind your hearing' });
      await caution.waitFor();
      await caution.getByRole('button', { name: 'Play at a low monitor level' }).click();
      await p.waitForSelector('[data-testid=play]:has-text("Pause")');
      assert.equal(await p.innerText('[data-testid=monitor-db]'), '-24 dB');
      // Into the burst, where A and B differ most, then switch.
      const canvas = p.getByTestId('overview-canvas');
      const box = await canvas.boundingBox();
      const gutter = Number(await canvas.getAttribute('data-gutter'));
      const plotW = Number(await canvas.getAttribute('data-plot-width'));
      await p.mouse.click(box.x + gutter + (1.3 / 3) * plotW, box.y + 30);
      await p.waitForTimeout(150);
      for (const lane of ['b', 'ref', 'a']) {
        await p.getByTestId(`lane-${lane}`).click();
        const rep = p.locator(`[data-testid=switch-report][data-lane=${lane}]`);
        await rep.waitFor({ timeout: 5000 });
        const d = await rep.evaluate((el) => ({ ...el.dataset }));
        assert.equal(Number(d.blockFrame) % Number(d.quantum), 0, `switch at ${d.blockFrame} is on a ${d.quantum}-frame boundary`);
        assert.equal(Number(d.quantum), 128);
        assert.equal(Number(d.fadeFrames), Math.round(0.005 * ctx.state.benchRate));
        assert.ok(
          Number(d.worstRatio) <= 1,
          `largest step ${d.maxStep} within what the crossfade allows (${d.allowedStep}), ratio ${d.worstRatio}`,
        );
        assert.ok(Number(d.maxStep) > 0, 'music was playing through the switch');
        await p.waitForTimeout(120);
      }
      // Going loud asks first.
      await p.getByTestId('monitor').fill('-3');
      const loud = p.getByRole('dialog', { name: /Louder than the caution level/ });
      await loud.waitFor();
      assert.equal(await p.innerText('[data-testid=monitor-db]'), '-12 dB');
      await loud.getByRole('button', { name: 'Stay at the caution level' }).click();
      assert.match(await p.innerText('[data-testid=load]'), /\d+ %/);
      if ((await p.innerText('[data-testid=play]')).includes('Pause')) await p.getByTestId('play').click();
      await p.waitForSelector('[data-testid=play]:has-text("Play")');
    },
  },
  {
    name: 'bench: export a WAV of A and decode it (finite samples, right length and rate)',
    fn: async (ctx) => {
      const p = await benchPage(ctx);
      await p.getByTestId('export-format').selectOption('16');
      await p.getByTestId('export-mode').selectOption('residual');
      const [dl] = await Promise.all([p.waitForEvent('download', { timeout: 30_000 }), p.getByTestId('export-wav').click()]);
      assert.match(dl.suggestedFilename(), /^burst\.a\.distortion\.16bit\.wav$/);
      const bytes = await streamBytes(await dl.createReadStream());
      const w = new WaveFile(bytes);
      assert.equal(w.fmt.sampleRate, ctx.state.benchRate);
      assert.equal(w.fmt.numChannels, 2);
      assert.equal(w.fmt.bitsPerSample, 16);
      const s = w.getSamples(false, Float64Array);
      assert.equal(s[0].length, ctx.state.benchFrames);
      let peak = 0;
      for (const ch of s)
        for (const v of ch) {
          assert.ok(Number.isFinite(v));
          peak = Math.max(peak, Math.abs(v));
        }
      assert.ok(peak > 0, 'the distortion at the burst is in the file');
    },
  },
  {
    name: 'bench: a corrupt or empty file gets a clear message and the track stays',
    fn: async (ctx) => {
      const p = await benchPage(ctx);
      const junk = Buffer.from('RIFF\x10\x00\x00\x00WAVEfmt this is not audio at all'.repeat(20));
      await p.getByTestId('audio-file').setInputFiles({ name: 'broken.wav', mimeType: 'audio/wav', buffer: junk });
      const err = p.getByTestId('file-error');
      await err.waitFor();
      assert.match(await err.innerText(), /broken\.wav.*cannot be decoded/);
      assert.match(await p.innerText('[data-testid=track-name]'), /burst\.wav/);
      await p.getByTestId('audio-file').setInputFiles({ name: 'nothing.mp3', mimeType: 'audio/mpeg', buffer: Buffer.alloc(0) });
      await p.waitForSelector('[data-testid=file-error]:has-text("nothing.mp3")');
      assert.match(await err.innerText(), /is empty/);
    },
  },
  {
    name: 'bench: a WAV that ends early loads with a notice of how much was read',
    fn: async (ctx) => {
      const p = await benchPage(ctx);
      // 16-bit stereo 48 kHz, a 0.5 s 100 Hz tone; the header announces 2 s.
      const frames = 24000;
      const b = Buffer.alloc(44 + frames * 4);
      b.write('RIFF', 0);
      b.writeUInt32LE(36 + 4 * 96000, 4);
      b.write('WAVEfmt ', 8);
      b.writeUInt32LE(16, 16);
      b.writeUInt16LE(1, 20);
      b.writeUInt16LE(2, 22);
      b.writeUInt32LE(48000, 24);
      b.writeUInt32LE(192000, 28);
      b.writeUInt16LE(4, 32);
      b.writeUInt16LE(16, 34);
      b.write('data', 36);
      b.writeUInt32LE(4 * 96000, 40);
      for (let k = 0; k < frames; k++) {
        const v = Math.round(8000 * Math.sin((2 * Math.PI * 100 * k) / 48000));
        b.writeInt16LE(v, 44 + 4 * k);
        b.writeInt16LE(v, 46 + 4 * k);
      }
      await p.getByTestId('audio-file').setInputFiles({ name: 'cut.wav', mimeType: 'audio/wav', buffer: b });
      await p.waitForSelector('[data-testid=track-name]:has-text("cut.wav")');
      // The file's own 48 kHz is shown, with the rate it plays at when the browser resampled it.
      const line = p.getByTestId('track-name');
      assert.equal(await line.getAttribute('data-file-rate'), '48000');
      if (Number(await line.getAttribute('data-rate')) !== 48000) assert.match(await line.innerText(), /48 kHz file, played at \d/);
      const notice = await p.getByTestId('track-truncated').innerText();
      assert.match(notice, /ends early: its header announces 0:02.0 of audio, but only 0:00.5 is in/);
    },
  },
  {
    name: 'bench: a reload keeps the track and its offline render; a design change makes the render stale',
    fn: async (ctx) => {
      const p = await benchPage(ctx);
      const bytes = readFileSync(join(ctx.state.benchDir, 'burst.wav'));
      await p.getByTestId('audio-file').setInputFiles({ name: 'burst.wav', mimeType: 'audio/wav', buffer: bytes });
      await p.waitForSelector('[data-testid=track-kept]:has-text("Kept on this device")');
      await p.getByTestId('render-offline').click();
      await p.waitForSelector('[data-testid=offline-results]', { timeout: 30_000 });
      // The results are written after the render: give the write a moment before the reload.
      await p.waitForTimeout(500);
      await p.reload();
      await tab(p, 'Listening bench');
      await p.waitForSelector('[data-testid=track-name]:has-text("burst.wav")', { timeout: 30_000 });
      assert.match(await p.getByTestId('track-kept').innerText(), /Brought back from your last visit/);
      assert.equal(Number(await p.getByTestId('track-name').getAttribute('data-frames')), ctx.state.benchFrames);
      await p.waitForSelector('[data-testid=offline-results]:not(.stale)', { timeout: 30_000 });
      // An edit of a design: the kept render no longer describes it.
      await tab(p, 'Cabinet');
      const vb = p.getByLabel('Net volume Vb, design A', { exact: true });
      await vb.fill(String(Number(await vb.inputValue()) + 1));
      await vb.press('Tab');
      await tab(p, 'Listening bench');
      await p.waitForSelector('[data-testid=offline-results].stale');
      await p.getByRole('button', { name: 'Undo' }).click();
    },
  },
  {
    name: 'bench: screenshots of the bench and the strip at desktop and tablet widths',
    fn: async (ctx) => {
      const p = await benchPage(ctx);
      mkdirSync(SHOTS, { recursive: true });
      await p.getByRole('button', { name: 'Demo track' }).click();
      await p.waitForSelector('[data-testid=track-name]:has-text("Demo track")');
      await p.waitForSelector('[data-testid=volts-a]:not(:has-text("—"))');
      for (const [w, h, tag] of [
        [1440, 900, 'desktop'],
        [820, 1180, 'tablet'],
      ]) {
        await p.setViewportSize({ width: w, height: h });
        await tab(p, 'Stress strip');
        await p.waitForSelector('[data-testid=strip-source]:has-text("offline render")', { timeout: 30_000 });
        await p.waitForTimeout(200);
        await p.screenshot({ path: join(SHOTS, `${tag}-stress.png`) });
        await tab(p, 'Listening bench');
        await p.waitForTimeout(200);
        await p.screenshot({ path: join(SHOTS, `${tag}-bench.png`) });
      }
      await p.setViewportSize({ width: 1440, height: 900 });
      assert.deepEqual(ctx.state.benchErrors, []);
      await p.close();
      rmSync(ctx.state.benchDir, { recursive: true, force: true });
    },
  },
];
