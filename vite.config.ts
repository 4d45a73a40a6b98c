/// <reference types="vitest/config" />
import { defineConfig, type PluginOption } from 'vite';
import preact from '@preact/preset-vite';
import { VitePWA } from 'vite-plugin-pwa';
import { readFileSync } from 'node:fs';

const pkg = JSON.parse(readFileSync(new URL('./package.json', import.meta.url), 'utf8')) as { version: string };

// The app is served from the local machine only: no web fonts, CDNs or analytics.
// The service worker precaches the whole built app so it works offline after the first load;
// src/ui/pwa.ts registers it with workbox-window in production builds only.
export default defineConfig(({ mode }) => {
  const plugins: PluginOption[] = [preact()];
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
    server: { host: '127.0.0.1', port: 5173, strictPort: true },
    preview: { host: '127.0.0.1' },
    build: { target: 'es2022', sourcemap: false, chunkSizeWarningLimit: 600 },
    test: {
      include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
      exclude: ['test/e2e/**', 'node_modules/**'],
      environment: 'node',
      testTimeout: 60_000,
    },
  };
});
