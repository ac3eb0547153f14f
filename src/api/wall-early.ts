import type { WallResponse, WallTrendsResponse } from '@shared/schemas/wall'
import { tilesOnOneScreen } from '@/components/wall/wall-layout'
import { http } from './client'
import { currentToken, storedWallSession } from './session'

/** A display without a person signed in sends its wall key; the request interceptor adds a person's token. */
function wallHeaders(): Record<string, string> {
  if (currentToken()) return {}
  const wall = storedWallSession()
  return wall ? { Authorization: `Bearer ${wall.key}` } : {}
}

/** The whole window stands in for the grid (the header only makes it smaller): never fewer tiles than a page shows. */
function trendsForThisScreen(): number {
  return tilesOnOneScreen({ width: window.innerWidth, height: window.innerHeight })
}

/** The wall, with the trend lines of the tanks one screen shows first; the rest are asked for by page. */
export async function fetchWall(siteId: number): Promise<WallResponse> {
  return (await http.get<WallResponse>(`/sites/${siteId}/wall`, { params: { trends: trendsForThisScreen() }, headers: wallHeaders() })).data
}

export async function fetchWallTrends(siteId: number, tankIds: number[]): Promise<WallTrendsResponse> {
  return (await http.get<WallTrendsResponse>(`/sites/${siteId}/wall/trends`, { params: { tankIds: tankIds.join(',') }, headers: wallHeaders() })).data
}

/** An early answer older than this is not taken: the wall asks afresh. */
const EARLY_ANSWER_MS = 10_000
let early: { siteId: number; at: number; answer: Promise<WallResponse> } | null = null

/**
 * Asks for a wall's data as soon as the router knows the wall will open, so the server works on it
 * while the wall's code is still loading; the wall's first request takes this answer.
 */
export function requestWallEarly(siteId: number): void {
  const answer = fetchWall(siteId)
  // Whoever takes the answer sees a failure; until then it is not an unhandled rejection.
  answer.catch(() => undefined)
  early = { siteId, at: Date.now(), answer }
}

/** The early answer for this site, taken once; null when there is none or it is too old. */
export function takeEarlyWall(siteId: number): Promise<WallResponse> | null {
  const taken = early
  early = null
  return taken && taken.siteId === siteId && Date.now() - taken.at < EARLY_ANSWER_MS ? taken.answer : null
}
