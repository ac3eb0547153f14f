import { computed } from 'vue'
import { useTheme } from 'vuetify'

export const THEME_KEY = 'tw.theme'
export const LIGHT_THEME = 'tankwardenLight'
export const DARK_THEME = 'tankwardenDark'
type ThemeName = typeof LIGHT_THEME | typeof DARK_THEME

function isThemeName(value: string | null): value is ThemeName {
  return value === LIGHT_THEME || value === DARK_THEME
}

/** The remembered choice, else the device's preference. */
export function initialThemeName(): ThemeName {
  const stored = safeStorage()?.getItem(THEME_KEY) ?? null
  if (isThemeName(stored)) return stored
  const prefersDark = typeof window !== 'undefined' && window.matchMedia?.('(prefers-color-scheme: dark)').matches
  return prefersDark ? DARK_THEME : LIGHT_THEME
}

function safeStorage(): Storage | null {
  try {
    return typeof localStorage === 'undefined' ? null : localStorage
  } catch {
    // Some locked-down browsers throw on any storage access.
    return null
  }
}

export function useThemePreference() {
  const theme = useTheme()
  const isDark = computed(() => theme.global.current.value.dark)

  function toggle() {
    const next: ThemeName = isDark.value ? LIGHT_THEME : DARK_THEME
    theme.change(next)
    safeStorage()?.setItem(THEME_KEY, next)
  }

  return { isDark, toggle }
}
