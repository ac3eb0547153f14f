// The screens `npm run screenshots` takes, one per named route of the client's router
// (src/router/routes.ts). A component test and the script itself fail on a route left out.
// Node built-ins only: the bootstrap scripts load this before `npm ci`.

/**
 * Every route by name: the path that opens it from the demo's records, whether it needs a signed-in
 * owner, and, for a page that only shows a state the demo never has (a setup before any business,
 * an invitation, an alert mail's link), the API answer that puts it in that state.
 */
export function screensOf({ tank, site, incident, client, visit }) {
  const tankPath = tank && `/tanks/${tank.id}`
  return [
    { route: 'sign-in', path: '/sign-in' },
    { route: 'setup', path: '/setup', stub: { '/api/v1/setup': { needed: true, codeRequired: true } } },
    { route: 'forgot-password', path: '/forgot-password' },
    { route: 'reset-password', path: '/reset-password?token=from-the-mail' },
    {
      route: 'accept-invite',
      path: '/accept-invite?token=from-the-mail',
      stub: {
        '/api/v1/invitations/from-the-mail': {
          email: 'keeper@example.test',
          name: 'New keeper',
          role: 'keeper',
          organizationName: 'Your business',
          expiresAt: new Date(Date.now() + 6 * 86_400_000).toISOString(),
        },
      },
    },
    {
      route: 'ack',
      path: '/ack?token=from-the-mail',
      stub: incident && {
        '/api/v1/ack-links/from-the-mail': {
          incident: {
            ...incident,
            state: 'open',
            timeZone: site?.timeZone ?? 'UTC',
            acknowledgedAt: null,
            acknowledgedBy: null,
            resolvedAt: null,
            resolvedBy: null,
          },
          usedAt: null,
          expiresAt: new Date(Date.now() + 86_400_000).toISOString(),
          expired: false,
        },
      },
    },
    { route: 'wall', path: site && `/wall/${site.id}`, signedIn: true },
    { route: 'overview', path: '/', signedIn: true },
    { route: 'tanks', path: '/tanks', signedIn: true },
    { route: 'tank-new', path: '/tanks/new', signedIn: true },
    { route: 'tank', path: tankPath, signedIn: true },
    { route: 'tank-test-kit', path: tankPath && `${tankPath}/test-kit`, signedIn: true },
    { route: 'tank-build', path: tankPath && `${tankPath}/build`, signedIn: true },
    { route: 'tank-edit', path: tankPath && `${tankPath}/edit`, signedIn: true },
    { route: 'report', path: '/reports', signedIn: true },
    { route: 'import', path: '/import', signedIn: true },
    { route: 'clients', path: '/clients', signedIn: true },
    { route: 'client', path: client && `/clients/${client.id}`, signedIn: true },
    { route: 'round', path: '/round', signedIn: true },
    { route: 'visits', path: '/visits', signedIn: true },
    { route: 'visit', path: visit && `/visits/${visit.id}`, signedIn: true },
    { route: 'sites', path: '/sites', signedIn: true },
    { route: 'roster', path: site && `/sites/${site.id}/roster`, signedIn: true },
    { route: 'site-labels', path: site && `/sites/${site.id}/labels`, signedIn: true },
    { route: 'incidents', path: '/incidents', signedIn: true },
    { route: 'care-today', path: '/care/today', signedIn: true },
    { route: 'livestock', path: '/livestock', signedIn: true },
    { route: 'supplies', path: '/supplies', signedIn: true },
    { route: 'incident', path: incident && `/incidents/${incident.id}`, signedIn: true },
    { route: 'dev-mail', path: '/dev/mail', signedIn: true },
    { route: 'users', path: '/users', signedIn: true },
    { route: 'backup', path: '/backup', signedIn: true },
    { route: 'account', path: '/account', signedIn: true },
    { route: 'not-found', path: '/no-such-page', signedIn: true },
  ]
}

/** The route names the router declares, read from its source: `name: '…'` inside src/router/routes.ts. */
export function routeNamesIn(source) {
  return [...source.matchAll(/\bname:\s*'([a-z][a-z-]*)'/g)].map((m) => m[1])
}
