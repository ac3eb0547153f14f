/** Architecture rules, checked by `npm test` (npm run deps). Each rule says why it exists. */
module.exports = {
  forbidden: [
    {
      name: 'no-circular',
      severity: 'error',
      comment: 'An import loop makes load order matter and hides which part depends on which.',
      from: {},
      to: { circular: true },
    },
    {
      name: 'feature-through-entry',
      severity: 'error',
      comment:
        "A server feature reaches another only through that feature's index.ts, so a folder's inside can change without breaking its neighbours. platform/ and access/ are what every feature uses; model files may name each other's classes for associations.",
      from: { path: '^server/([^/]+)/', pathNot: '(-model|/models)\\.ts$' },
      to: { path: '^server/[^/]+/.+', pathNot: ['^server/$1/', '^server/(platform|access)/', '^server/[^/]+/index\\.ts$'] },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    exclude: { path: '(^|/)(node_modules|dist|\\.build)/' },
    tsPreCompilationDeps: true,
    tsConfig: { fileName: 'tsconfig.server.json' },
    enhancedResolveOptions: { extensions: ['.ts', '.mts', '.js', '.mjs', '.vue', '.json'] },
  },
}
