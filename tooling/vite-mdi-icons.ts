// Ships only the Material Design Icons the client names: `virtual:mdi-icons` exports one SVG path
// per `mdi-…` name found in src/**/*.{vue,ts}, taken from @mdi/js, instead of the whole icon font.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import * as mdi from '@mdi/js'
import type { Plugin } from 'vite'

const VIRTUAL_ID = 'virtual:mdi-icons'
const RESOLVED_ID = `\0${VIRTUAL_ID}`
const ICON_NAME = /(?<![\w:/-])mdi-[a-z0-9]+(?:-[a-z0-9]+)*\b/g
const SOURCE_FILE = /\.(vue|ts)$/

const paths = mdi as unknown as Record<string, string>

/** `mdi-numeric-1-circle` → `mdiNumeric1Circle`, the name @mdi/js exports it under. */
export function exportName(icon: string): string {
  return icon.replace(/-([a-z0-9])/g, (_, c: string) => c.toUpperCase())
}

/** The SVG path of an icon name, or undefined when Material Design Icons has no such icon. */
export function iconPath(icon: string): string | undefined {
  return paths[exportName(icon)]
}

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const path = join(dir, entry.name)
    if (entry.isDirectory()) return sourceFiles(path)
    return SOURCE_FILE.test(entry.name) ? [path] : []
  })
}

/** Every `mdi-…` name written in the client's sources, sorted. */
export function usedIconNames(srcDir: string): string[] {
  const names = new Set<string>()
  for (const file of sourceFiles(srcDir)) for (const [name] of readFileSync(file, 'utf8').matchAll(ICON_NAME)) names.add(name)
  return [...names].sort()
}

function moduleSource(names: string[]): string {
  const entries = names.flatMap((name) => {
    const path = iconPath(name)
    return path ? [`  ${JSON.stringify(name)}: ${JSON.stringify(path)},`] : []
  })
  return `export const iconPaths = {\n${entries.join('\n')}\n}\n`
}

export function mdiIcons(options: { srcDir: string }): Plugin {
  let names: string[] = []
  const scan = () => {
    names = usedIconNames(options.srcDir)
    return names
  }
  return {
    name: 'tankwarden-mdi-icons',
    resolveId: (id) => (id === VIRTUAL_ID ? RESOLVED_ID : undefined),
    load(id) {
      if (id !== RESOLVED_ID) return undefined
      const unknown = scan().filter((name) => !iconPath(name))
      if (unknown.length) this.warn(`no such Material Design Icon: ${unknown.join(', ')}`)
      return moduleSource(names)
    },
    // While developing, a file that starts using a new icon reloads the page with it.
    configureServer(server) {
      const onChange = (file: string) => {
        if (!file.startsWith(options.srcDir) || !SOURCE_FILE.test(file)) return
        const before = names.join()
        if (scan().join() === before) return
        const module = server.moduleGraph.getModuleById(RESOLVED_ID)
        if (module) server.moduleGraph.invalidateModule(module)
        server.ws.send({ type: 'full-reload' })
      }
      server.watcher.on('change', onChange)
      server.watcher.on('add', onChange)
    },
  }
}
