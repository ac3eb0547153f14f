// Which browser test audits each named route of the client's router (src/router/routes.ts). Each
// audit file checks that it really opened every route it lists here; a component test checks that
// every route of the router is listed, so a new screen cannot be added without an audit.

export const AUDITED_ROUTES: Record<string, readonly string[]> = {
  'accessibility.test.ts': [
    'sign-in',
    'forgot-password',
    'overview',
    'tanks',
    'tank',
    'tank-test-kit',
    'incidents',
    'incident',
    'care-today',
    'roster',
    'report',
    'sites',
    'users',
    'account',
    'wall',
  ],
  'setup.test.ts': ['setup'],
  'visits.test.ts': ['clients', 'client', 'visits', 'visit', 'round'],
  'livestock-equipment.test.ts': ['livestock', 'supplies'],
  'labels.test.ts': ['site-labels'],
  'accessibility-forms.test.ts': ['tank-new', 'tank-edit', 'tank-build', 'import', 'backup', 'dev-mail', 'accept-invite', 'reset-password', 'ack', 'not-found'],
}

/** Routes no audit opens, each with the reason. Empty: every screen is audited. */
export const UNAUDITED_ROUTES: Record<string, string> = {}
