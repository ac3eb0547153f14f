import { readonly, ref } from 'vue'
import type { PublicIncident } from '@shared/schemas/incidents'
import type { LiveIncidentChange } from './useLiveSocket'

// One polite live region for the whole app (LiveAnnouncer in the app shell): screen readers read
// what changed once they have finished what they were saying. The wall has no shell and so no
// region: it changes all day and would never stop talking.

/** Messages within this time of each other are read as one. */
export const ANNOUNCE_GATHER_MS = 150

const message = ref('')
let gathered: string[] = []
let timer: ReturnType<typeof setTimeout> | null = null

/** Reads `text` out politely. The region is emptied first, so the same words twice are read twice. */
export function announce(text: string) {
  if (!text.trim() || gathered.includes(text)) return
  gathered.push(text)
  if (timer) return
  message.value = ''
  timer = setTimeout(() => {
    message.value = gathered.join(' ')
    gathered = []
    timer = null
  }, ANNOUNCE_GATHER_MS)
}

/** What the region says now. */
export const announcement = readonly(message)

const VERBS: Record<string, string> = { open: 'opened', acknowledged: 'acknowledged', resolved: 'resolved' }

/** "Incident opened on Reef display: pH below 6.0." */
export function incidentAnnouncement(incident: Pick<PublicIncident, 'title' | 'tankName'>, state: string): string {
  return `Incident ${VERBS[state] ?? state} on ${incident.tankName}: ${incident.title}.`
}

type ShownIncident = Pick<PublicIncident, 'id' | 'title' | 'tankName' | 'state'>

/**
 * For a list of incidents kept live: `noted` remembers which incidents the socket said changed;
 * `shown` is called with each freshly loaded page and announces those whose state on the page has
 * moved into one of `states` since the last page. An escalation or a repeat mail (same state) and
 * a filter or page change (no live change) say nothing.
 */
export function useIncidentAnnouncements(states: ReadonlyArray<PublicIncident['state']>) {
  const changed = new Set<number>()
  let before = new Map<number, string>()
  return {
    noted(change: LiveIncidentChange) {
      changed.add(change.incidentId)
    },
    shown(items: readonly ShownIncident[]) {
      for (const incident of items) {
        if (changed.has(incident.id) && before.get(incident.id) !== incident.state && states.includes(incident.state)) {
          announce(incidentAnnouncement(incident, incident.state))
        }
      }
      changed.clear()
      before = new Map(items.map((i) => [i.id, i.state]))
    },
  }
}
