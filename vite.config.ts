import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vitest/config';
import vue from '@vitejs/plugin-vue';
import { quasar, transformAssetUrls } from '@quasar/vite-plugin';
import { compression, defineAlgorithm } from 'vite-plugin-compression2';

const apiPort = Number(process.env.PORT ?? 3000);

export default defineConfig({
  plugins: [
    vue({ template: { transformAssetUrls } }),
    // Plain CSS build of Quasar (imported in src/main.ts): no Sass toolchain needed.
    quasar({ sassVariables: false }),
    // gzip and brotli copies of every text asset, made once at build (server/static.ts serves
    // them by Accept-Encoding), so no request pays for compression.
    compression({
      include: /\.(js|mjs|css|html|svg|json|txt)$/,
      threshold: 0,
      algorithms: [defineAlgorithm('gzip', { level: 9 }), defineAlgorithm('brotliCompress')],
      logLevel: 'silent',
    }),
  ],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  server: {
    host: '127.0.0.1',
    port: 5173,
    strictPort: true,
    proxy: { '/api': `http://127.0.0.1:${apiPort}` },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    chunkSizeWarningLimit: 1500,
  },
  test: {
    // The server logs every request at info; tests keep only errors (set TACKLOG_LOG_LEVEL to see more).
    env: { TACKLOG_LOG_LEVEL: process.env.TACKLOG_LOG_LEVEL ?? 'error' },
    projects: [
      {
        extends: true,
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' },
      },
      {
        extends: true,
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          // kill -9 and PostgreSQL outages against the real `npm start` (tests/helpers/supervised.ts)
          name: 'fault',
          include: ['tests/fault/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 300_000,
          hookTimeout: 300_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/e2e/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 90_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
});
