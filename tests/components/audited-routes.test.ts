import { describe, expect, it } from 'vitest'
import type { RouteRecordRaw } from 'vue-router'
import { routes } from '@/router/routes'
import { AUDITED_ROUTES, UNAUDITED_ROUTES } from '../e2e/audited-routes'

function routeNames(records: readonly RouteRecordRaw[]): string[] {
  return records.flatMap((r) => [...(typeof r.name === 'string' ? [r.name] : []), ...routeNames(r.children ?? [])])
}

describe('every screen of the router is audited for accessibility in the browser', () => {
  const audited = Object.values(AUDITED_ROUTES).flat()

  it('names each route in an audit file or, with a reason, as not audited', () => {
    const listed = new Set([...audited, ...Object.keys(UNAUDITED_ROUTES)])
    expect(routeNames(routes).filter((name) => !listed.has(name))).toEqual([])
  })

  it('lists no route the router does not have, and none twice', () => {
    const names = new Set(routeNames(routes))
    expect([...audited, ...Object.keys(UNAUDITED_ROUTES)].filter((name) => !names.has(name))).toEqual([])
    expect(audited.length).toBe(new Set(audited).size)
  })

  it('gives every route left out a reason', () => {
    expect(Object.entries(UNAUDITED_ROUTES).filter(([, reason]) => reason.trim().length < 10)).toEqual([])
  })
})
