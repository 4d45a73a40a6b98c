/// <reference types="vitest/config" />
import { build, defineConfig, type Plugin, type PluginOption } from 'vite';
import preact from '@preact/preset-vite';
import { VitePWA } from 'vite-plugin-pwa';
import { readFileSync } from 'node:fs';

const pkg = JSON.parse(readFileSync(new URL('./package.json', import.meta.url), 'utf8')) as { version: string };

/**
 * Dev server only: the audio worklet is served bundled into one classic script, as the production
 * build does. Unbundled ES modules cannot run inside it, because standardized-audio-context
 * re-wraps the processor's source before adding it.
 */
function bundledWorkletInDev(): Plugin {
  return {
    name: 'preheard-bundled-worklet-in-dev',
    apply: 'serve',
    configureServer(server) {
      server.middlewares.use(async (req, res, next) => {
        const url = req.url ?? '';
        if (!/\.worklet\.ts\?(.*&)?worker_file/.test(url)) return next();
        try {
          const entry = new URL('.' + url.split('?')[0], import.meta.url).pathname;
          const out = await build({
            configFile: false,
            logLevel: 'silent',
            build: {
              write: false,
              target: 'es2022',
              minify: false,
              lib: { entry, formats: ['iife'], name: 'preheardWorklet', fileName: () => 'worklet.js' },
            },
          });
          const chunk = (Array.isArray(out) ? out[0] : out) as { output: { code?: string }[] };
          res.setHeader('Content-Type', 'text/javascript');
          res.end(chunk.output[0].code ?? '');
        } catch (e) {
          next(e);
        }
      });
    },
  };
}

/**
 * The Content-Security-Policy, one definition for the meta tag and the served header. Only the dev
 * server (hot reload) may open a WebSocket, to itself; `frame-ancestors` works only as a header, so
 * the preview server (`npm start`) sends it there and no other page can frame the app.
 */
function contentSecurityPolicy(dev: boolean): string {
  return [
    "default-src 'self'",
    // WebAssembly may be compiled (the engine's two-lane model loop, sim/woofer-pair.ts); eval and
    // new Function stay refused.
    "script-src 'self' blob: 'wasm-unsafe-eval'",
    "worker-src 'self' blob:",
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "media-src 'self' blob:",
    dev ? "connect-src 'self' ws://127.0.0.1:5173 ws://localhost:5173" : "connect-src 'self'",
    "font-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'none'",
  ].join('; ');
}

const HEADER_ONLY = "; frame-ancestors 'none'";

/**
 * Cross-origin isolation: the page may then share memory with its Workers, which lets the render
 * worker run a second thread (src/audio/lane-helper.ts). Everything the app loads is its own, so
 * requiring same-origin resources costs nothing.
 */
const ISOLATION = { 'Cross-Origin-Opener-Policy': 'same-origin', 'Cross-Origin-Embedder-Policy': 'require-corp' };

/** Puts the policy into index.html's meta tag for this mode. */
function cspMeta(dev: boolean): Plugin {
  return {
    name: 'preheard-csp-meta',
    transformIndexHtml: (html) => html.replace('%PREHEARD_CSP%', contentSecurityPolicy(dev)),
  };
}

// The app is served from the local machine only: no web fonts, CDNs or analytics.
// The service worker precaches the whole built app so it works offline after the first load;
// src/ui/pwa.ts registers it with workbox-window in production builds only.
export default defineConfig(({ mode, command }) => {
  const dev = command === 'serve' && mode !== 'production';
  const plugins: PluginOption[] = [preact(), bundledWorkletInDev(), cspMeta(dev)];
  if (mode !== 'test') {
    plugins.push(
      VitePWA({
        strategies: 'generateSW',
        injectRegister: false,
        registerType: 'prompt',
        filename: 'sw.js',
        manifest: false,
        includeAssets: ['favicon.svg', 'icons/*.png', 'icons/*.svg', 'examples/*.json'],
        workbox: {
          // An inlined workbox runtime writes a very large map file; nobody debugs the SW from it.
          sourcemap: false,
          globPatterns: ['**/*.{js,css,html,svg,png,json,webmanifest}'],
          navigateFallback: 'index.html',
          cleanupOutdatedCaches: true,
        },
        devOptions: { enabled: false },
      }),
    );
  }
  return {
    plugins,
    define: { __APP_VERSION__: JSON.stringify(pkg.version) },
    server: {
      host: '127.0.0.1',
      port: 5173,
      strictPort: true,
      headers: { 'Content-Security-Policy': contentSecurityPolicy(true) + HEADER_ONLY, ...ISOLATION },
    },
    preview: {
      host: '127.0.0.1',
      headers: { 'Content-Security-Policy': contentSecurityPolicy(false) + HEADER_ONLY, 'X-Frame-Options': 'DENY', ...ISOLATION },
    },
    build: { target: 'es2022', sourcemap: false, chunkSizeWarningLimit: 600 },
    test: {
      include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
      exclude: ['test/e2e/**', 'node_modules/**'],
      environment: 'node',
      testTimeout: 60_000,
      // The CLI bundle that subprocess tests run (scripts/build-cli.mjs).
      globalSetup: ['test/global-setup.ts'],
    },
  };
});
