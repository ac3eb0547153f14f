import { afterEach } from 'vitest'
import { fixedMediaQuery } from './viewport'

// jsdom lacks these; Vuetify's layout, menus and selects call them.
class ResizeObserverStub {
  observe() {}
  unobserve() {}
  disconnect() {}
}
globalThis.ResizeObserver ??= ResizeObserverStub as unknown as typeof ResizeObserver

if (!window.visualViewport) {
  const viewport = Object.assign(new EventTarget(), {
    width: 1280,
    height: 800,
    offsetLeft: 0,
    offsetTop: 0,
    pageLeft: 0,
    pageTop: 0,
    scale: 1,
    onresize: null,
    onscroll: null,
    onscrollend: null,
  })
  Object.defineProperty(window, 'visualViewport', { value: viewport, configurable: true })
}

if (!window.matchMedia) {
  Object.defineProperty(window, 'matchMedia', {
    configurable: true,
    value: (query: string) => fixedMediaQuery(query, false),
  })
}

afterEach(() => {
  localStorage.clear()
  document.body.innerHTML = ''
})
