// Shared plumbing for the browser tests (test/e2e/run.mjs) and the UI benchmark (test/bench/ui-redraw.ts):
// Debian's chromium, a production build, `vite preview` on 127.0.0.1, a browser that may talk to nobody else.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const CHROMIUM = '/usr/bin/chromium';
const VITE = join(ROOT, 'node_modules', 'vite', 'bin', 'vite.js');

/** Installs Debian's chromium with apt when it is missing and we are root; otherwise explains how. */
export function ensureChromium() {
  if (existsSync(CHROMIUM)) return;
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  if (!isRoot) {
    throw new Error(
      `The browser tests need Debian's chromium at ${CHROMIUM}, which is missing.\n` +
        `Install it with:  sudo apt-get update && sudo apt-get install -y chromium\n` +
        `(or run the tests as root and they install it themselves).`,
    );
  }
  console.log(`[e2e] ${CHROMIUM} is missing: installing Debian's chromium with apt-get`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  for (const args of [['update'], ['install', '-y', 'chromium']]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env });
    if (r.status !== 0) throw new Error(`apt-get ${args.join(' ')} failed with exit code ${r.status}`);
  }
  if (!existsSync(CHROMIUM)) throw new Error(`apt-get finished but ${CHROMIUM} is still missing`);
}

/** pdfinfo / pdftotext / pdftoppm (Debian's poppler-utils) for the printed Client sheet; installed with apt when root. */
export function ensurePoppler() {
  const has = () => spawnSync('pdftotext', ['-v'], { stdio: 'ignore' }).status === 0;
  if (has()) return;
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  if (!isRoot) {
    throw new Error(
      'The Client sheet test reads the printed PDF with poppler-utils, which is missing.\nInstall it with:  sudo apt-get update && sudo apt-get install -y poppler-utils',
    );
  }
  console.log("[e2e] pdftotext is missing: installing Debian's poppler-utils with apt-get");
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  for (const args of [['update'], ['install', '-y', 'poppler-utils']]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env });
    if (r.status !== 0) throw new Error(`apt-get ${args.join(' ')} failed with exit code ${r.status}`);
  }
  if (!has()) throw new Error('apt-get finished but pdftotext is still missing');
}

/** A production build into outDir (relative to the project root); `buildId` marks a distinct version. */
export function buildApp(outDir = 'dist', buildId = '') {
  const r = spawnSync(process.execPath, [VITE, 'build', '--logLevel', 'warn', '--outDir', outDir, '--emptyOutDir'], {
    cwd: ROOT,
    stdio: 'inherit',
    env: { ...process.env, VITE_BUILD_ID: buildId },
  });
  if (r.status !== 0) throw new Error(`vite build failed with exit code ${r.status}`);
}

export function freePort() {
  return new Promise((resolvePort, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolvePort(port));
    });
  });
}

async function waitForHttp(url, child, timeoutMs) {
  const t0 = Date.now();
  while (Date.now() - t0 < timeoutMs) {
    if (child.exitCode !== null) throw new Error(`vite preview exited early with code ${child.exitCode}`);
    try {
      const res = await fetch(url);
      if (res.ok) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`vite preview did not answer at ${url} within ${timeoutMs} ms`);
}

/**
 * Serves outDir with `vite preview` on 127.0.0.1:port (a free port when omitted).
 * Returns { origin, port, stop() }; stop() resolves once the process has exited and the port is closed.
 */
export async function startPreview({ outDir = 'dist', port } = {}) {
  const p = port ?? (await freePort());
  const child = spawn(process.execPath, [VITE, 'preview', '--host', '127.0.0.1', '--port', String(p), '--strictPort', '--outDir', outDir], {
    cwd: ROOT,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let log = '';
  child.stdout.on('data', (d) => (log += d));
  child.stderr.on('data', (d) => (log += d));
  const origin = `http://127.0.0.1:${p}`;
  try {
    await waitForHttp(origin + '/', child, 20_000);
  } catch (e) {
    child.kill('SIGTERM');
    throw new Error(`${e.message}\n${log}`);
  }
  const stop = () =>
    new Promise((done) => {
      if (child.exitCode !== null || child.signalCode !== null) return done();
      child.once('exit', () => done());
      child.kill('SIGTERM');
    });
  return { origin, port: p, stop };
}

/**
 * Headless chromium with a fresh profile. Every request to a host other than `origin` is aborted and
 * recorded in `offHost` (the app must never reach out); the resolver also maps every other host to nothing.
 */
export async function launchBrowser(origin, extraArgs = []) {
  const { chromium } = await import('playwright-core');
  const profile = mkdtempSync(join(tmpdir(), 'preheard-e2e-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    serviceWorkers: 'allow',
    viewport: { width: 1440, height: 900 },
    acceptDownloads: true,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      // Belt and braces beside the request routing: no other host even resolves.
      '--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1',
      ...extraArgs,
    ],
  });
  const offHost = [];
  const local = (url) => url.startsWith(origin + '/') || url === origin || /^(data|blob|about|chrome-extension):/.test(url);
  await context.route('**/*', (route) => {
    const url = route.request().url();
    if (local(url)) return route.continue();
    offHost.push(url);
    return route.abort('blockedbyclient');
  });
  context.on('request', (req) => {
    const url = req.url();
    if (!local(url) && !offHost.includes(url)) offHost.push(url);
  });
  const close = async () => {
    await context.close().catch(() => {});
    rmSync(profile, { recursive: true, force: true });
  };
  return { context, offHost, close };
}
