import { acceptHMRUpdate, defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { Species } from '@shared/care/species'
import * as careApi from '@/api/care'
import type { ConsumableAlert } from '@shared/schemas/equipment'
import type { CareTankToWatch, CareTaskDoneOutcome, CareTaskSnoozeBody, CareTodayTask } from '@shared/schemas/care-api'
import { ApiError } from '@/api/errors'
import { isWaiting } from '@/offline/outbox'
import { urgentFirst } from '@/components/care/care-words'

export type CareTodayScope = { siteId: number } | { mine: true }

export const useCareStore = defineStore('care', () => {
  const species = ref<Species[]>([])
  let speciesLoading: Promise<void> | null = null

  const todayTasks = ref<CareTodayTask[]>([])
  const todaySiteIds = ref<number[]>([])
  const todayOnDuty = ref(true)
  const todayWatch = ref<CareTankToWatch[]>([])
  const todayStock = ref<ConsumableAlert[]>([])
  const todayLoading = ref(false)
  // Only the newest today request may write: switching site twice quickly must not show the first.
  let todayRequest = 0

  const speciesByKey = computed(() => new Map(species.value.map((s) => [s.key, s])))

  /** The species table rarely changes; one fetch per session. */
  function ensureSpecies(): Promise<void> {
    if (species.value.length) return Promise.resolve()
    speciesLoading ??= careApi
      .listSpecies()
      .then((list) => {
        species.value = list
      })
      .finally(() => {
        speciesLoading = null
      })
    return speciesLoading
  }

  async function loadToday(scope: CareTodayScope) {
    const ticket = ++todayRequest
    todayLoading.value = true
    try {
      const today = await careApi.getCareToday(scope)
      if (ticket !== todayRequest) return
      todayTasks.value = urgentFirst(today.tasks)
      todaySiteIds.value = today.siteIds
      todayOnDuty.value = today.onDuty
      todayWatch.value = today.watch ?? []
      todayStock.value = today.stock ?? []
    } finally {
      if (ticket === todayRequest) todayLoading.value = false
    }
  }

  /**
   * One or several done from the today list, each with the "last done" the list showed, so one a
   * colleague ticked meanwhile comes back already done instead of logged twice. Done and
   * already-done tasks both leave the list, since neither is due.
   */
  async function markTodayDone(taskIds: number[], notes = ''): Promise<{ results: CareTaskDoneOutcome[]; kept: CareTodayTask[] }> {
    const chosen = todayTasks.value.filter((t) => taskIds.includes(t.id))
    const seen = chosen.map((t) => ({ id: t.id, seenLastDoneAt: t.lastDoneAt }))
    const results = await careApi.markCareTasksDone(seen, notes).catch((error: unknown) => {
      if (error instanceof ApiError && error.status === 0) return null
      throw error
    })
    if (results) {
      const gone = new Set(results.map((r) => r.id))
      todayTasks.value = todayTasks.value.filter((t) => !gone.has(t.id))
      return { results, kept: [] }
    }
    // No connection: each tick is kept on this device and sent on its own when it returns.
    const sent: CareTaskDoneOutcome[] = []
    const kept: CareTodayTask[] = []
    for (const task of chosen) {
      const answer = await careApi.markCareTaskDone(task, notes ? { notes } : {}, task.tank.name)
      if (isWaiting(answer)) kept.push(task)
      else sent.push({ id: task.id, outcome: 'done', doneAt: answer.task.lastDoneAt, doneBy: answer.logEntry.by, task: answer.task })
      todayTasks.value = todayTasks.value.filter((t) => t.id !== task.id)
    }
    return { results: sent, kept }
  }

  /** Snoozed tasks are not due today, so the task leaves the list too. */
  async function snoozeToday(taskId: number, input: CareTaskSnoozeBody) {
    const task = await careApi.snoozeCareTask(taskId, input)
    todayTasks.value = todayTasks.value.filter((t) => t.id !== taskId)
    return task
  }

  function $reset() {
    todayRequest++
    species.value = []
    todayTasks.value = []
    todaySiteIds.value = []
    todayOnDuty.value = true
    todayWatch.value = []
    todayStock.value = []
    todayLoading.value = false
  }

  return {
    species,
    speciesByKey,
    ensureSpecies,
    todayTasks,
    todaySiteIds,
    todayOnDuty,
    todayWatch,
    todayStock,
    todayLoading,
    loadToday,
    markTodayDone,
    snoozeToday,
    $reset,
  }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useCareStore, import.meta.hot))
