/// <reference types="vitest/config" />
import { fileURLToPath } from 'node:url';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vite';

const fromRoot = (relative: string) => fileURLToPath(new URL(relative, import.meta.url));

// In development Vite serves the client on 5173 and hands /api and /auth to the Express app on 3000,
// so the session cookie stays same-origin exactly as it is in production (one process on 3000).
const apiTarget = 'http://localhost:3000';

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: {
    alias: {
      '@': fromRoot('./src'),
      '@shared': fromRoot('./shared'),
    },
  },
  server: {
    port: 5173,
    strictPort: true,
    proxy: {
      '/api': { target: apiTarget, changeOrigin: false },
      '/auth': { target: apiTarget, changeOrigin: false },
    },
  },
  build: {
    outDir: 'dist/client',
    emptyOutDir: true,
  },
  test: {
    include: ['tests/**/*.test.{ts,tsx}'],
    environment: 'node',
    globalSetup: ['tests/helpers/global-setup.ts'],
    setupFiles: ['tests/helpers/setup-env.ts'],
    testTimeout: 60000, hookTimeout: 180000,
    fileParallelism: false,
    reporters: ['default', './tests/helpers/summary-reporter.ts'],
  },
});
