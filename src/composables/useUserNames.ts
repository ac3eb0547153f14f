import { computed, ref, watch } from 'vue'
import { listShifts } from '@/api/roster'
import { useAuthStore } from '@/stores/auth'
import { useUsersStore } from '@/stores/users'

/**
 * Names for the user ids an incident carries. Only owners may list people, so for everyone
 * else the site's duty roster (readable by all) supplies the names of those who take shifts.
 */
export function useUserNames(siteId: () => number | null) {
  const auth = useAuthStore()
  const people = useUsersStore()
  const rosterNames = ref(new Map<number, string>())

  watch(
    siteId,
    async (id) => {
      rosterNames.value = new Map()
      if (id == null) return
      try {
        const shifts = await listShifts(id)
        rosterNames.value = new Map(shifts.map((s) => [s.userId, s.userName]))
      } catch {
        // Names are a courtesy; the timeline still reads without them.
      }
    },
    { immediate: true },
  )
  if (auth.isOwner && !people.users.length && !people.loading) people.load().catch(() => undefined)

  const names = computed(() => {
    const map = new Map(rosterNames.value)
    for (const user of people.users) map.set(user.id, user.name)
    if (auth.user) map.set(auth.user.id, `${auth.user.name} (you)`)
    return map
  })

  return (userId: number | null | undefined): string => {
    if (userId == null) return 'someone'
    return names.value.get(userId) ?? `team member #${userId}`
  }
}
