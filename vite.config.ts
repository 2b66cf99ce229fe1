import { fileURLToPath } from 'node:url';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

const here = (p: string) => fileURLToPath(new URL(p, import.meta.url));

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: {
    alias: {
      '@shared': here('./shared'),
      '@server': here('./server'),
      '@': here('./src'),
    },
  },
  build: { outDir: 'dist/web', emptyOutDir: true, sourcemap: true },
  test: {
    projects: [
      {
        extends: true,
        test: { name: 'shared', include: ['tests/shared/**/*.test.ts'], environment: 'node' },
      },
      {
        extends: true,
        test: {
          name: 'server',
          include: ['tests/server/**/*.test.ts', 'tests/worker/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: { name: 'web', include: ['tests/web/**/*.test.tsx'], environment: 'jsdom' },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.e2e.ts'],
          environment: 'node',
          globalSetup: ['tests/e2e/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 300_000,
        },
      },
    ],
  },
});
