import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vitest/config'
import vue from '@vitejs/plugin-vue'
import vuetify from 'vite-plugin-vuetify'

const alias = {
  '@': fileURLToPath(new URL('./src', import.meta.url)),
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
}

// Projects: pure unit tests, API/integration tests over a real PostgreSQL (DATABASE_URL from
// scripts/test.mjs), component tests in jsdom, browser tests, and stress suites (several processes,
// external broker, faults, fuzzing) that run one file at a time.
export default defineConfig({
  test: {
    projects: [
      {
        resolve: { alias },
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' },
      },
      {
        resolve: { alias },
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts', 'tests/mqtt/**/*.test.ts', 'tests/mail/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/helpers/global-setup.ts'],
          testTimeout: 20000,
          hookTimeout: 30000,
        },
      },
      {
        plugins: [vue(), vuetify({ autoImport: true })],
        resolve: { alias },
        test: {
          name: 'components',
          include: ['tests/components/**/*.test.ts'],
          environment: 'jsdom',
          setupFiles: ['tests/components/setup.ts'],
          server: { deps: { inline: ['vuetify'] } },
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/helpers/global-setup.ts'],
          // A sign-in may be retried once on a busy machine (tests/e2e/browser.ts).
          testTimeout: 120000,
          hookTimeout: 120000,
          fileParallelism: false,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'stress',
          include: ['tests/stress/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/helpers/global-setup.ts'],
          testTimeout: 120000,
          hookTimeout: 120000,
          fileParallelism: false,
        },
      },
    ],
  },
})
