/** Architecture rules, checked by `npm test` (npm run deps). Each rule says why it exists. */

// What any file may import whatever its folder: Node's built-ins and installed packages.
const outsideTheProject = { dependencyTypesNot: ['core', 'npm', 'npm-dev', 'npm-optional', 'npm-peer', 'npm-bundled', 'npm-no-pkg'] }

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
    {
      name: 'shared-stays-isomorphic',
      severity: 'error',
      comment:
        'shared/ runs in the browser, on the server and in the simulator alike: it may import only itself and packages, ' +
        'never one of the programs that use it.',
      from: { path: '^shared/' },
      to: { path: '^(src|server|simulator)/' },
    },
    {
      name: 'client-not-server',
      severity: 'error',
      comment:
        'The client talks to the server over HTTP and WebSocket only; importing server/ or simulator/ code would bundle ' +
        'Node-only modules (and secrets handling) into the browser. Share code through shared/.',
      from: { path: '^src/' },
      to: { path: '^(server|simulator)/' },
    },
    {
      name: 'simulator-uses-public-contract',
      severity: 'error',
      comment:
        'The simulator stands for a real device: it speaks only the public MQTT/HTTP contract (shared/), so it may import ' +
        'itself, shared/ and packages, nothing of the server or client.',
      from: { path: '^simulator/' },
      to: { pathNot: '^(simulator|shared)/', ...outsideTheProject },
    },
    {
      name: 'platform-knows-no-feature',
      severity: 'error',
      comment:
        'server/platform/ is the plumbing every feature builds on (HTTP helpers, database, events, logging); when it imports ' +
        'a feature folder or the composition files (context, models, app), the layers stop being layers and loops follow. ' +
        'Move the shared piece into platform/ or shared/ instead.',
      from: { path: '^server/platform/' },
      to: { path: '^server/', pathNot: '^server/platform/' },
    },
    {
      name: 'routes-only-from-api-router',
      severity: 'error',
      comment:
        'A route file is an HTTP edge: only server/api-router.ts mounts it (tests may import it too). Logic another part ' +
        'needs lives in the feature services, which never see req/res.',
      from: { pathNot: ['^server/api-router\\.ts$', '^tests/'] },
      to: { path: ['^server/[^/]+/routes\\.ts$', '^server/[^/]+/[^/]+-routes\\.ts$'] },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    exclude: { path: '(^|/)(node_modules|dist|\\.build)/' },
    tsPreCompilationDeps: true,
    // tsconfig.json names both aliases (@/ and @shared/); with only @shared/ every client import
    // went unresolved and the client's own loops went unseen.
    tsConfig: { fileName: 'tsconfig.json' },
    enhancedResolveOptions: {
      extensions: ['.ts', '.mts', '.js', '.mjs', '.vue', '.json'],
      // Packages that publish only an `exports` map (pinia, vuetify) resolve as Node and Vite do.
      exportsFields: ['exports'],
      conditionNames: ['import', 'require', 'node', 'default', 'types'],
    },
  },
}
