import { vi } from 'vitest'

/** A media query answer that never changes. */
export function fixedMediaQuery(query: string, matches: boolean): MediaQueryList {
  return {
    matches,
    media: query,
    onchange: null,
    addListener: vi.fn(),
    removeListener: vi.fn(),
    addEventListener: vi.fn(),
    removeEventListener: vi.fn(),
    dispatchEvent: () => false,
  }
}

// Vuetify reads the window's width through media queries; jsdom answers none, so answer them for a width.
let real: { width: number; matchMedia: typeof window.matchMedia } | null = null
export function viewportWidth(width: number) {
  real ??= { width: window.innerWidth, matchMedia: window.matchMedia }
  const px = (query: string, name: string) => Number(new RegExp(`${name}:\\s*([\\d.]+)px`).exec(query)?.[1] ?? NaN)
  Object.defineProperty(window, 'innerWidth', { value: width, configurable: true })
  Object.defineProperty(window, 'matchMedia', {
    configurable: true,
    value: (query: string) => {
      const min = px(query, 'min-width')
      const max = px(query, 'max-width')
      return fixedMediaQuery(query, (Number.isNaN(min) || width >= min) && (Number.isNaN(max) || width <= max))
    },
  })
}

/** Gives the window back its own width and media queries. */
export function restoreViewport() {
  if (!real) return
  Object.defineProperty(window, 'innerWidth', { value: real.width, configurable: true })
  Object.defineProperty(window, 'matchMedia', { configurable: true, value: real.matchMedia })
  real = null
}
