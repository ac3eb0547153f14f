import type { Browser, Page } from 'playwright-core'
import { expect } from 'vitest'
import { localDateAt, localToInstant, type LocalDate } from '@shared/time/zoned'
import { sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { LookAuditor } from './a11y-pages'
import { launchBrowser, startAppForBrowser } from './browser'
import { api, tankWithProbe, type ApiAnswer, type App } from './keeper-setup'

// What both dialog audit files (accessibility-dialogs*.test.ts) open their dialogs on: the app, a
// browser, and an invented business with a client's tank that has a visit under way.

export type DialogWorld = {
  s: App
  browser: Browser
  org: TestOrg
  siteId: number
  zone: string
  today: LocalDate
  ids: { client: number; tank: number; visit: number }
  /** POST as the owner; fails the test on an answer that is not 2xx. */
  post: (path: string, body: unknown) => Promise<ApiAnswer['body']>
  close: () => Promise<void>
}

export async function startDialogWorld(): Promise<DialogWorld> {
  const s = await startAppForBrowser()
  const b = await launchBrowser()
  const org = await s.createOrg('Kelpwood Aquaria')
  const siteId = org.siteIds[0]!
  const post = async (path: string, body: unknown) => {
    const res = await api(s, path, org.users.owner.token, { method: 'POST', body: JSON.stringify(body) })
    expect(res.status, `${path}: ${JSON.stringify(res.body)}`).toBeLessThan(300)
    return res.body
  }
  const zone = (await s.ctx.models.Site.findByPk(siteId))!.timeZone
  const today = localDateAt(zone, Date.now())
  const client = (await post('/clients', { kind: 'company', name: 'Harbourside Clinic', email: 'front@harbourside.example' })).id
  const tank = (await tankWithProbe(s, org.users.owner.token, siteId, 'Lobby reef')).tankId
  await s.ctx.models.Tank.update({ clientId: client }, { where: { id: tank } })
  await post('/tanks', sampleTank(siteId, { name: 'Quarantine 3' }))
  const at = (hour: number) => new Date(localToInstant(zone, today, hour * 60)).toISOString()
  const visit = (await post('/visits', { clientId: client, siteId, technicianId: org.users.owner.id, startsAt: at(9), endsAt: at(10), tankIds: [tank] })).id
  await post(`/visits/${visit}/start`, {})
  return {
    s,
    browser: b.browser,
    org,
    siteId,
    zone,
    today,
    ids: { client, tank, visit },
    post,
    async close() {
      await b.close()
      await s.close()
    },
  }
}

/** One browser context with a page per theme, signed in as the owner (a11y-pages.ts). */
export async function startSignedInAuditor(world: DialogWorld) {
  const started = await LookAuditor.start(world.browser)
  await started.auditor.signIn(world.s.baseUrl, world.org.users.owner.email)
  return started
}

/** A trigger that clicks the first element `selector` finds. */
export const click = (selector: string) => (page: Page) => page.locator(selector).first().click()
