/// <reference types="vitest/config" />
import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';
import { VitePWA } from 'vite-plugin-pwa';

const alias = {
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
  '@': fileURLToPath(new URL('./src', import.meta.url)),
};
const apiTarget = `http://127.0.0.1:${process.env.PORT ?? '5180'}`;

// The installable app: Workbox precaches the shell, fonts and icons; a new version waits until the person reloads
// (src/offline/app-update.ts), so a round is never cut off. The API is never cached: rounds wait in IndexedDB instead.
const pwa = VitePWA({
  registerType: 'prompt',
  injectRegister: false,
  manifest: {
    id: '/',
    name: 'Brimstock',
    short_name: 'Brimstock',
    description: 'Water and home-brewed input stock across your farms: tank rounds, the stock board and reorders.',
    start_url: '/',
    scope: '/',
    display: 'standalone',
    orientation: 'any',
    theme_color: '#154349',
    background_color: '#f5f7f8',
    icons: [
      { src: '/icons/brimstock-192.png', sizes: '192x192', type: 'image/png', purpose: 'any' },
      { src: '/icons/brimstock-512.png', sizes: '512x512', type: 'image/png', purpose: 'any' },
      { src: '/icons/brimstock-maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
      { src: '/icons/brimstock.svg', sizes: 'any', type: 'image/svg+xml', purpose: 'any' },
    ],
  },
  workbox: {
    globPatterns: ['**/*.{js,css,html,svg,png,woff2}'],
    // Only the latin subsets of the fonts, and not the password checker's word lists (1.6 MB, for setting a
    // password, which needs the server anyway): those are kept once a page has fetched them (runtimeCaching).
    globIgnores: ['**/open-sans-{cyrillic,cyrillic-ext,greek,greek-ext,vietnamese,hebrew,math,symbols}-*', '**/passwords-*.js'],
    runtimeCaching: [{ urlPattern: /\/assets\//, handler: 'CacheFirst', options: { cacheName: 'brimstock-assets', expiration: { maxEntries: 80 } } }],
    navigateFallback: '/index.html',
    navigateFallbackDenylist: [/^\/api\//, /^\/socket\.io\//],
    cleanupOutdatedCaches: true,
    maximumFileSizeToCacheInBytes: 3 * 1024 * 1024,
  },
});

export default defineConfig({
  plugins: [vue(), pwa],
  resolve: { alias },
  server: {
    host: '127.0.0.1',
    port: Number(process.env.VITE_PORT ?? 5173),
    proxy: {
      '/api': apiTarget,
      '/socket.io': { target: apiTarget, ws: true },
    },
  },
  build: { outDir: process.env.BUILD_OUT_DIR ?? 'dist', emptyOutDir: true },
  test: {
    projects: [
      { extends: true, test: { name: 'shared', include: ['tests/shared/**/*.test.ts'], environment: 'node' } },
      { extends: true, test: { name: 'client', include: ['tests/client/**/*.test.ts'], environment: 'happy-dom', setupFiles: ['tests/client/support/setup.ts'] } },
      {
        extends: true,
        test: {
          name: 'server',
          include: ['tests/server/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-database.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-app.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
});
