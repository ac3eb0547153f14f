import { describe, expect, it } from 'vitest'
import type { RouteRecordRaw } from 'vue-router'
import { routes } from '@/router/routes'
import routesSource from '@/router/routes.ts?raw'
import { routeNamesIn, screensOf } from '../../scripts/lib/screens.mjs'

function routeNames(records: readonly RouteRecordRaw[]): string[] {
  return records.flatMap((r) => [...(typeof r.name === 'string' ? [r.name] : []), ...routeNames(r.children ?? [])])
}

const demo = {
  tank: { id: 4 },
  site: { id: 2, timeZone: 'Europe/Berlin' },
  incident: { id: 9, title: 'Temperature high', tankName: 'Reef 1', siteName: 'Front shop' },
  client: { id: 3 },
  visit: { id: 5 },
}

describe('npm run screenshots', () => {
  it('takes every route of the router once, each at a path of its own', () => {
    const screens = screensOf(demo)
    expect([...screens.map((s) => s.route)].sort()).toEqual(routeNames(routes).sort())
    expect(screens.every((s) => typeof s.path === 'string' && s.path.startsWith('/'))).toBe(true)
    expect(new Set(screens.map((s) => s.path)).size).toBe(screens.length)
  })

  it('reads the same route names from the router source as the router declares', () => {
    expect(routeNamesIn(routesSource).sort()).toEqual(routeNames(routes).sort())
  })

  it('opens the signed-in screens signed in and the public ones without a session', () => {
    const publicRoutes = routes.filter((r) => r.meta?.public).map((r) => r.name)
    expect(
      screensOf(demo)
        .filter((s) => !s.signedIn)
        .map((s) => s.route),
    ).toEqual(publicRoutes)
  })
})
