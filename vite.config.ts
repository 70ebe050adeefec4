/// <reference types="vitest/config" />
import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';

const alias = {
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
  '@': fileURLToPath(new URL('./src', import.meta.url)),
};
const apiTarget = `http://127.0.0.1:${process.env.PORT ?? '5180'}`;

export default defineConfig({
  plugins: [vue()],
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
      { extends: true, test: { name: 'client', include: ['tests/client/**/*.test.ts'], environment: 'happy-dom' } },
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
