import { acceptHMRUpdate, defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { PublicSite, SiteInput } from '@shared/schemas/sites'
import * as sitesApi from '@/api/sites'

export const useSitesStore = defineStore('sites', () => {
  const sites = ref<PublicSite[]>([])
  const includeArchived = ref(false)
  const loading = ref(false)
  const loaded = ref(false)

  const activeSites = computed(() => sites.value.filter((site) => site.archivedAt == null))
  const siteById = computed(() => new Map(sites.value.map((site) => [site.id, site])))

  // An answer that arrives after a sign-out belongs to the last person: it is dropped.
  let request = 0
  async function load(options: { includeArchived?: boolean } = {}) {
    if (options.includeArchived != null) includeArchived.value = options.includeArchived
    const call = ++request
    loading.value = true
    try {
      const list = await sitesApi.listSites({ includeArchived: includeArchived.value })
      if (call !== request) return
      sites.value = list
      loaded.value = true
    } finally {
      if (call === request) loading.value = false
    }
  }

  async function ensureLoaded() {
    if (!loaded.value && !loading.value) await load()
  }

  function replace(site: PublicSite) {
    const index = sites.value.findIndex((s) => s.id === site.id)
    const hidden = site.archivedAt != null && !includeArchived.value
    if (index === -1) {
      if (!hidden) sites.value = [...sites.value, site].sort((a, b) => a.name.localeCompare(b.name))
    } else if (hidden) {
      sites.value.splice(index, 1)
    } else {
      sites.value.splice(index, 1, site)
    }
    return site
  }

  const create = async (input: SiteInput) => replace(await sitesApi.createSite(input))
  const update = async (id: number, input: Partial<SiteInput>) => replace(await sitesApi.updateSite(id, input))
  const archive = async (id: number) => replace(await sitesApi.archiveSite(id))
  const unarchive = async (id: number) => replace(await sitesApi.unarchiveSite(id))

  function $reset() {
    request++
    sites.value = []
    includeArchived.value = false
    loading.value = false
    loaded.value = false
  }

  return { sites, includeArchived, loading, loaded, activeSites, siteById, load, ensureLoaded, create, update, archive, unarchive, $reset }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useSitesStore, import.meta.hot))
