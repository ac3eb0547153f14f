import type { WallResponse } from '@shared/schemas/wall'
import { tilesOnOneScreen } from '@/components/wall/wall-layout'
import { storedToken, storedWallSession } from './session'

/**
 * The very first thing a page does when it opens a wall (index.html loads this before the app):
 * ask for the wall's data with plain `fetch`, so the server works on it while the browser is still
 * reading Vue, Vuetify and the screens. Nothing here may import the app's heavier modules.
 * A failed or refused answer is dropped; the wall then asks the usual way and shows why.
 */
const WALL_PATH = /^\/wall\/(\d+)\/?$/

let first: { siteId: number; answer: Promise<WallResponse | null> } | null = null

/** The whole window stands in for the grid (the header only makes it smaller): never fewer tiles than a page shows. */
export function trendsForThisScreen(): number {
  return tilesOnOneScreen({ width: window.innerWidth, height: window.innerHeight })
}

function keyFor(siteId: number): string | null {
  const person = storedToken()
  if (person) return person
  const fromLink = new URLSearchParams(location.search).get('key')
  if (fromLink) return fromLink
  const wall = storedWallSession()
  return wall?.siteId === siteId ? wall.key : null
}

export function askForWallFirst(): void {
  const match = WALL_PATH.exec(location.pathname)
  const siteId = Number(match?.[1])
  const key = match ? keyFor(siteId) : null
  if (!key) return
  const answer = fetch(`/api/v1/sites/${siteId}/wall?trends=${trendsForThisScreen()}`, { headers: { Authorization: `Bearer ${key}` } })
    .then((res) => (res.ok ? (res.json() as Promise<WallResponse>) : null))
    .catch(() => null)
  first = { siteId, answer }
}

/** The first answer for this site, taken once (null when there was none). */
export function takeWallFirst(siteId: number): Promise<WallResponse | null> | null {
  const taken = first
  first = null
  return taken && taken.siteId === siteId ? taken.answer : null
}

askForWallFirst()
