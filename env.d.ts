/// <reference types="vite-plugin-pwa/vue" />

declare module '*.vue' {
  import type { DefineComponent } from 'vue'
  const component: DefineComponent<object, object, unknown>
  export default component
}

/** The SVG paths of the `mdi-…` icons the client names (tooling/vite-mdi-icons.ts). */
declare module 'virtual:mdi-icons' {
  export const iconPaths: Record<string, string>
}
