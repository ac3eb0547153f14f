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
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    exclude: { path: '(^|/)(node_modules|dist|\\.build)/' },
    tsPreCompilationDeps: true,
    tsConfig: { fileName: 'tsconfig.server.json' },
    enhancedResolveOptions: { extensions: ['.ts', '.mts', '.js', '.mjs', '.vue', '.json'] },
  },
}
