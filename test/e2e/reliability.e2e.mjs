// No lost work, in real chromium: a closed tab, an unreadable stored state, two tabs at once.
// The page is opened with ?bench, which exposes the store so edits can be made without the UI.
import assert from 'node:assert/strict';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT } from './harness.mjs';

const edit = (p, slot, path, value) =>
  p.evaluate(([s, k, v]) => window.__preheard.store.dispatch({ type: 'edit', slot: s, path: k, value: v }), [slot, path, value]);
const valueAt = (p, slot, path) =>
  p.evaluate(([s, k]) => k.split('.').reduce((n, key) => n?.[key], window.__preheard.store.get().designs[s]), [slot, path]);
const saved = (p) => p.waitForSelector('[data-testid=save-status][data-state=saved]');

async function open(ctx) {
  const p = await ctx.context.newPage();
  await p.goto(ctx.server.origin + '/?bench');
  await p.waitForFunction(() => !!window.__preheard);
  const ok = p.getByRole('button', { name: 'I understand' });
  if (await ok.isVisible().catch(() => false)) await ok.click();
  return p;
}

const shareLinkOf = async (p) => {
  await p.locator('[data-testid=files-menu] > summary').click();
  await p.getByRole('menuitem', { name: 'Share link…' }).click();
  const url = await p.locator('[data-testid=share-url]').inputValue();
  await p.getByRole('dialog', { name: 'Share link' }).getByRole('button', { name: 'Close' }).click();
  return url;
};

export const tests = [
  {
    name: 'the build has a local-only Content-Security-Policy and no eval or new Function',
    fn: async (ctx) => {
      const dist = join(ROOT, 'dist');
      const html = readFileSync(join(dist, 'index.html'), 'utf8');
      const csp = /http-equiv="Content-Security-Policy" content="([^"]+)"/.exec(html)?.[1] ?? '';
      assert.match(csp, /default-src 'self'/);
      assert.match(csp, /script-src 'self' blob: 'wasm-unsafe-eval';/);
      // WebAssembly may compile; JavaScript's eval may not.
      assert.doesNotMatch(csp.replaceAll("'wasm-unsafe-eval'", ''), /unsafe-eval|https?:|ws:/);
      // The served page carries the policy as a header too, with frame-ancestors (a meta tag cannot).
      const res = await fetch(ctx.server.origin + '/');
      const header = res.headers.get('content-security-policy') ?? '';
      assert.match(header, /default-src 'self'/);
      assert.match(header, /frame-ancestors 'none'/);
      assert.match(header, /connect-src 'self';/);
      assert.doesNotMatch(header, /ws:/);
      const scripts = readdirSync(join(dist, 'assets'))
        .filter((f) => f.endsWith('.js'))
        .map((f) => join(dist, 'assets', f));
      scripts.push(join(dist, 'sw.js'));
      for (const file of scripts) {
        const code = readFileSync(file, 'utf8');
        assert.doesNotMatch(code, /\bnew Function\s*\(|\beval\s*\(/, `${file} uses eval or new Function`);
      }
      const p = await open(ctx);
      const scope = await p.evaluate(async () => (await navigator.serviceWorker.ready).scope);
      assert.equal(scope, ctx.server.origin + '/');
      await p.close();
    },
  },
  {
    name: 'an edit survives closing the tab',
    fn: async (ctx) => {
      const p = await open(ctx);
      await edit(p, 'a', 'ways.0.box.vb_l', 16.5);
      await saved(p);
      await p.close({ runBeforeUnload: false });
      const q = await open(ctx);
      assert.equal(await valueAt(q, 'a', 'ways.0.box.vb_l'), 16.5);
      await q.close();
    },
  },
  {
    name: 'an unreadable stored state is set aside and the last good state restored',
    fn: async (ctx) => {
      // Alone in the browser: another open tab would save the state it follows over the damaged one.
      for (const other of ctx.context.pages()) await other.close();
      const p = await open(ctx);
      await edit(p, 'a', 'ways.0.box.vb_l', 15.25);
      await saved(p);
      await p.evaluate(
        () =>
          new Promise((resolve, reject) => {
            const req = indexedDB.open('preheard');
            req.onsuccess = () => {
              const tx = req.result.transaction('app', 'readwrite');
              tx.objectStore('app').put({ kind: 'preheard-app-state', version: 1, state: 'scrambled' }, 'current');
              tx.oncomplete = () => resolve(undefined);
              tx.onerror = () => reject(tx.error);
            };
            req.onerror = () => reject(req.error);
          }),
      );
      await p.reload();
      await p.waitForFunction(() => !!window.__preheard);
      const banner = p.getByTestId('recovery-banner');
      await banner.waitFor();
      assert.match(await banner.innerText(), /last good state/);
      assert.equal(await valueAt(p, 'a', 'ways.0.box.vb_l'), 15.25);
      const download = p.waitForEvent('download');
      await banner.getByRole('button', { name: 'Download the unreadable data' }).click();
      const file = await download;
      assert.equal(file.suggestedFilename(), 'preheard-unreadable-state.json');
      await banner.getByRole('button', { name: 'Dismiss' }).click();
      await p.close();
    },
  },
  {
    name: 'two tabs editing at once stay consistent',
    fn: async (ctx) => {
      const [p, q] = [await open(ctx), await open(ctx)];
      await edit(p, 'b', 'ways.0.box.fb_hz', 36.5);
      await q.waitForFunction(() => window.__preheard.store.get().designs.b.ways[0].box.fb_hz === 36.5, null, { timeout: 5000 });
      await edit(q, 'a', 'listening.distance_m', 2.5);
      await p.waitForFunction(() => window.__preheard.store.get().designs.a.listening.distance_m === 2.5, null, { timeout: 5000 });
      assert.equal(await valueAt(p, 'b', 'ways.0.box.fb_hz'), 36.5);
      await Promise.all([p.close(), q.close()]);
    },
  },
  {
    name: 'design names are shown as text, never as HTML, on every screen',
    fn: async (ctx) => {
      const p = await open(ctx);
      const evil = '<img src=x onerror="window.__injected=1"><b>bold</b>';
      await p.evaluate((name) => window.__preheard.store.dispatch({ type: 'edit', slot: 'a', path: 'name', value: name }), evil);
      for (const label of ['Driver sheet', 'Curves', 'Listening bench', 'Client sheet']) {
        await p.getByRole('tab', { name: label, exact: true }).click();
        await p.waitForTimeout(100);
        assert.equal(await p.locator('img[src="x"]').count(), 0, `no injected element on ${label}`);
        assert.equal(await p.evaluate(() => window.__injected), undefined);
      }
      assert.ok((await p.locator('body').innerText()).includes('<b>bold</b>'), 'the name appears literally');
      await p.evaluate(() => window.__preheard.store.dispatch({ type: 'undo' }));
      await p.close();
    },
  },
  {
    name: 'another page cannot frame the app (frame-ancestors none)',
    fn: async (ctx) => {
      const p = await ctx.context.newPage();
      await p.goto('about:blank');
      await p.setContent(`<iframe id="f" src="${ctx.server.origin}/?bench"></iframe>`);
      await p.waitForTimeout(1500);
      const child = p.frames().find((f) => f !== p.mainFrame());
      const loaded = child ? await child.evaluate(() => !!document.getElementById('app')).catch(() => false) : false;
      assert.equal(loaded, false, 'the app must not load inside a frame');
      await p.close();
    },
  },
  {
    name: 'an edit followed at once by a reload survives (10 of 10)',
    fn: async (ctx) => {
      const p = await open(ctx);
      let kept = 0;
      for (let k = 0; k < 10; k++) {
        const v = 12 + k / 4;
        await edit(p, 'a', 'ways.0.box.vb_l', v);
        await p.reload();
        await p.waitForFunction(() => !!window.__preheard);
        if ((await valueAt(p, 'a', 'ways.0.box.vb_l')) === v) kept++;
      }
      console.log(`    [reload at once] ${kept} of 10 edits kept`);
      assert.equal(kept, 10);
      await p.close();
    },
  },
  {
    name: 'a share link opens in its own tab only, and storage changes only when kept',
    fn: async (ctx) => {
      const p = await open(ctx);
      await edit(p, 'a', 'ways.0.box.vb_l', 19.75);
      await saved(p);
      const url = await shareLinkOf(p);
      await edit(p, 'a', 'ways.0.box.vb_l', 21.5);
      await saved(p);
      const q = await ctx.context.newPage();
      await q.goto(url.replace('/#', '/?bench#'));
      await q.getByTestId('shared-banner').waitFor();
      assert.equal(await valueAt(q, 'a', 'ways.0.box.vb_l'), 19.75);
      await p.waitForTimeout(500);
      assert.equal(await valueAt(p, 'a', 'ways.0.box.vb_l'), 21.5, 'the other tab is unchanged');
      const r = await open(ctx);
      assert.equal(await valueAt(r, 'a', 'ways.0.box.vb_l'), 21.5, 'storage is unchanged');
      await r.close();
      await q.getByRole('button', { name: 'Back to my designs' }).click();
      await q.waitForFunction(() => window.__preheard.store.get().designs.a.ways[0].box.vb_l === 21.5);
      await q.goto(url.replace('/#', '/?bench#x'));
      await q.goto(url.replace('/#', '/?bench#'));
      await q.getByTestId('shared-banner').waitFor();
      await q.getByRole('button', { name: 'Keep these designs' }).click();
      await p.waitForFunction(() => window.__preheard.store.get().designs.a.ways[0].box.vb_l === 19.75, null, { timeout: 5000 });
      await Promise.all([p.close(), q.close()]);
    },
  },
];
