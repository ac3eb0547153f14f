import { spawnSync } from 'node:child_process'
import { copyFileSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join, resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'

// The house rules (npm run lint, format:check, deps) only hold the code if they can fail: each check
// here feeds the real tool with the project's real config a sample that breaks one rule, and one
// that keeps it.
const root = resolve(__dirname, '../..')
const bin = (name: string) => join(root, 'node_modules', '.bin', name)
const SLOW = 120_000

function run(name: string, args: string[], options: { cwd?: string; input?: string } = {}) {
  const result = spawnSync(bin(name), args, { cwd: options.cwd ?? root, input: options.input, encoding: 'utf8' })
  return { status: result.status, stdout: result.stdout, stderr: result.stderr }
}

describe('dependency rules', () => {
  let fixture: string
  let exitCode: number | null
  let found: string[]

  // A miniature project laid out like ours: each file breaks one rule, or shows an import that is allowed.
  const files: Record<string, string> = {
    'shared/_probe.ts': "import { secret } from '../server/tanks/tanks'\nexport const leak = secret\n",
    'shared/pure.ts': "import { join } from 'node:path'\nexport const pure = join('a', 'b')\n",
    'src/probe.ts': "import { secret } from '../server/tanks/tanks'\nimport { pure } from '../shared/pure'\nexport const seen = [secret, pure]\n",
    'simulator/probe.ts': "import { secret } from '../server/tanks/tanks'\nimport { pure } from '../shared/pure'\nexport const sent = [secret, pure]\n",
    'server/platform/probe.ts':
      "import { secret } from '../tanks/tanks'\nimport { createServer } from 'node:http'\nexport const plumbing = [secret, createServer]\n",
    'server/tanks/tanks.ts': "export const secret = 'tank'\n",
    'server/tanks/routes.ts': "import { secret } from './tanks'\nexport const tanksRouter = () => secret\n",
    'server/tanks/report-routes.ts': "export const reportRoutes = () => 'report'\n",
    'server/tanks/uses-routes.ts': "import { reportRoutes } from './report-routes'\nexport const wrong = reportRoutes\n",
    'server/api-router.ts':
      "import { tanksRouter } from './tanks/routes'\nimport { reportRoutes } from './tanks/report-routes'\nexport const api = [tanksRouter, reportRoutes]\n",
    'server/care/probe.ts': "import { secret } from '../tanks/tanks'\nimport { door } from '../tanks'\nexport const reach = [secret, door]\n",
    'server/tanks/index.ts': "export { secret as door } from './tanks'\n",
    'server/loop-a.ts': "import { b } from './loop-b'\nexport const a = () => b\n",
    'server/loop-b.ts': "import { a } from './loop-a'\nexport const b = () => a\n",
  }

  beforeAll(() => {
    fixture = mkdtempSync(join(tmpdir(), 'tw-house-rules-'))
    for (const [path, text] of Object.entries(files)) {
      mkdirSync(dirname(join(fixture, path)), { recursive: true })
      writeFileSync(join(fixture, path), text)
    }
    copyFileSync(join(root, 'tsconfig.json'), join(fixture, 'tsconfig.json'))
    // The same command and output as `npm run deps`.
    const result = run('depcruise', ['server', 'shared', 'src', 'simulator', '--config', join(root, '.dependency-cruiser.cjs')], { cwd: fixture })
    exitCode = result.status
    // `  error rule: from → to`; a loop prints its first file on the line and the rest below.
    found = [...result.stdout.matchAll(/^\s*error (\S+): (\S+) →(?: (\S+))? *$/gm)]
      .map(([, rule, from, to]) => `${rule}: ${from}${to ? ` → ${to}` : ''}`)
      .sort()
  }, SLOW)
  afterAll(() => rmSync(fixture, { recursive: true, force: true }))

  it('names every forbidden import, and only those', () => {
    expect(found).toEqual(
      [
        'shared-stays-isomorphic: shared/_probe.ts → server/tanks/tanks.ts',
        'client-not-server: src/probe.ts → server/tanks/tanks.ts',
        'simulator-uses-public-contract: simulator/probe.ts → server/tanks/tanks.ts',
        'platform-knows-no-feature: server/platform/probe.ts → server/tanks/tanks.ts',
        'routes-only-from-api-router: server/tanks/uses-routes.ts → server/tanks/report-routes.ts',
        'no-circular: server/loop-a.ts',
        // A feature reaches another through its index.ts only (platform/ is told off for both reasons).
        'feature-through-entry: server/care/probe.ts → server/tanks/tanks.ts',
        'feature-through-entry: server/platform/probe.ts → server/tanks/tanks.ts',
      ].sort(),
    )
  })

  it('fails the run (its exit code counts the errors)', () => {
    expect(exitCode).toBe(8)
  })
})

describe('lint', () => {
  const lint = (filename: string, text: string) => {
    const result = run('eslint', ['--max-warnings', '0', '--format', 'json', '--stdin', '--stdin-filename', filename], { input: text })
    const [file] = JSON.parse(result.stdout) as Array<{ messages: Array<{ ruleId: string; line: number }> }>
    return { status: result.status, rules: file!.messages.map((m) => `${m.line} ${m.ruleId}`) }
  }

  it(
    'fails on an unused variable, and lets a name with a leading underscore or a left-out field pass',
    () => {
      const text = 'const unused = 1\nconst _kept = 2\nconst { dropped, ...rest } = { dropped: 1, kept: 2 }\nexport { rest }\n'
      expect(lint('tests/unit/_probe.ts', text)).toEqual({ status: 1, rules: ['1 @typescript-eslint/no-unused-vars'] })
    },
    SLOW,
  )

  it(
    'fails on an eslint-disable comment without its reason, and takes one with a reason',
    () => {
      const bare = '// eslint-disable-next-line prefer-const\nlet a = 1\nexport { a }\n'
      expect(lint('server/_probe.ts', bare)).toEqual({ status: 1, rules: ['1 house/disable-needs-reason'] })
      const reasoned = '// eslint-disable-next-line prefer-const -- a sample that keeps the rule\nlet a = 1\nexport { a }\n'
      expect(lint('server/_probe.ts', reasoned)).toEqual({ status: 0, rules: [] })
    },
    SLOW,
  )

  it(
    'lets a form section edit its draft prop but not replace it',
    () => {
      const component = [
        '<script setup lang="ts">',
        'const props = defineProps<{ draft: { name: string } }>()',
        "const rename = () => (props.draft.name = 'Quarantine 2')",
        "const replace = () => (props.draft = { name: 'Quarantine 3' })",
        '</script>',
        '',
        '<template>',
        '  <input v-model="draft.name" @change="rename" @input="replace" />',
        '</template>',
        '',
      ].join('\n')
      expect(lint('src/components/_Probe.vue', component)).toEqual({ status: 1, rules: ['4 vue/no-mutating-props'] })
    },
    SLOW,
  )
})

describe('format', () => {
  it(
    'prints the house style: single quotes, no semicolons, trailing commas in wrapped lists',
    () => {
      const call = `const tanks = ["${'a'.repeat(60)}", "${'b'.repeat(60)}", "${'c'.repeat(60)}"];\n`
      const result = run('prettier', ['--stdin-filepath', 'shared/_probe.ts'], { input: call })
      expect(result.status).toBe(0)
      expect(result.stdout).toBe(`const tanks = [\n  '${'a'.repeat(60)}',\n  '${'b'.repeat(60)}',\n  '${'c'.repeat(60)}',\n]\n`)
    },
    SLOW,
  )
})
