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
