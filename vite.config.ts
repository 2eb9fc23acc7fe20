import { fileURLToPath, URL } from 'node:url'
import { defineConfig, type ViteUserConfig } from 'vitest/config'
import vue from '@vitejs/plugin-vue'
import { CSP_NONCE_PLACEHOLDER } from './server/middleware/csp-nonce.ts'

const apiTarget = `http://127.0.0.1:${process.env.PORT ?? '4780'}`

const config: ViteUserConfig = {
  plugins: [vue()],
  envDir: false,
  // The server writes each response's nonce over this placeholder (server/middleware/client-page.ts).
  html: { cspNonce: CSP_NONCE_PLACEHOLDER },
  // Everything the client ships lives under src/; the root holds no public/ folder.
  publicDir: false,
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  server: {
    host: '127.0.0.1',
    proxy: { '/api': { target: apiTarget, changeOrigin: false } },
  },
  build: {
    outDir: 'dist',
    chunkSizeWarningLimit: 1500,
  },
  test: {
    // Each project runs in its own environment; API and browser files share one MariaDB
    // server but each vitest worker gets a database of its own (tests/support/test-db.ts).
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: [
            'tests/shared/**/*.test.ts',
            'tests/client/**/*.test.ts',
            'tests/server/unit/**/*.test.ts',
          ],
          environment: 'node',
        },
      },
      {
        extends: true,
        test: {
          name: 'api',
          include: ['tests/server/**/*.api.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts'],
          setupFiles: ['tests/support/register-tsx.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'browser',
          include: ['tests/browser/**/*.browser.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts'],
          setupFiles: ['tests/support/register-tsx.ts'],
          testTimeout: 90_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
}

export default defineConfig(({ command }) => {
  // The project's .env is the server's (NODE_ENV=development by default) and npm scripts load it
  // into every child's environment; Vite would then ship Vue's development runtime (devtools
  // hooks, warnings) in the production bundle, about 60 KB gzip more. A build is always a
  // production build; the client reads no value from .env.
  if (command === 'build') process.env.NODE_ENV = 'production'
  return config
})
