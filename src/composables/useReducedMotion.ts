import { onScopeDispose, ref, type Ref } from 'vue'

const QUERY = '(prefers-reduced-motion: reduce)'

/** Whether the person has asked their system for less motion, now. */
function prefersReducedMotion(): boolean {
  return typeof window !== 'undefined' && typeof window.matchMedia === 'function' && window.matchMedia(QUERY).matches
}

/** The same, kept up to date while the calling component lives. */
export function useReducedMotion(): Ref<boolean> {
  const reduced = ref(prefersReducedMotion())
  if (typeof window === 'undefined' || typeof window.matchMedia !== 'function') return reduced
  const query = window.matchMedia(QUERY)
  const follow = (event: MediaQueryListEvent) => (reduced.value = event.matches)
  query.addEventListener('change', follow)
  onScopeDispose(() => query.removeEventListener('change', follow))
  return reduced
}
