import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { go } from './a11y-pages'
import { click, startDialogWorld, startSignedInAuditor, type DialogWorld } from './dialog-audit-setup'
import { FIRST_LOAD_MS } from './keeper-setup'

// The dialogs of the roster, supplies, clients and visits, opened on top of their screens and audited with axe-core
// against WCAG 2.1 levels A and AA (Web Content Accessibility Guidelines 2.1, W3C, 2018) in both
// themes, at desktop and phone sizes, like the screens in accessibility.test.ts. The screens under
// them are audited there and in their own feature tests; a tank page's dialogs are in
// accessibility-dialogs.test.ts.

let world: DialogWorld

beforeAll(async () => {
  world = await startDialogWorld()
  const { post, siteId, org } = world
  await post(`/sites/${siteId}/consumables`, { kind: 'reagent', name: 'Nitrite reagent', unit: 'ml', quantity: 20, lowAt: 5 })
  await post(`/sites/${siteId}/roster/shifts`, { userId: org.users.keeper.id, weekday: 0, start: '00:00', end: '00:00' })
})
afterAll(() => world?.close())

describe('the dialogs of rosters, supplies, clients and visits meet WCAG 2.1 AA as axe-core checks them', () => {
  // One browser context, signed in once; each dialog is opened once per theme and checked at both
  // sizes (a11y-pages.ts).
  it('at desktop and phone size, in the light and the dark theme', async () => {
    const { org, ids } = world
    const { context, auditor } = await startSignedInAuditor(world)

    await auditor.each((page) => go(page, `/sites/${org.siteIds[0]}/roster`))
    await auditor.overlay('shift-dialog', click('[data-test=add-shift]'))
    await auditor.overlay('roster-change-dialog', click('[data-test=add-override]'))
    await auditor.overlay('maintenance-dialog', click('[data-test=add-maintenance]'))

    await auditor.each((page) => go(page, `/supplies?site=${org.siteIds[0]}`))
    await auditor.overlay('consumable-dialog', click('[data-test=consumable-add]'))

    await auditor.each((page) => go(page, '/clients'))
    await auditor.overlay('client-dialog', click('[data-test=new-client]'))
    await auditor.each((page) => go(page, `/clients/${ids.client}`))
    await auditor.overlay('visit-plan-dialog', click('[data-test=plan-visit]'))
    await auditor.overlay('client-invite-dialog', click('[data-test=invite-client-viewer]'))

    // A visit under way: its round and the form that closes it and sends the report.
    await auditor.each(async (page) => {
      await go(page, `/visits/${ids.visit}`)
      await page.locator('[data-test=visit-close]').waitFor({ timeout: FIRST_LOAD_MS })
    })
    await auditor.checkEveryLook('visit-close-form', (page) => page.locator('[data-test=visit-close]'))
    await context.close()

    expect(auditor.found, auditor.found.join('\n\n')).toEqual([])
  }, 600_000)
})
