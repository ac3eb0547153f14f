import { onScopeDispose, ref, type Ref } from 'vue'

/** A clock that ticks while someone watches it; one timer per interval, shared by every reader. */
const clocks = new Map<number, { now: Ref<number>; users: number; timer: ReturnType<typeof setInterval> | null }>()

export function useNow(everyMs = 1000): Ref<number> {
  let clock = clocks.get(everyMs)
  if (!clock) {
    clock = { now: ref(Date.now()), users: 0, timer: null }
    clocks.set(everyMs, clock)
  }
  const shared = clock
  shared.users++
  shared.now.value = Date.now()
  shared.timer ??= setInterval(() => (shared.now.value = Date.now()), everyMs)
  onScopeDispose(() => {
    shared.users--
    if (shared.users <= 0 && shared.timer) {
      clearInterval(shared.timer)
      shared.timer = null
    }
  })
  return shared.now
}
