import { vi } from 'vitest'

// Vuetify reads the window's width through media queries; jsdom answers none, so answer them for a width.
const realMatchMedia = window.matchMedia
const realWidth = window.innerWidth
export function viewportWidth(width: number) {
  const px = (query: string, name: string) => Number(new RegExp(`${name}:\\s*([\\d.]+)px`).exec(query)?.[1] ?? NaN)
  Object.defineProperty(window, 'innerWidth', { value: width, configurable: true })
  Object.defineProperty(window, 'matchMedia', {
    configurable: true,
    value: (query: string) => {
      const min = px(query, 'min-width')
      const max = px(query, 'max-width')
      const matches = (Number.isNaN(min) || width >= min) && (Number.isNaN(max) || width <= max)
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
    },
  })
}

/** Gives the window back its own width and media queries. */
export function restoreViewport() {
  Object.defineProperty(window, 'innerWidth', { value: realWidth, configurable: true })
  Object.defineProperty(window, 'matchMedia', { configurable: true, value: realMatchMedia })
}
