import { createRequire } from 'node:module'
import type { Page } from 'playwright-core'

const AXE_PATH = createRequire(import.meta.url).resolve('axe-core/axe.min.js')
/** The success criteria of WCAG 2.1 at levels A and AA, as axe-core tags its rules. */
const WCAG21_AA = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']

export interface AxeViolation {
  id: string
  impact: string | null
  help: string
  targets: string[]
  /** What axe found wrong on the first element, e.g. the measured contrast and colours. */
  detail: string
}

/** Runs axe-core over the whole page as it is now and answers the WCAG 2.1 A/AA violations. */
export async function wcagViolations(page: Page): Promise<AxeViolation[]> {
  if (!(await page.evaluate('typeof window.axe === "object"'))) await page.addScriptTag({ path: AXE_PATH })
  // Runs in the page (the server tsconfig has no DOM types, so the script is text).
  return page.evaluate(`(async () => {
    const result = await window.axe.run(document, { runOnly: { type: 'tag', values: ${JSON.stringify(WCAG21_AA)} }, resultTypes: ['violations'] })
    return result.violations.map((v) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      targets: v.nodes.map((n) => n.target.join(' ')),
      detail: (v.nodes[0]?.failureSummary ?? '').split('\\n').slice(1).join(' ').trim(),
    }))
  })()`) as Promise<AxeViolation[]>
}

/** One line per rule: its id, impact and the elements that break it. */
export function describeViolations(violations: AxeViolation[]): string {
  return violations.map((v) => `${v.id} (${v.impact}, ${v.targets.length}): ${v.targets.slice(0, 8).join(' | ')} — ${v.detail}`).join('\n')
}

/** Names Vuetify gives icon buttons of its own that say where they are, not what they do. */
const PLACEHOLDER_NAMES = ['appended action', 'prepended action', 'append action', 'prepend action']

/**
 * Buttons that show no text (an icon only) and carry no aria-label or aria-labelledby, or one of
 * Vuetify's placeholder names: a screen reader would announce them as just "button". Buttons
 * hidden from assistive technology are not counted.
 */
export async function unnamedIconButtons(page: Page): Promise<string[]> {
  return page.evaluate(`(() => {
    const placeholders = ${JSON.stringify(PLACEHOLDER_NAMES)}
    // Shown, and not hidden from assistive technology (Vuetify's dropdown arrow is a click target
    // for the mouse only: aria-hidden, out of the tab order).
    const visible = (el) => el.getClientRects().length > 0 && getComputedStyle(el).visibility !== 'hidden' && !el.closest('[aria-hidden=true]')
    const buttons = [...document.querySelectorAll('button, [role=button], a.v-btn')].filter(visible)
    const out = []
    for (const el of buttons) {
      const text = (el.innerText ?? el.textContent ?? '').trim()
      const byIds = (el.getAttribute('aria-labelledby') ?? '').split(' ').filter(Boolean).map((id) => document.getElementById(id)?.textContent ?? '').join(' ').trim()
      const name = (el.getAttribute('aria-label') ?? '').trim() || byIds
      const placeholder = placeholders.some((p) => name.toLowerCase().endsWith(p))
      if ((!text && !name) || placeholder) {
        const where = el.closest('[data-test]')?.getAttribute('data-test')
        out.push(el.tagName.toLowerCase() + (el.className ? '.' + String(el.className).trim().split(/\\s+/).slice(0, 3).join('.') : '') + (where ? ' in [data-test=' + where + ']' : '') + (name ? ' named "' + name + '"' : ''))
      }
    }
    return out
  })()`) as Promise<string[]>
}
