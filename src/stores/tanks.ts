import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref } from 'vue'
import type { PublicTank, TankInput, TankListItem, TankUpdate } from '@shared/schemas/tanks'
import * as tanksApi from '@/api/tanks'
import type { TankListParams } from '@/api/tanks'

export const useTanksStore = defineStore('tanks', () => {
  const items = ref<TankListItem[]>([])
  const total = ref(0)
  const loading = ref(false)
  const lastQuery = ref<TankListParams>({})
  const current = ref<PublicTank | null>(null)
  // Only the newest list request may write; a slow older answer must not overwrite it.
  let listRequest = 0

  async function fetchPage(query: TankListParams) {
    const ticket = ++listRequest
    lastQuery.value = { ...query }
    loading.value = true
    try {
      await load(ticket, query)
    } finally {
      if (ticket === listRequest) loading.value = false
    }
  }

  /** The same page again, without the loading bar: states and incidents change while it is open. */
  async function refresh() {
    if (loading.value) return
    await load(++listRequest, lastQuery.value)
  }

  async function load(ticket: number, query: TankListParams) {
    const page = await tanksApi.listTanks(query)
    if (ticket !== listRequest) return
    items.value = page.items
    total.value = page.total
  }

  async function fetchTank(id: number) {
    if (current.value?.id !== id) current.value = null
    try {
      const tank = await tanksApi.getTank(id)
      current.value = tank
      return tank
    } catch (error) {
      // A tank that is gone or no longer visible must not linger on screen.
      if (current.value?.id === id) current.value = null
      throw error
    }
  }

  function remember(tank: PublicTank) {
    current.value = tank
    const index = items.value.findIndex((t) => t.id === tank.id)
    if (index !== -1) items.value.splice(index, 1, { ...tank, status: items.value[index]!.status })
    return tank
  }

  const create = async (input: TankInput) => remember(await tanksApi.createTank(input))
  const update = async (id: number, changes: TankUpdate) => remember(await tanksApi.updateTank(id, changes))
  const archive = async (id: number) => remember(await tanksApi.archiveTank(id))
  const unarchive = async (id: number) => remember(await tanksApi.unarchiveTank(id))

  function $reset() {
    listRequest++
    items.value = []
    total.value = 0
    loading.value = false
    lastQuery.value = {}
    current.value = null
  }

  return { items, total, loading, lastQuery, current, fetchPage, refresh, fetchTank, create, update, archive, unarchive, $reset }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useTanksStore, import.meta.hot))
