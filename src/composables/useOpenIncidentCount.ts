import { computed, ref } from 'vue'
import { listIncidents } from '@/api/incidents'
import { useSitesStore } from '@/stores/sites'
import { useIncidentRefresh } from './useIncidentRefresh'

/** How many incidents are not yet resolved across the sites the person may see, kept live. */
export function useOpenIncidentCount() {
  const sites = useSitesStore()
  const count = ref<number | null>(null)
  let ticket = 0

  async function load() {
    const mine = ++ticket
    try {
      const page = await listIncidents({ state: 'unresolved', pageSize: 1 })
      if (mine === ticket) count.value = page.total
    } catch {
      // The count is a convenience: a failed refresh keeps the last one rather than a wrong zero.
    }
  }

  const targets = computed(() => sites.activeSites.map((site) => ({ siteId: site.id })))
  useIncidentRefresh(
    () => targets.value,
    () => void load(),
  )
  void load()
  return count
}
