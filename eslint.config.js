// Lint rules for every source and test file (`npm run lint`). Layout and spacing belong to Prettier
// (`npm run format`): eslint-config-prettier comes last and switches off every rule that would
// argue with it. A rule switched off here says why; a line-level `eslint-disable` says why beside it.
import js from '@eslint/js'
import prettier from 'eslint-config-prettier'
import vue from 'eslint-plugin-vue'
import globals from 'globals'
import tseslint from 'typescript-eslint'

// Our own rule: a line that switches a rule off says why, after ` -- `, so the next reader can judge
// whether the reason still holds (`// eslint-disable-next-line prefer-const -- the callback may …`).
const house = {
  rules: {
    'disable-needs-reason': {
      meta: {
        type: 'suggestion',
        docs: { description: 'An eslint-disable comment gives its reason after " -- ".' },
        schema: [],
        messages: { missing: 'Say why beside the eslint-disable comment: `eslint-disable-next-line rule -- reason`.' },
      },
      create(context) {
        return {
          Program() {
            for (const comment of context.sourceCode.getAllComments()) {
              const text = comment.value.trim()
              if (/^eslint-disable(-line|-next-line)?(\s|$)/.test(text) && !/\s--\s*\S/.test(text)) context.report({ loc: comment.loc, messageId: 'missing' })
            }
          },
        }
      },
    },
  },
}

export default tseslint.config(
  {
    ignores: ['**/node_modules/**', 'dist/**', '.build/**', 'test-results/**', '.data*/**', '.test-data/**', 'coverage/**'],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  ...vue.configs['flat/recommended'],
  {
    files: ['**/*.vue'],
    languageOptions: { parserOptions: { parser: tseslint.parser } },
  },
  {
    // The client runs in the browser; everything else (server, simulator, scripts, bench, tests,
    // configs) runs on Node. Component tests run in jsdom, so they see both.
    files: ['src/**/*.{ts,vue}', 'tests/components/**/*.ts', 'tests/e2e/**/*.ts', 'env.d.ts'],
    languageOptions: { globals: { ...globals.browser } },
  },
  {
    files: ['server/**', 'shared/**', 'simulator/**', 'scripts/**', 'bench/**', 'tests/**', '*.{js,cjs,mjs,ts}'],
    languageOptions: { globals: { ...globals.node } },
  },
  {
    plugins: { house },
    // A switch-off that no longer switches anything off is clutter with a stale reason.
    linterOptions: { reportUnusedDisableDirectives: 'error' },
    rules: {
      'house/disable-needs-reason': 'error',
      // A leading underscore marks a name kept on purpose (an Express error handler's fourth
      // argument), and `{ dropped, ...rest }` is how the code leaves fields out of an object.
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_', ignoreRestSiblings: true },
      ],
      // Input guards refuse control characters (file names, CSV cells, free text), so their
      // patterns name \x00–\x1f on purpose.
      'no-control-regex': 'off',
      // Form sections (TankSizeFields, BuildPlanForm, …) edit the fields of a draft object the
      // parent form owns and submits; replacing the prop itself is still an error.
      'vue/no-mutating-props': ['error', { shallowOnly: true }],
    },
  },
  {
    // Tests define small throwaway components beside the test that mounts them.
    files: ['tests/**'],
    rules: { 'vue/one-component-per-file': 'off' },
  },
  prettier,
)
