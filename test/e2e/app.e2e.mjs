// The app in real headless chromium, in order: each test gets { context, server, offHost, state, origin }.
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT, buildApp, launchBrowser, startPreview } from './harness.mjs';

const SHOTS = join(ROOT, 'test', 'e2e', 'screenshots');
/** The names of the variants compared as A and B (the selected option of each picker). */
const pairNames = (p) => p.locator('.pair-name').evaluateAll((els) => els.map((e) => e.selectedOptions[0]?.text ?? ''));
/** Reads a design from stdin through the engine's own parseDesign; prints whether it passed and its ways' kinds. */
const PARSE_STDIN = `
import { readFileSync } from 'node:fs';
import { parseDesign } from './src/engine/design/validate.ts';

const r = parseDesign(readFileSync(0, 'utf8'));
console.log(JSON.stringify({ ok: r.ok, ways: r.ok ? r.design.ways.map((w) => w.kind) : r.errors }));
`;
const SCREENS = [
  ['driver', 'Driver sheet'],
  ['cabinet', 'Cabinet'],
  ['drive', 'Drive & seat'],
  ['curves', 'Curves'],
];

async function page(ctx) {
  if (!ctx.state.page || ctx.state.page.isClosed()) {
    const p = ctx.context.pages()[0] ?? (await ctx.context.newPage());
    ctx.state.errors = [];
    p.on('pageerror', (e) => ctx.state.errors.push(String(e)));
    p.on('console', (m) => m.type() === 'error' && ctx.state.errors.push(m.text()));
    ctx.state.page = p;
    if (!process.argv[2]) return p;
    // Running one test alone (node test/e2e/run.mjs <name>): open the app first. The first-run
    // cautions show only while the browser's profile has not yet dismissed them (a retry reopens it).
    await p.goto(ctx.server.origin + '/');
    await p.waitForSelector('.app');
    const ok = p.getByRole('button', { name: 'I understand' });
    if (await ok.isVisible()) await ok.click();
  }
  return ctx.state.page;
}

async function tab(p, label) {
  await p.getByRole('tab', { name: label, exact: true }).click();
  await p.waitForSelector(`[role=tab][aria-selected=true]:has-text("${label}")`);
}

async function drawsOf(p, chart) {
  return Number((await p.getAttribute(`.glance [data-chart=${chart}]`, 'data-draws')) ?? '0');
}

async function streamBytes(stream) {
  const chunks = [];
  for await (const c of stream) chunks.push(c);
  return Buffer.concat(chunks);
}

async function waitSaved(p) {
  await p.waitForSelector('[data-testid=save-status][data-state=saved]');
}

export const tests = [
  {
    name: 'opens on the demo pair with the first-run cautions',
    fn: async (ctx) => {
      const p = await page(ctx);
      await p.goto(ctx.server.origin + '/');
      const dlg = p.getByRole('dialog', { name: 'Before you start' });
      await dlg.waitFor();
      const text = await dlg.innerText();
      for (const word of ['hearing', 'estimate', 'mains', 'local codes'])
        assert.match(text, new RegExp(word, 'i'), `cautions mention ${word}`);
      await dlg.getByRole('button', { name: 'I understand' }).click();
      await dlg.waitFor({ state: 'detached' });
      assert.equal(await p.title(), 'preheard');
      const names = await pairNames(p);
      assert.equal(names.length, 2);
      assert.match(names[0], /sealed/i);
      assert.match(names[1], /vented/i);
      // The figure table shows an f3 for both designs, as text.
      for (const s of ['a', 'b']) assert.match(await p.innerText(`.glance [data-testid=fig-${s}-f3]`), /^\d+(\.\d+)? Hz$/);
      await p.getByRole('button', { name: 'Cautions' }).click();
      await p.getByRole('dialog', { name: 'Before you start' }).getByRole('button', { name: 'Close' }).click();
      assert.deepEqual(ctx.state.errors, []);
    },
  },
  {
    name: "changing A's box volume changes f3 in text and redraws the chart",
    fn: async (ctx) => {
      const p = await page(ctx);
      await tab(p, 'Cabinet');
      const f3 = p.locator('.glance [data-testid=fig-a-f3]');
      const fc = p.locator('.glance [data-testid=fig-a-fc]');
      const before = await f3.innerText();
      const fcBefore = Number.parseFloat(await fc.innerText());
      const draws0 = await drawsOf(p, 'spl');
      const pixels0 = await p.locator('.glance [data-chart=spl] canvas').evaluate((c) => c.toDataURL());
      const vb = p.getByLabel('Net volume Vb, design A', { exact: true });
      const old = Number(await vb.inputValue());
      ctx.state.newVb = String(Math.round(old * 2.5));
      await vb.fill(ctx.state.newVb);
      await p.waitForFunction((b) => document.querySelector('.glance [data-testid=fig-a-f3]')?.textContent !== b, before);
      const after = await f3.innerText();
      assert.match(after, /^\d+(\.\d+)? Hz$/);
      // Small (1972): fc = fs·sqrt(1 + Vas/Vb) falls as the box grows (f3 moves with Qtc either way).
      const fcAfter = Number.parseFloat(await fc.innerText());
      assert.ok(fcAfter < fcBefore, `a larger sealed box lowers fc: ${fcBefore} -> ${fcAfter} Hz`);
      assert.ok((await drawsOf(p, 'spl')) > draws0, 'the SPL chart redrew');
      const pixels1 = await p.locator('.glance [data-chart=spl] canvas').evaluate((c) => c.toDataURL());
      assert.notEqual(pixels1, pixels0, 'the SPL chart shows something different');
      // The Cabinet sheet shows the same f3 beside the fields.
      assert.equal(await p.innerText('[data-testid=f3-a]'), after);
      await waitSaved(p);
    },
  },
  {
    name: 'a reload restores the edit exactly',
    fn: async (ctx) => {
      const p = await page(ctx);
      await p.reload();
      await p.waitForSelector('[role=tab][aria-selected=true]:has-text("Cabinet")');
      assert.equal(await p.getByLabel('Net volume Vb, design A', { exact: true }).inputValue(), ctx.state.newVb);
      assert.equal(await p.locator('[role=dialog]').count(), 0, 'cautions stay dismissed');
    },
  },
  {
    name: 'a rejected entry stays on screen with its message; undo and redo',
    fn: async (ctx) => {
      const p = await page(ctx);
      await tab(p, 'Driver sheet');
      const fs = p.getByLabel('Resonance fs, design B', { exact: true });
      const good = await fs.inputValue();
      await fs.fill('0.2');
      const msg = p.locator(`#${await fs.getAttribute('aria-describedby')}`);
      await msg.waitFor();
      assert.match(await msg.innerText(), /from 1 to 5000/);
      assert.equal(await fs.inputValue(), '0.2', 'the typed value is never silently replaced');
      assert.equal(await fs.getAttribute('aria-invalid'), 'true');
      await p.locator('body').click({ position: { x: 5, y: 5 } });
      await p.getByRole('button', { name: 'Undo' }).click();
      assert.equal(await fs.inputValue(), good);
      await p.getByRole('button', { name: 'Redo' }).click();
      assert.equal(await fs.inputValue(), '0.2');
      await p.getByRole('button', { name: 'Undo' }).click();
      assert.equal(await fs.inputValue(), good);
      assert.equal(await p.locator('.badge-error').count(), 0);
    },
  },
  {
    name: 'importing a broken design file lists every problem and loads nothing',
    fn: async (ctx) => {
      const p = await page(ctx);
      const nameA = (await pairNames(p))[0];
      const broken = {
        format: 'preheard-design',
        version: 1,
        name: 'Broken on purpose',
        driver: { fs_hz: -5, qes: 0.4, qms: 3, vas_l: 20, re_ohm: 6, sd_cm2: 130, xmax_mm: 5, pe_w: 'lots' },
        box: { type: 'vented', vb_l: 0, fb_hz: 40, ports: [] },
        amplifier: { power_w: 100, load_ohm: 8 },
        crossover: { type: 'lr4', fx_hz: 2000 },
        listening: { distance_m: 3, space: 'half' },
      };
      await p
        .locator('[data-testid=import-file]')
        .setInputFiles({ name: 'broken.preheard.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(broken)) });
      const dlg = p.getByRole('dialog', { name: /broken\.preheard\.json was not imported/ });
      await dlg.waitFor();
      const items = await dlg.locator('[data-testid=problem-list] li.error').allInnerTexts();
      const text = items.join('\n');
      for (const path of ['driver.fs_hz', 'driver.pe_w', 'box.vb_l', 'box.ports']) assert.ok(text.includes(path), `lists ${path}: ${text}`);
      assert.ok(items.length >= 4);
      await dlg.getByRole('button', { name: 'Close' }).click();
      assert.equal((await pairNames(p))[0], nameA, 'design A is unchanged');
      // A file that is not JSON at all.
      await p
        .locator('[data-testid=import-file]')
        .setInputFiles({ name: 'notes.txt.json', mimeType: 'application/json', buffer: Buffer.from('{"format": "preheard-design",') });
      const dlg2 = p.getByRole('dialog', { name: /was not imported/ });
      await dlg2.waitFor();
      assert.match(await dlg2.innerText(), /not valid JSON/);
      await dlg2.getByRole('button', { name: 'Close' }).click();
    },
  },
  {
    name: 'a share link round-trips the design pair in a fresh browser',
    fn: async (ctx) => {
      const p = await page(ctx);
      // The volume an earlier test set, or (this test run alone) the one on view.
      await tab(p, 'Cabinet');
      const vb = ctx.state.newVb ?? (await p.getByLabel('Net volume Vb, design A', { exact: true }).inputValue());
      await p.locator('[data-testid=files-menu] > summary').click();
      await p.getByRole('menuitem', { name: 'Share link…' }).click();
      const url = await p.locator('[data-testid=share-url]').inputValue();
      assert.ok(url.startsWith(ctx.server.origin + '/#pair=1.'), url);
      await p.getByRole('dialog', { name: 'Share link' }).getByRole('button', { name: 'Close' }).click();
      const other = await launchBrowser(ctx.server.origin);
      try {
        const q = await other.context.newPage();
        await q.goto(url);
        await q.getByRole('dialog', { name: 'Before you start' }).getByRole('button', { name: 'I understand' }).click();
        await tab(q, 'Cabinet');
        assert.equal(await q.getByLabel('Net volume Vb, design A', { exact: true }).inputValue(), vb);
        assert.equal(await q.innerText('.glance [data-testid=fig-a-f3]'), await p.innerText('.glance [data-testid=fig-a-f3]'));
        assert.equal(new URL(q.url()).hash, '', 'the fragment is cleared once read');
        assert.deepEqual(other.offHost, []);
      } finally {
        await other.close();
      }
    },
  },
  {
    name: 'Curves: hover readouts, PNG export of a chart, design export as a file',
    fn: async (ctx) => {
      const p = await page(ctx);
      await tab(p, 'Curves');
      const over = p.locator('[data-chart=spl] .u-over');
      const box = await over.boundingBox();
      await p.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.5);
      const legend = p.locator('[data-chart=spl] .u-legend');
      await p.waitForFunction(() => /\d Hz/.test(document.querySelector('[data-chart=spl] .u-legend')?.textContent ?? ''));
      assert.match(await legend.innerText(), /A:?\s*\d+(\.\d+)? dB/);
      // The cursor is shared: the impedance chart reads out at the same frequency.
      assert.match(await p.locator('[data-chart=impedance] .u-legend').innerText(), /\d+(\.\d+)? Ω/);
      // The key numbers also as text: the SPL values at fixed frequencies.
      const details = p.locator('figure:has([data-chart=spl]) details.values');
      await details.locator('summary').click();
      await details.locator('tbody tr').first().waitFor();
      const rows = await details.locator('tbody tr').allInnerTexts();
      // Rows sit at the grid point nearest each preferred frequency (ISO 266 third-octave series).
      const near100 = rows.map((r) => r.trim().split(/\s+/).map(Number)).find((c) => c[0] > 90 && c[0] < 110);
      assert.ok(
        near100 && near100.length >= 3 && near100.slice(1).every((v) => v > 40 && v < 120),
        `a row near 100 Hz with SPL values: ${rows.join(' | ')}`,
      );
      const [png] = await Promise.all([p.waitForEvent('download'), p.getByRole('button', { name: 'Save SPL at the seat as PNG' }).click()]);
      assert.equal(png.suggestedFilename(), 'preheard-spl.png');
      const bytes = await streamBytes(await png.createReadStream());
      // PNG signature (ISO/IEC 15948, section 5.2): 89 50 4E 47 0D 0A 1A 0A.
      assert.deepEqual([...bytes.subarray(0, 8)], [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
      assert.ok(bytes.length > 5000, `a real picture, ${bytes.length} bytes`);
      mkdirSync(SHOTS, { recursive: true });
      await png.saveAs(join(SHOTS, 'export-spl.png'));
      await p.locator('[data-testid=files-menu] > summary').click();
      const [file] = await Promise.all([p.waitForEvent('download'), p.getByRole('menuitem', { name: 'Export design A' }).click()]);
      assert.match(file.suggestedFilename(), /\.preheard\.json$/);
      const doc = JSON.parse((await streamBytes(await file.createReadStream())).toString('utf8'));
      assert.equal(doc.format, 'preheard-design');
      assert.equal(doc.version, 2);
      if (ctx.state.newVb) assert.equal(String(doc.ways[0].box.vb_l), ctx.state.newVb);
    },
  },
  {
    name: 'a tweeter way added to design B draws its own line in the Curves and exports as a version 2 design',
    fn: async (ctx) => {
      const p = await page(ctx);
      await tab(p, 'Driver sheet');
      const waysBefore = await p.locator('[data-testid=way-pick-b] option').count();
      await p.locator('[data-testid=way-add-b]').selectOption('tweeter');
      assert.equal(await p.locator('[data-testid=way-pick-b] option').count(), waysBefore + 1);
      assert.equal(await p.locator('[data-testid=way-pick-b]').inputValue(), String(waysBefore));
      assert.equal(await p.getByLabel('Resonance fs, design B', { exact: true }).inputValue(), '950');
      await tab(p, 'Curves');
      const card = p.locator('.chart-card', { has: p.locator('[data-chart=spl]') });
      assert.ok(!(await card.innerText()).includes('B tweeter'), 'the sum alone until asked');
      await p.locator('[data-testid=show-ways]').check();
      await card.locator('.u-legend').getByText('B tweeter').waitFor();
      // The values table has the tweeter's own column: far below the sum at 100 Hz (it is high-passed
      // at the crossover), a real number at 1 kHz.
      const values = card.locator('details.values');
      if (!(await values.evaluate((d) => d.open))) await values.locator('summary').click();
      await values.locator('tbody tr').first().waitFor();
      const head = await card.locator('details.values thead th').allInnerTexts();
      const col = head.findIndex((h) => h.startsWith('B tweeter'));
      const sumCol = head.findIndex((h) => h.startsWith('B ('));
      assert.ok(col > 0 && sumCol > 0, `columns: ${head.join(' | ')}`);
      const rows = await card
        .locator('details.values tbody tr')
        .evaluateAll((trs) => trs.map((tr) => [...tr.children].map((c) => Number(c.textContent.replace('−', '-')))));
      const at = (hz) => rows.reduce((best, r) => (Math.abs(Math.log(r[0] / hz)) < Math.abs(Math.log(best[0] / hz)) ? r : best));
      assert.ok(at(100)[col] < at(100)[sumCol] - 40, `tweeter at 100 Hz ${at(100)[col]} dB, sum ${at(100)[sumCol]} dB`);
      assert.ok(Number.isFinite(at(1000)[col]) && at(1000)[col] > at(100)[col] + 40, `tweeter rises toward its band: ${at(1000)[col]} dB`);
      // Exported, the design is a version 2 file with the tweeter, and the engine's parseDesign accepts it.
      await p.locator('[data-testid=files-menu] > summary').click();
      const [file] = await Promise.all([p.waitForEvent('download'), p.getByRole('menuitem', { name: 'Export design B' }).click()]);
      const text = (await streamBytes(await file.createReadStream())).toString('utf8');
      const doc = JSON.parse(text);
      assert.equal(doc.version, 2);
      assert.deepEqual(
        doc.ways.map((w) => `${w.kind}:${w.name}`),
        ['driver:woofer', 'flat:upper band', 'driver:tweeter'],
      );
      const check = spawnSync(join(ROOT, 'node_modules', '.bin', 'tsx'), ['-e', PARSE_STDIN], { input: text, cwd: ROOT, encoding: 'utf8' });
      const parsed = JSON.parse(check.stdout || '{}');
      assert.equal(parsed.ok, true, `parseDesign accepts the export: ${check.stdout}${check.stderr}`);
      assert.deepEqual(parsed.ways, ['driver', 'flat', 'driver']);
      await p.locator('[data-testid=show-ways]').uncheck();
      await p.getByRole('button', { name: 'Undo' }).click();
    },
  },
  {
    name: 'screenshots of every screen at desktop and tablet widths',
    fn: async (ctx) => {
      const p = await page(ctx);
      mkdirSync(SHOTS, { recursive: true });
      for (const [w, h, tag] of [
        [1440, 900, 'desktop'],
        [820, 1180, 'tablet'],
      ]) {
        await p.setViewportSize({ width: w, height: h });
        for (const [id, label] of SCREENS) {
          await tab(p, label);
          await p.waitForTimeout(150);
          await p.screenshot({ path: join(SHOTS, `${tag}-${id}.png`), fullPage: false });
        }
      }
      await p.setViewportSize({ width: 1440, height: 900 });
      // B as a passive-radiator box: its own fields and curves, then undo.
      await tab(p, 'Cabinet');
      await p.getByLabel('Enclosure type, design B', { exact: true }).selectOption('passive-radiator');
      await p.getByLabel('Radiator moving mass, design B', { exact: true }).waitFor();
      assert.match(await p.innerText('[data-testid=f3-b]'), /Hz/);
      await p.screenshot({ path: join(SHOTS, 'desktop-cabinet-radiator.png') });
      await tab(p, 'Curves');
      await p.waitForTimeout(150);
      await p.screenshot({ path: join(SHOTS, 'desktop-curves-radiator.png') });
      await p.getByRole('button', { name: 'Undo' }).click();
      await p.getByTestId('view-menu').locator('summary').click();
      await p.locator('.theme select').selectOption('dark');
      await p.getByTestId('view-menu').locator('summary').click();
      for (const [id, label] of [SCREENS[0], SCREENS[3]]) {
        await tab(p, label);
        await p.waitForTimeout(150);
        await p.screenshot({ path: join(SHOTS, `desktop-dark-${id}.png`) });
      }
      await p.getByTestId('view-menu').locator('summary').click();
      await p.locator('.theme select').selectOption('auto');
      await p.getByTestId('view-menu').locator('summary').click();
    },
  },
  {
    name: "the demo pair in the client's room: the seat dragged in the sketch moves the modes' effect",
    fn: async (ctx) => {
      const p = await page(ctx);
      await tab(p, 'Drive & seat');
      await p.getByRole('button', { name: 'Both in the client’s room' }).click();
      const sketch = p.getByRole('img', { name: /seen from above/ }).first();
      await sketch.scrollIntoViewIfNeeded();
      const figures = p.locator('.room-figures').first();
      assert.match(await figures.innerText(), /Schroeder frequency \d+ Hz .*\(1,0,0\)/);
      const seat = sketch.locator('circle');
      const box = await seat.boundingBox();
      await p.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
      await p.mouse.down();
      await p.mouse.move(box.x + box.width / 2 + 20, box.y + box.height / 2 - 30, { steps: 5 });
      await p.mouse.up();
      const moved = await seat.boundingBox();
      assert.ok(Math.abs(moved.y - box.y + 30) < 3, `the seat follows the pointer: ${box.y} -> ${moved.y}`);
      await p.screenshot({ path: join(SHOTS, 'desktop-drive-room.png') });
      await p.getByRole('button', { name: 'Undo' }).click();
      await p.getByRole('button', { name: 'Both without a room' }).click();
      assert.equal(await p.locator('.room-figures').count(), 0);
      assert.deepEqual(ctx.state.errors, []);
    },
  },
  {
    name: 'with the server stopped, a reload comes from the service worker',
    fn: async (ctx) => {
      const p = await page(ctx);
      await p.evaluate(async () => {
        await navigator.serviceWorker.ready;
      });
      await waitSaved(p);
      await ctx.server.stop();
      await p.reload();
      await p.waitForSelector('[data-testid=fig-a-f3]');
      assert.match(await p.innerText('[data-testid=fig-a-f3]'), /Hz/);
      await tab(p, 'Curves');
      await p.waitForSelector('[data-chart=spl] canvas');
      await tab(p, 'Cabinet');
      assert.equal(await p.getByLabel('Net volume Vb, design A', { exact: true }).inputValue(), ctx.state.newVb);
      assert.deepEqual(
        ctx.state.errors.filter((e) => !/ERR_CONNECTION_REFUSED|Failed to load resource/.test(e)),
        [],
      );
    },
  },
  {
    name: 'a new version shows "reload to update" and the reload keeps the designs',
    fn: async (ctx) => {
      const p = await page(ctx);
      // Publish a distinct build at the same address (the server is down after the offline test).
      await ctx.server.stop();
      buildApp('dist', 'e2e-next');
      ctx.server = await startPreview({ outDir: 'dist', port: ctx.server.port });
      await tab(p, 'Cabinet');
      await p.getByLabel('Net volume Vb, design B', { exact: true }).fill('23.5');
      await waitSaved(p);
      await p.reload();
      const banner = p.locator('.banner-update');
      await banner.waitFor({ timeout: 20_000 });
      assert.match(await banner.innerText(), /new version/i);
      assert.doesNotMatch(await p.innerText('[data-testid=build]'), /e2e-next/, 'the old version runs until the user says so');
      await Promise.all([p.waitForEvent('load'), banner.getByRole('button', { name: 'Reload to update' }).click()]);
      await p.waitForSelector('[data-testid=build]');
      assert.match(await p.innerText('[data-testid=build]'), /e2e-next/);
      assert.equal(await p.locator('.banner-update').count(), 0);
      await tab(p, 'Cabinet');
      assert.equal(await p.getByLabel('Net volume Vb, design B', { exact: true }).inputValue(), '23.5');
      assert.equal(await p.getByLabel('Net volume Vb, design A', { exact: true }).inputValue(), ctx.state.newVb);
    },
  },
  {
    name: 'Curves: distortion computed in a real Worker, with progress; the Driver sheet opens the impedance fit',
    fn: async (ctx) => {
      const p = await page(ctx);
      await tab(p, 'Curves');
      await p.getByRole('button', { name: 'Compute distortion' }).click();
      await p.getByRole('button', { name: 'Compute again' }).waitFor({ timeout: 120000 });
      await p.locator('[data-chart=thd]').first().waitFor();
      assert.match(await p.locator('.distortion-panel').innerText(), /A: at most [\d.]+ % THD/);
      mkdirSync(SHOTS, { recursive: true });
      await p.locator('.distortion-panel').screenshot({ path: join(SHOTS, 'distortion.png') });
      await tab(p, 'Driver sheet');
      await p.getByRole('button', { name: 'Fit from impedance…' }).first().click();
      await p.getByRole('dialog').waitFor();
      assert.match(await p.getByRole('dialog').innerText(), /Free-air sweep/);
      // A sweep of the textbook model (Re 6 ohm, fs 40 Hz, Qms 5, Qes 0.5, Le 0.5 mH; common
      // practice, no source), fitted in the real Worker: fs comes back within 1 %.
      const rows = ['Hz Ohm Deg'];
      for (let k = 0; k <= 200; k++) {
        const f = 10 * 2 ** (k / 20);
        const x = 5 * (f / 40 - 40 / f);
        const res = (6 * 5) / 0.5;
        const zr = 6 + res / (1 + x * x);
        const zi = 2 * Math.PI * f * 0.5e-3 - (res * x) / (1 + x * x);
        rows.push(`${f.toFixed(3)} ${Math.hypot(zr, zi).toFixed(5)} ${((Math.atan2(zi, zr) * 180) / Math.PI).toFixed(4)}`);
      }
      await p
        .getByRole('dialog')
        .locator('input[type=file]')
        .first()
        .setInputFiles({ name: 'free.txt', mimeType: 'text/plain', buffer: Buffer.from(rows.join('\n')) });
      await p.getByRole('button', { name: 'Fit', exact: true }).click();
      const table = p.getByLabel('Fitted parameters');
      await table.waitFor({ timeout: 30_000 });
      const fs = Number(/fs\s*([\d.]+)/.exec(await table.innerText())?.[1]);
      assert.ok(Math.abs(fs / 40 - 1) < 0.01, `fitted fs ${fs} Hz`);
      await p.keyboard.press('Escape');
    },
  },
];
