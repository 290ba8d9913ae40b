import { defineConfig } from 'vite';
// Also brings vitest's `test` key into vite's config type (it replaces the triple-slash reference).
import { configDefaults } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { fileURLToPath } from 'node:url';

const apiPort = Number(process.env.PORT ?? 8470);

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: { alias: { '@shared': fileURLToPath(new URL('./shared', import.meta.url)) } },
  build: { outDir: 'dist/web', emptyOutDir: true, chunkSizeWarningLimit: 900 },
  server: {
    proxy: {
      '/api': `http://127.0.0.1:${apiPort}`,
      '/socket.io': { target: `http://127.0.0.1:${apiPort}`, ws: true },
    },
  },
  test: {
    include: ['tests/**/*.test.ts'],
    // The scale test (2 API nodes, 2 ingest workers, Redis; ~1 min) runs in CI and on request.
    exclude: [...configDefaults.exclude, ...(process.env.CI === 'true' || process.env.FERRISIGHT_SCALE === '1' ? [] : ['tests/scale/**'])],
    testTimeout: 30_000,
    hookTimeout: 60_000,
    pool: 'forks',
    maxWorkers: 2,
  },
});
