import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { fileURLToPath } from 'node:url';

const r = (p: string) => fileURLToPath(new URL(p, import.meta.url));

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: { alias: { '@shared': r('./shared'), '@': r('./src') } },
  server: {
    port: 5173,
    proxy: { '/api': 'http://127.0.0.1:5180', '/lot': 'http://127.0.0.1:5180', '/inspect': 'http://127.0.0.1:5180' },
    watch: { ignored: ['**/.data/**'] },
  },
  build: { outDir: process.env.VITE_OUT_DIR ?? 'dist', emptyOutDir: true, chunkSizeWarningLimit: 600 },
  test: {
    include: ['tests/**/*.test.{ts,tsx}'],
    globalSetup: ['tests/support/global-setup.ts'],
    testTimeout: 30_000,
    hookTimeout: 120_000,
    pool: 'forks',
    maxWorkers: 2,
  },
});
