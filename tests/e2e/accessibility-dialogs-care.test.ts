import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { sampleTank } from '../helpers/app'
import { createIncidentRow } from '../helpers/fixtures'
import { closeOverlay, go } from './a11y-pages'
import { click, startDialogWorld, startSignedInAuditor, type DialogWorld } from './dialog-audit-setup'
import { FIRST_LOAD_MS } from './keeper-setup'

// The dialogs of a tank's care (copying the tank, a care task, a care-log entry, a treatment
// course, finishing and cancelling a water change), of handling an incident, and of the sites and
// people screens (with the open list of a select field), opened on top of their screens and audited with axe-core against WCAG 2.1 levels
// A and AA (Web Content Accessibility Guidelines 2.1, W3C, 2018) in both themes, at desktop and
// phone sizes, like the screens in accessibility.test.ts.

let world: DialogWorld
let changingTank: number
let incident: number

beforeAll(async () => {
  world = await startDialogWorld()
  const { post, siteId, org, s } = world
  changingTank = (await post('/tanks', sampleTank(siteId, { name: 'Display 60' }))).id
  await post(`/tanks/${changingTank}/water-changes`, { percent: 20, heaterOffConfirmed: true })
  incident = (await createIncidentRow(s.ctx, org, world.ids.tank, { siteId })).id
})
afterAll(() => world?.close())

const button = (name: string) => (page: Page) => page.getByRole('button', { name }).first().click()

describe('the dialogs of care, incidents, sites and people meet WCAG 2.1 AA as axe-core checks them', () => {
  // One browser context, signed in once; each dialog is opened once per theme and checked at both
  // sizes (a11y-pages.ts).
  it('at desktop and phone size, in the light and the dark theme', async () => {
    const { context, auditor } = await startSignedInAuditor(world)

    await auditor.each((page) => go(page, `/tanks/${world.ids.tank}`))
    await auditor.overlay('tank-copy-dialog', click('[data-test=copy-tank]'))
    await auditor.overlay('care-task-dialog', click('[data-test=care-task-add]'))
    await auditor.overlay('care-log-entry-dialog', click('[data-test=care-log-add]'))
    await auditor.overlay('treatment-course-dialog', click('[data-test=course-start]'))

    await auditor.each(async (page) => {
      await go(page, `/tanks/${changingTank}`)
      await page.locator('[data-test=water-change-finish]').waitFor({ timeout: FIRST_LOAD_MS })
    })
    await auditor.overlay('water-change-finish-dialog', click('[data-test=water-change-finish]'))
    await auditor.overlay('water-change-cancel-dialog', click('[data-test=water-change-cancel]'))

    await auditor.each((page) => go(page, `/incidents/${incident}`))
    await auditor.overlay('incident-acknowledge-dialog', click('[data-test=acknowledge]'))
    await auditor.overlay('incident-resolve-dialog', click('[data-test=resolve]'))

    await auditor.each((page) => go(page, '/sites'))
    await auditor.overlay('site-dialog', click('[data-test=new-site]'))
    await auditor.each((page) => go(page, '/users'))
    // The dialog, and over it the open list of one of its select fields.
    await auditor.overlay('invite-dialog', button('Invite someone'), { close: false })
    await auditor.overlay('role-select-list', (page) => page.locator('.v-select').filter({ hasText: 'Role' }).first().click(), { inside: '.v-list' })
    await auditor.each((page) => closeOverlay(page, page.locator('.v-overlay--active').first()))
    await context.close()

    expect(auditor.found, auditor.found.join('\n\n')).toEqual([])
  }, 600_000)
})
