import { watch } from 'vue'
import { useRoute } from 'vue-router'

/** "Reef 2 · Tankwarden"; the product's name alone when there is nothing to name. */
export function pageTitle(name?: string | null): string {
  return name ? `${name} · Tankwarden` : 'Tankwarden'
}

/**
 * Names the browser tab after what the page shows (a tank's, an incident's or a site's name)
 * once it has loaded; until then, and whenever `name` gives nothing, the route's own title stands.
 */
export function usePageTitle(name: () => string | null | undefined) {
  const route = useRoute()
  watch(
    name,
    (value) => {
      document.title = pageTitle(value || route.meta.title)
    },
    { immediate: true },
  )
}
