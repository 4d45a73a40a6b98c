// Deciding by ear and showing the client, in real headless chromium: the Client sheet printed to PDF
// (checked with poppler's pdfinfo / pdftotext / pdftoppm), the Headroom probe against the CLI,
// Presentation mode and a short blind trial with its exports.
import assert from 'node:assert/strict';
import { spawn, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import wavefile from 'wavefile';
import { ROOT, ensurePoppler } from './harness.mjs';

const { WaveFile } = wavefile;

const SHOTS = join(ROOT, 'test', 'e2e', 'screenshots');
const TMP = mkdtempSync(join(tmpdir(), 'preheard-sheet-e2e-'));

async function sheetPage(ctx) {
  if (ctx.state.sheetPage && !ctx.state.sheetPage.isClosed()) return ctx.state.sheetPage;
  const p = await ctx.context.newPage();
  ctx.state.sheetErrors = [];
  p.on('pageerror', (e) => ctx.state.sheetErrors.push(String(e)));
  p.on('console', (m) => m.type() === 'error' && ctx.state.sheetErrors.push(m.text()));
  await p.goto(ctx.server.origin + '/');
  // Once the tabs are drawn, the first-run cautions are either open or not.
  await p.waitForSelector('.tabs [role=tab]');
  const first = p.getByRole('button', { name: 'I understand' });
  if (await first.isVisible().catch(() => false)) await first.click();
  // Earlier tests edit the designs: start these from the demo pair.
  await p.getByTestId('pair-menu').locator('summary').click();
  await p.getByRole('button', { name: 'Reset to demo pair…' }).click();
  await p.getByRole('dialog', { name: 'Reset to the demo pair?' }).getByRole('button', { name: 'Reset to the demo pair' }).click();
  ctx.state.sheetPage = p;
  return p;
}

async function tab(p, label) {
  await p.getByRole('tab', { name: label, exact: true }).click();
  await p.waitForSelector(`[role=tab][aria-selected=true]:has-text("${label}")`);
}

const run = (cmd, args) => {
  const r = spawnSync(cmd, args, { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed (${r.status}): ${r.stderr}`);
  return r.stdout;
};

function cliHeadroom(design, wav) {
  return new Promise((resolve, reject) => {
    const c = spawn(process.execPath, [join(ROOT, 'src/cli/preheard.mjs'), 'headroom', design, wav, '--json'], { cwd: ROOT });
    let out = '';
    let err = '';
    c.stdout.on('data', (d) => (out += d));
    c.stderr.on('data', (d) => (err += d));
    c.on('exit', (code) => (code === 0 ? resolve(JSON.parse(out)) : reject(new Error(`preheard headroom: exit ${code} ${err}`))));
  });
}

export const tests = [
  {
    name: 'client sheet: title and notes autosave; prints to a one-page A4 PDF with parameters, curves, verdict, cautions and date',
    fn: async (ctx) => {
      ensurePoppler();
      const p = await sheetPage(ctx);
      await tab(p, 'Client sheet');
      await p.getByTestId('sheet-title').fill('Okafor living room: two ways to build the monitors');
      await p
        .getByTestId('sheet-notes')
        .fill('Both boxes fit the shelf. The vented one needs the port at the front, 10 cm clear of the wall.');
      await p.waitForSelector('[data-testid=save-status][data-state=saved]');
      await p.reload();
      await p.getByTestId('client-sheet').waitFor();
      assert.equal(await p.getByTestId('sheet-title').inputValue(), 'Okafor living room: two ways to build the monitors');
      assert.match(await p.getByTestId('paper-notes').innerText(), /port at the front/);
      const verdictOnScreen = await p.locator('[data-testid=sheet-verdict] li').allInnerTexts();
      assert.ok(verdictOnScreen.length >= 5, `verdict has ${verdictOnScreen.length} lines`);

      await p.emulateMedia({ media: 'print' });
      const pdf = join(TMP, 'client-sheet.pdf');
      await p.pdf({ path: pdf, preferCSSPageSize: true, printBackground: true });
      await p.emulateMedia({ media: 'screen' });

      const info = run('pdfinfo', [pdf]);
      const pages = Number(/Pages:\s+(\d+)/.exec(info)?.[1]);
      assert.equal(pages, 1, `the sheet prints on one page, as it says, got ${pages}`);
      // A4 is 210 x 297 mm = 595 x 842 pt (ISO 216).
      const [, w, h] = /Page size:\s+([\d.]+) x ([\d.]+) pts/.exec(info) ?? [];
      assert.ok(Math.abs(Number(w) - 595) < 2 && Math.abs(Number(h) - 842) < 2, `A4 page, got ${w} x ${h} pt`);

      const text = run('pdftotext', [pdf, '-']).replace(/\s+/g, ' ');
      const page1 = run('pdftotext', ['-f', '1', '-l', '1', pdf, '-']).replace(/\s+/g, ' ');
      for (const want of [
        'Okafor living room: two ways to build the monitors',
        'Living-room monitor, sealed 14 l',
        'Living-room monitor, vented 20 l',
        'In plain words',
        'Kestrel 165',
        'Sensitivity (2.83 V at 1 m)',
        'Group delay at 40 Hz',
        'Curves',
        'SPL at the seat',
        'Frequency (Hz)',
        'port at the front',
        'Protect your hearing',
        'The models are estimates',
        'local codes and licensed practice',
        'not measurements',
        String(new Date().getFullYear()),
      ]) {
        assert.ok(text.includes(want), `the PDF says “${want}”`);
      }
      // The verdict in the PDF is the one on screen, sentence by sentence; it sits on page 1.
      for (const line of verdictOnScreen)
        assert.ok(page1.includes(line.replace(/\s+/g, ' ').slice(0, 60)), `page 1 holds the verdict line “${line.slice(0, 60)}…”`);
      // Nothing of the app's chrome is printed.
      for (const chrome of ['Undo', 'Share link', 'Print or save as PDF', 'Listening bench'])
        assert.ok(!text.includes(chrome), `the PDF leaves out “${chrome}”`);

      mkdirSync(SHOTS, { recursive: true });
      run('pdftoppm', ['-png', '-r', '80', pdf, join(SHOTS, 'client-sheet-pdf')]);
      await p.screenshot({ path: join(SHOTS, 'desktop-client-sheet.png') });
      assert.deepEqual(ctx.state.sheetErrors, []);
    },
  },
  {
    name: 'headroom probe: runs in workers with progress, gives the numbers of preheard headroom on the same track and design',
    fn: async (ctx) => {
      const p = await sheetPage(ctx);
      // A short track of our own on the bench: 3 s stereo, a quiet 55 Hz line, then a loud 38 Hz
      // burst from 1.5 s, as 32-bit float at the bench's own rate so decoding gives these very samples.
      await tab(p, 'Listening bench');
      const rate = Number(
        await (await p.waitForSelector('[data-testid=track-name][data-rate]', { timeout: 20_000 })).getAttribute('data-rate'),
      );
      const n = 3 * rate;
      const l = new Float32Array(n);
      const r = new Float32Array(n);
      for (let k = 0; k < n; k++) {
        const t = k / rate;
        const env = Math.min(1, (t % 1.5) / 0.01);
        l[k] = env * (t >= 1.5 ? 0.8 * Math.sin(2 * Math.PI * 38 * t) : 0.1 * Math.sin(2 * Math.PI * 55 * t));
        r[k] = 0.9 * l[k];
      }
      const wf = new WaveFile();
      wf.fromScratch(2, rate, '32f', [Array.from(l), Array.from(r)]);
      const wav = join(TMP, 'bass-bursts.wav');
      writeFileSync(wav, wf.toBuffer());
      await p.getByTestId('audio-file').setInputFiles(wav);
      await p.waitForSelector('[data-testid=track-name]:has-text("bass-bursts.wav")');
      // The designs as the app holds them, exported through its own Files menu.
      const designs = {};
      for (const slot of ['A', 'B']) {
        await p.locator('.menu > summary', { hasText: 'Files' }).click();
        const [dl] = await Promise.all([p.waitForEvent('download'), p.getByRole('menuitem', { name: `Export design ${slot}` }).click()]);
        designs[slot.toLowerCase()] = join(TMP, `design-${slot}.json`);
        await dl.saveAs(designs[slot.toLowerCase()]);
      }
      const cliRuns = Promise.all([cliHeadroom(designs.a, wav), cliHeadroom(designs.b, wav)]);

      await tab(p, 'Headroom probe');
      assert.match(await p.getByTestId('probe-track').innerText(), /bass-bursts\.wav \(0:03, /);

      // The progress bar may show only briefly on a short track: record every state it shows.
      await p.evaluate(() => {
        const seen = [];
        window.__probeProgress = seen;
        new MutationObserver(() => {
          const bar = document.querySelector('[data-testid=probe-progress]');
          if (bar) seen.push(bar.parentElement.innerText);
        }).observe(document.body, { subtree: true, childList: true, characterData: true, attributes: true });
      });
      await p.getByTestId('probe-run').click();
      await p.getByTestId('probe-results').waitFor({ timeout: 60_000 });
      const cli = await cliRuns;
      const cell = (s, id) => p.getByTestId(`probe-${s}-${id}`).innerText();
      const words = {
        excursion: 'cone travel (Xmax)',
        xlim: 'the suspension limit (Xlim)',
        'coil-temperature': 'coil heat',
        'port-speed': 'port air speed',
        'amplifier-clip': 'amplifier power',
        compression: 'compression',
        distortion: 'distortion (10 %)',
      };
      for (const [i, s] of ['a', 'b'].entries()) {
        const ref = cli[i];
        assert.equal(await cell(s, 'spl'), `${ref.clean_spl_db.toFixed(1)} dB SPL`);
        assert.equal(await cell(s, 'volts'), `${ref.clean_volts.toFixed(1)} V`);
        assert.equal(await cell(s, 'limit'), ref.first_limit ? words[ref.first_limit] : 'none reached in the search range');
        if (ref.first_limit_s !== null) assert.match(await cell(s, 'time'), new RegExp(`\\(${ref.first_limit_s.toFixed(2)} s\\)$`));
      }
      const progress = await p.evaluate(() => window.__probeProgress);
      assert.ok(
        progress.length > 0 &&
          /A: [\d.]+ of about \d+ runs through the track · B: [\d.]+ of about \d+ runs through the track/.test(progress[0]),
        `progress shown: ${progress[0]}`,
      );
      const exact = await p.evaluate(() => document.querySelector('[data-testid=probe-results]')?.getAttribute('data-exact'));
      assert.deepEqual(JSON.parse(exact), cli, 'the worker returned exactly the CLI numbers');
      const sentence = await p.getByTestId('probe-verdict').innerText();
      assert.match(sentence, /plays this track .* dB louder cleanly than|play this track equally loud cleanly/);
      // The Client sheet now carries the headroom sentence too.
      await tab(p, 'Client sheet');
      assert.equal(await p.locator('[data-testid=sheet-verdict] li[data-line=headroom]').innerText(), sentence);
      await tab(p, 'Headroom probe');
      await p.screenshot({ path: join(SHOTS, 'desktop-headroom-probe.png') });
      ctx.state.cliHeadroom = cli;
      // B edited: only B is searched again, alone; A keeps its finding, and B's is the CLI's on the edited file.
      await tab(p, 'Cabinet');
      await p.getByLabel('Net volume Vb, design B', { exact: true }).fill('30');
      await p.locator('.menu > summary', { hasText: 'Files' }).click();
      const [dlB] = await Promise.all([p.waitForEvent('download'), p.getByRole('menuitem', { name: 'Export design B' }).click()]);
      const editedB = join(TMP, 'design-B-edited.json');
      await dlB.saveAs(editedB);
      const cliB = cliHeadroom(editedB, wav);
      await tab(p, 'Headroom probe');
      await p.getByTestId('probe-run').click();
      await p.waitForFunction(
        (old) => {
          const t = document.querySelector('[data-testid=probe-results]');
          return t && t.getAttribute('data-exact') !== old && !document.querySelector('[data-testid=probe-progress]');
        },
        exact,
        { timeout: 60_000 },
      );
      const again = JSON.parse(await p.getByTestId('probe-results').getAttribute('data-exact'));
      assert.deepEqual(again[0], cli[0], 'A keeps its finding');
      assert.deepEqual(again[1], await cliB, 'the edited B gives the numbers of preheard headroom');
      // Searched alone, B took a second thread (src/audio/lane-helper.ts) on a machine with two cores.
      const { isolated, cores } = await p.evaluate(() => ({ isolated: crossOriginIsolated, cores: navigator.hardwareConcurrency }));
      assert.equal(isolated, true, 'the page is not cross-origin isolated');
      assert.equal(await p.getByTestId('probe-results').getAttribute('data-threads'), cores > 1 ? '2' : '1');
      assert.deepEqual(ctx.state.sheetErrors, []);
    },
  },
  {
    name: 'headroom probe: a reload keeps the findings for the same designs and track',
    fn: async (ctx) => {
      const p = await sheetPage(ctx);
      await tab(p, 'Headroom probe');
      const before = await p.getByTestId('probe-results').getAttribute('data-exact');
      // The findings are written when the search ends: give the write a moment before the reload.
      await p.waitForTimeout(500);
      await p.reload();
      await tab(p, 'Headroom probe');
      await p.waitForSelector('[data-testid=probe-results] caption:has-text("kept from your last visit")', { timeout: 30_000 });
      assert.match(await p.getByTestId('probe-track').innerText(), /bass-bursts\.wav/);
      assert.equal(await p.getByTestId('probe-results').getAttribute('data-exact'), before);
      // The Client sheet's headroom sentence comes back with them.
      await tab(p, 'Client sheet');
      await p.waitForSelector('[data-testid=sheet-verdict] li[data-line=headroom]');
      assert.deepEqual(ctx.state.sheetErrors, []);
    },
  },
  {
    name: 'presentation mode: large type, A / B / reference, the level and the verdict; Esc leads out',
    fn: async (ctx) => {
      const p = await sheetPage(ctx);
      const sheetVerdict = await (async () => {
        await tab(p, 'Client sheet');
        return p.locator('[data-testid=sheet-verdict] li').allInnerTexts();
      })();
      await tab(p, 'Present');
      const pres = p.getByTestId('presentation');
      await pres.waitFor();
      // Only three listening choices: A, B and the reference.
      const lanes = await pres.locator('.present-lane .present-lane-label').allInnerTexts();
      assert.deepEqual(lanes, ['A', 'B', 'Reference']);
      const size = await pres
        .locator('.present-lane-label')
        .first()
        .evaluate((e) => parseFloat(getComputedStyle(e).fontSize));
      const body = await pres.evaluate((e) => parseFloat(getComputedStyle(e).fontSize));
      assert.ok(size >= 60 && body >= 20, `large type: lane ${size}px, text ${body}px`);
      assert.match(await p.getByTestId('present-level').innerText(), /Planned level: A 85 dB at the seat · B 85 dB at the seat/);
      assert.deepEqual(await pres.locator('[data-testid=present-verdict] li').allInnerTexts(), sheetVerdict);
      // The whole window: nothing of the app around it is visible.
      const box = await pres.boundingBox();
      assert.ok(box && box.width >= 1400 && box.height >= 880, `covers the window: ${JSON.stringify(box)}`);
      await p.getByTestId('present-b').click();
      await p.waitForFunction(() => document.querySelector('[data-testid=present-b]')?.getAttribute('aria-pressed') === 'true');
      await p.screenshot({ path: join(SHOTS, 'desktop-presentation.png') });
      await p.setViewportSize({ width: 820, height: 1180 });
      await p.screenshot({ path: join(SHOTS, 'tablet-presentation.png') });
      await p.setViewportSize({ width: 1440, height: 900 });
      await p.keyboard.press('Escape');
      await pres.waitFor({ state: 'detached' });
      await p.waitForSelector('[role=tab][aria-selected=true]:has-text("Client sheet")');
      assert.deepEqual(ctx.state.sheetErrors, []);
    },
  },
  {
    name: 'blind trial: four rounds by keyboard, X hidden until the end, tally with the binomial chance, CSV and JSON exports',
    fn: async (ctx) => {
      const p = await sheetPage(ctx);
      await tab(p, 'Blind trial');
      await p.getByTestId('trial-rounds').fill('4');
      await p.getByTestId('trial-rounds').press('Tab');
      await p.getByTestId('trial-start').click();
      await p.getByTestId('trial-round').waitFor({ timeout: 20_000 });
      const answers = ['1', '2', '2', '1'];
      for (let i = 0; i < 4; i++) {
        assert.equal(await p.getByTestId('trial-count').innerText(), `Round ${i + 1} of 4`);
        // X's identity is nowhere on the page during a round.
        assert.ok(!(await p.locator('#screen').innerText()).includes('X was'));
        await p.locator('body').click({ position: { x: 5, y: 5 } });
        await p.keyboard.press('x');
        await p.waitForFunction(() => document.querySelector('[data-testid=trial-hear-x]')?.getAttribute('aria-pressed') === 'true');
        await p.keyboard.press('a');
        await p.keyboard.press('b');
        await p.keyboard.press(answers[i]);
      }
      await p.getByTestId('trial-result').waitFor();
      const score = await p.getByTestId('trial-score').innerText();
      const m = /^(\d) of 4 right/.exec(score);
      assert.ok(m, score);
      const correct = Number(m[1]);
      // P(X >= k) for Binomial(4, 1/2): sum of C(4, j) for j >= k over 16.
      const tail = [16, 15, 11, 5, 1][correct] / 16;
      const [dl] = await Promise.all([p.waitForEvent('download'), p.getByTestId('trial-csv').click()]);
      const csv = readFileSync(await dl.path(), 'utf8')
        .trim()
        .split('\r\n');
      assert.equal(csv.length, 5);
      const head = csv[0].split(',');
      const row1 = csv[1].match(/("([^"]|"")*"|[^,]*)(,|$)/g).map((f) => f.replace(/,$/, '').replace(/^"|"$/g, '').replace(/""/g, '"'));
      assert.equal(row1[head.indexOf('design_a')], 'Living-room monitor, sealed 14 l');
      assert.equal(row1[head.indexOf('design_b')], 'Living-room monitor, vented 20 l');
      assert.equal(row1[head.indexOf('match_levels')], 'yes');
      assert.ok(Math.abs(Number(row1[head.indexOf('p_guess')]) - tail) < 1e-5, `p_guess ${row1[head.indexOf('p_guess')]} vs ${tail}`);
      const [dj] = await Promise.all([p.waitForEvent('download'), p.getByTestId('trial-json').click()]);
      const json = JSON.parse(readFileSync(await dj.path(), 'utf8'));
      assert.equal(json.rounds.length, 4);
      assert.deepEqual(
        json.rounds.map((r) => r.answer),
        answers.map((k) => (k === '1' ? 'a' : 'b')),
      );
      assert.equal(json.tally.correct, correct);
      assert.ok(json.settings.loop && json.settings.loop.endS > json.settings.loop.startS);
      assert.equal(json.rounds.filter((r) => r.answer === r.x).length, correct);
      for (const r of json.rounds) assert.deepEqual(r.plays, { a: 1, b: 1, x: 1 });
      await p.screenshot({ path: join(SHOTS, 'desktop-blind-trial.png') });
      writeFileSync(join(TMP, 'trial.json'), JSON.stringify(json));
      assert.deepEqual(ctx.state.sheetErrors, []);
      await p.close();
    },
  },
];
