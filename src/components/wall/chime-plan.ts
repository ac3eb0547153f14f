import type { WallTank } from '@shared/schemas/wall'

/** How often the chime repeats while an alarm nobody has acknowledged is on the wall. */
export const CHIME_REPEAT_MS = 3 * 60_000
export const MUTE_CHOICES = [
  { minutes: 15, title: 'Mute for 15 min' },
  { minutes: 60, title: 'Mute for 1 h' },
  { minutes: 240, title: 'Mute for 4 h' },
] as const

/** Tiles in alarm whose incident nobody has acknowledged yet (and not opened during maintenance). */
export function ringingTanks(tanks: readonly WallTank[]): number[] {
  return tanks.filter((t) => t.state === 'alarm' && t.openIncident?.state === 'open' && !t.openIncident.maintenance).map((t) => t.id)
}

export interface ChimeState {
  enabled: boolean
  mutedUntil: number | null
  /** Tanks already chimed for in this stretch of alarm. */
  known: ReadonlySet<number>
  lastAt: number | null
}

/** Chime now? At once when a tile enters alarm, then every few minutes until acknowledged or muted. */
export function shouldChime(state: ChimeState, ringing: readonly number[], now: number): boolean {
  if (!state.enabled || !ringing.length) return false
  if (state.mutedUntil !== null && now < state.mutedUntil) return false
  if (ringing.some((id) => !state.known.has(id))) return true
  return state.lastAt === null || now - state.lastAt >= CHIME_REPEAT_MS
}
