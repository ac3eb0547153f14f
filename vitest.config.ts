import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vitest/config'
import { BaseSequencer, type TestSpecification } from 'vitest/node'
import vue from '@vitejs/plugin-vue'
import vuetify from 'vite-plugin-vuetify'
import { createRequire } from 'node:module'

const alias = {
  '@': fileURLToPath(new URL('./src', import.meta.url)),
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
}

// Every file has its own database, ports and processes, so all projects share one pool of workers.
// The longest files start first and the short ones fill in around them: the stress suites (mostly
// waiting on child processes and real clocks), the API files, the browser tests (which wait for the
// client build scripts/test.mjs runs beside vitest), then component and unit tests; `stress-alone`
// after them all. Within a project vitest's own order holds: longest first by the last run's
// durations, else larger files first.
const PROJECT_ORDER = ['stress', 'api', 'e2e', 'components', 'unit', 'stress-alone']
const ALONE = ['tests/stress/hostile-load.test.ts']
class LongestFirst extends BaseSequencer {
  async sort(files: TestSpecification[]) {
    const rank = (spec: TestSpecification) => PROJECT_ORDER.indexOf(spec.project.name)
    return (await super.sort(files)).sort((a, b) => rank(a) - rank(b))
  }
}

// Component tests get Vuetify pre-bundled once per run (vitest's dependency optimizer) instead of
// hundreds of its modules transformed and evaluated for every file: every entry the auto-import
// plugin can name (Vuetify's own import map) and the ones the app imports by hand. Vuetify's CSS
// imports become empty modules, as vitest's `css: false` makes them anyway.
const vuetifyImportMap = createRequire(import.meta.url)('vuetify/dist/json/importMap.json') as { components: Record<string, { from: string }> }
const VUETIFY_ENTRIES = [
  'vuetify',
  'vuetify/components',
  'vuetify/directives',
  'vuetify/iconsets/mdi-svg',
  ...new Set(Object.values(vuetifyImportMap.components).map((c) => `vuetify/${c.from}`)),
]
const vuetifyCssOff = {
  name: 'vuetify-css-off',
  resolveId: (id: string) => (id.endsWith('.css') ? { id: '\0css-off', moduleSideEffects: false } : null),
  load: (id: string) => (id === '\0css-off' ? 'export {}' : null),
}

// Projects: pure unit tests, API/integration tests over a real PostgreSQL (DATABASE_URL from
// scripts/test.mjs), component tests in jsdom, browser tests, and stress suites (several processes,
// external broker, faults, fuzzing).
export default defineConfig({
  test: {
    // Three workers on two cores: much of every test is waiting (PostgreSQL, child processes,
    // Chromium, timers), so a third keeps both cores busy. VITEST_MAX_WORKERS (vitest's own) overrides it.
    maxWorkers: 3,
    sequence: { sequencer: LongestFirst },
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
          // Room for a test waiting its turn for a core among three workers and other jobs.
          testTimeout: 60000,
          hookTimeout: 60000,
          // A worker imports the server once and runs file after file (DEVELOPERS.md, Tests).
          isolate: false,
        },
      },
      {
        plugins: [vue(), vuetify({ autoImport: true })],
        // Only the client build makes vite-plugin-pwa's module; component tests get a stand-in.
        resolve: { alias: { ...alias, 'virtual:pwa-register/vue': fileURLToPath(new URL('./tests/components/stubs/pwa-register-vue.ts', import.meta.url)) } },
        test: {
          name: 'components',
          include: ['tests/components/**/*.test.ts'],
          environment: 'jsdom',
          setupFiles: ['tests/components/setup.ts'],
          server: { deps: { inline: ['vuetify'] } },
          deps: { optimizer: { client: { enabled: true, include: VUETIFY_ENTRIES, rolldownOptions: { plugins: [vuetifyCssOff] } } } },
          // Mounting Vuetify in jsdom is all CPU: a test may wait its turn among three workers.
          testTimeout: 30000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/helpers/global-setup.ts'],
          // Waits for the client build when scripts/test.mjs runs it beside vitest.
          setupFiles: ['tests/e2e/setup.ts'],
          // A sign-in may be retried once on a busy machine (tests/e2e/browser.ts).
          testTimeout: 120000,
          hookTimeout: 120000,
          // Like the api project: a worker imports the server once for all its files.
          isolate: false,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'stress',
          include: ['tests/stress/**/*.test.ts'],
          exclude: ALONE,
          environment: 'node',
          globalSetup: ['tests/helpers/global-setup.ts'],
          testTimeout: 120000,
          hookTimeout: 120000,
          isolate: false,
        },
      },
      {
        resolve: { alias },
        test: {
          // Suites that measure latency and memory under attack, and so would measure the other
          // workers too: vitest runs a project without file parallelism after all the others, alone.
          name: 'stress-alone',
          include: ALONE,
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
