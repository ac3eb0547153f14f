import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { localDateAt, localToInstant } from '@shared/time/zoned'
import { sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { go, LookAuditor, open } from './a11y-pages'
import { launchBrowser, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, tankWithProbe, type App } from './keeper-setup'

// The dialogs of the roster, supplies, clients and visits, opened on top of their screens and audited with axe-core
// against WCAG 2.1 levels A and AA (Web Content Accessibility Guidelines 2.1, W3C, 2018) in both
// themes, at desktop and phone sizes, like the screens in accessibility.test.ts. The screens under
// them are audited there and in their own feature tests; a tank page's dialogs are in
// accessibility-dialogs.test.ts.

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
const ids = { tank: 0, client: 0, visit: 0 }

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Kelpwood Aquaria')
  const owner = org.users.owner.token
  const siteId = org.siteIds[0]!
  const post = async (path: string, body: unknown) => {
    const res = await api(s, path, owner, { method: 'POST', body: JSON.stringify(body) })
    expect(res.status, `${path}: ${JSON.stringify(res.body)}`).toBeLessThan(300)
    return res.body
  }
  const zone = (await s.ctx.models.Site.findByPk(siteId))!.timeZone
  const today = localDateAt(zone, Date.now())
  ids.client = (await post('/clients', { kind: 'company', name: 'Harbourside Clinic', email: 'front@harbourside.example' })).id
  ids.tank = (await tankWithProbe(s, owner, siteId, 'Lobby reef')).tankId
  await s.ctx.models.Tank.update({ clientId: ids.client }, { where: { id: ids.tank } })
  await post('/tanks', sampleTank(siteId, { name: 'Quarantine 3' }))
  await post(`/sites/${siteId}/consumables`, { kind: 'reagent', name: 'Nitrite reagent', unit: 'ml', quantity: 20, lowAt: 5 })
  await post(`/sites/${siteId}/roster/shifts`, { userId: org.users.keeper.id, weekday: 0, start: '00:00', end: '00:00' })

  const at = (hour: number) => new Date(localToInstant(zone, today, hour * 60)).toISOString()
  ids.visit = (
    await post('/visits', { clientId: ids.client, siteId, technicianId: org.users.owner.id, startsAt: at(9), endsAt: at(10), tankIds: [ids.tank] })
  ).id
  await post(`/visits/${ids.visit}/start`, {})
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

const click = (selector: string) => (page: Page) => page.locator(selector).first().click()

describe('the dialogs of rosters, supplies, clients and visits meet WCAG 2.1 AA as axe-core checks them', () => {
  // One browser context, signed in once; each dialog is opened once per theme and checked at both
  // sizes (a11y-pages.ts).
  it('at desktop and phone size, in the light and the dark theme', async () => {
    const { context, auditor } = await LookAuditor.start(browser)
    await signIn(auditor.pages.light, s.baseUrl, org.users.owner.email)
    await open(auditor.pages.dark, `${s.baseUrl}/`)

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
