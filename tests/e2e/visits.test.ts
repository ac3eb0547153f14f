import { QueryTypes } from 'sequelize'
import sharp from 'sharp'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { localToInstant, parseLocalDate, formatLocalDate, localDateAt } from '@shared/time/zoned'
import type { TestOrg } from '../helpers/fixtures'
import { sampleTank } from '../helpers/app'
import { audit, checkPage, newContext, type Size } from './a11y-pages'
import { AUDITED_ROUTES } from './audited-routes'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, type App } from './keeper-setup'

// A technician's round of three visits worked on a phone, each closed, and the client's visit
// report arriving at the local fake SMTP server with its PDF; the new screens audited and pictured.
let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
const clients = { dental: 0, bakery: 0 }
const ZONE = 'Europe/Berlin'
/** The day the three stops are planned for, `YYYY-MM-DD` on the sites' clock. */
let plannedDay: string

async function post(path: string, body: unknown) {
  const res = await api(s, path, org.users.owner.token, { method: 'POST', body: JSON.stringify(body) })
  expect(res.status, JSON.stringify(res.body)).toBeLessThan(300)
  return res.body
}

type Mail = { subject: string; envelope_to: string[]; html_body: string; attachments: Array<{ filename: string; contentType: string; size: number }> }
async function waitForMailTo(address: string, subject: RegExp): Promise<Mail[]> {
  for (let i = 0; i < 150; i++) {
    await s.mail.sender.runOnce()
    const mails = await s.ctx.sequelize.query<Mail>('SELECT subject, envelope_to, html_body, attachments FROM fake_mailbox ORDER BY id', {
      type: QueryTypes.SELECT,
    })
    const found = mails.filter((m) => m.envelope_to.includes(address) && subject.test(m.subject))
    if (found.length) return found
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(`no mail to ${address} matching ${subject}`)
}

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Round Org')
  await s.ctx.models.Site.update({ timeZone: ZONE, address: 'Kaistraße 4, 10115 Berlin' }, { where: { id: org.siteIds[0] } })
  await s.ctx.models.Site.update({ timeZone: ZONE, address: 'Bergmannstraße 12, 10961 Berlin' }, { where: { id: org.siteIds[1] } })
  clients.dental = (
    await post('/clients', { kind: 'company', name: 'Harbour Dental', contactName: 'Dr Lindqvist', email: 'front@harbour.example', phone: '+49 30 555 0101' })
  ).id
  clients.bakery = (await post('/clients', { kind: 'company', name: 'Corner Bakery', email: 'hello@corner-bakery.example' })).id
  const tank = async (siteId: number, name: string, clientId: number) => (await post('/tanks', sampleTank(siteId, { name, clientId }))).id as number
  const reef = await tank(org.siteIds[0], 'Waiting room reef', clients.dental)
  const hall = await tank(org.siteIds[1], 'Surgery hall tank', clients.dental)
  const window = await tank(org.siteIds[1], 'Shop window tank', clients.bakery)
  // Today on the sites' clock, three stops in order.
  const today = localDateAt(ZONE, Date.now())
  plannedDay = formatLocalDate(today)
  const at = (hour: number) => new Date(localToInstant(ZONE, today, hour * 60)).toISOString()
  const plan = (clientId: number, siteId: number, tankIds: number[], from: number) =>
    post('/visits', { clientId, siteId, technicianId: org.users.keeper.id, startsAt: at(from), endsAt: at(from + 1), tankIds })
  await plan(clients.dental, org.siteIds[0], [reef], 9)
  await plan(clients.bakery, org.siteIds[1], [window], 11)
  await plan(clients.dental, org.siteIds[1], [hall], 14)
  expect(formatLocalDate(today)).toMatch(/^\d{4}-/)
  expect(parseLocalDate(formatLocalDate(today))).toEqual(today)
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

async function workStop(page: Page, index: number, withPhoto: boolean) {
  await page.goto(`${s.baseUrl}/round?date=${plannedDay}`)
  const stop = page.locator('[data-test=round-stop]').nth(index)
  await stop.waitFor({ timeout: FIRST_LOAD_MS })
  await stop.click()
  await page.locator('[data-test=visit-start]').click()
  await page.locator('[data-test=visit-arrived]').waitFor()
  await page.locator('[data-test=visit-task]').first().locator('input').check()
  await page.getByLabel('pH', { exact: true }).fill('7.2')
  await page.getByLabel('Nitrate (mg/L)').fill('15')
  await page.locator('[data-test=visit-kit-save]').click()
  await page.locator('[data-test=visit-kit-saved]').waitFor()
  if (withPhoto) {
    const image = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#2a8a6a' } })
      .jpeg()
      .toBuffer()
    await page.locator('[data-test=visit-photo] input[type=file]').setInputFiles({ name: 'reef.jpg', mimeType: 'image/jpeg', buffer: image })
    await page.locator('[data-test=visit-photo-add]').click()
    await expect.poll(() => page.locator('[data-test=visit-photo-count]').innerText()).toBe('1 photo')
  }
  await page.getByLabel('Amount').first().fill('40')
  await page.getByLabel('Notes for the client').fill('All livestock eating well.')
  if (index === 0) await shot(page, 'visit-phone')
  await page.locator('[data-test=visit-close]').click()
  await page.locator('[data-test=visit-closed]').waitFor({ timeout: FIRST_LOAD_MS })
  if (index === 0) await shot(page, 'visit-closed-phone')
}

describe('a service round on a phone', () => {
  it('works three visits in order, closes each, and the client receives the visit report with its PDF', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    // The round of the planned day: a run that crosses the sites' midnight would open the next
    // day's round, with no stops, at plain /round.
    await page.goto(`${s.baseUrl}/round?date=${plannedDay}`)
    const stops = page.locator('[data-test=round-stop]')
    await stops.nth(2).waitFor({ timeout: FIRST_LOAD_MS })
    expect(await stops.locator('.v-card-title').allInnerTexts()).toEqual(['Harbour Dental', 'Corner Bakery', 'Harbour Dental'])
    expect(await page.locator('[data-test=round-address]').allInnerTexts()).toEqual([
      expect.stringContaining('Kaistraße 4'),
      expect.stringContaining('Bergmannstraße 12'),
      expect.stringContaining('Bergmannstraße 12'),
    ])
    expect(await stops.first().innerText()).toContain('Partial water change')
    await shot(page, 'round-phone')

    await workStop(page, 0, true)
    await workStop(page, 1, false)
    await workStop(page, 2, false)
    await page.goto(`${s.baseUrl}/round?date=${plannedDay}`)
    await stops.nth(2).waitFor()
    expect(await stops.locator('.v-chip').allInnerTexts()).toEqual(['closed', 'closed', 'closed'])

    const dental = await waitForMailTo('front@harbour.example', /visit report: Harbour Dental/)
    expect(dental.length).toBe(2)
    for (const mail of dental) expect(mail.attachments).toEqual([expect.objectContaining({ contentType: 'application/pdf' })])
    expect(dental.map((m) => m.html_body).join('')).toContain('pH 7.2: in band')
    const bakery = await waitForMailTo('hello@corner-bakery.example', /visit report: Corner Bakery/)
    expect(bakery[0]!.attachments[0]!.size).toBeGreaterThan(1000)
    // The reef's water change was ticked: done now, and logged.
    const logged = await s.ctx.models.CareLogEntry.count({ where: { kind: 'task_done' } })
    expect(logged).toBe(3)
  })

  it('the screens pass the accessibility audit at desktop and phone size', async () => {
    const found: string[] = []
    const visited = new Set<string | null>()
    const visit = await s.ctx.models.Visit.findOne({ order: [['id', 'ASC']] })
    for (const size of ['desktop', 'phone'] as Size[]) {
      const context = await newContext(browser, size, 'light')
      const page = await context.newPage()
      await signIn(page, s.baseUrl, org.users.owner.email)
      for (const path of ['/clients', `/clients/${clients.dental}`, '/visits', `/visits/${visit!.id}`]) {
        visited.add(await audit(page, size, `${s.baseUrl}${path}`, found))
        await shot(page, `${path.replace(/\W+/g, '-').replace(/^-/, '')}-${size}`)
      }
      const keeper = await context
        .browser()!
        .newContext({ viewport: size === 'phone' ? { width: 390, height: 844 } : { width: 1280, height: 800 }, bypassCSP: true })
      const keeperPage = await keeper.newPage()
      await signIn(keeperPage, s.baseUrl, org.users.keeper.email)
      visited.add(await audit(keeperPage, `${size}-keeper`, `${s.baseUrl}/round`, found))
      await shot(keeperPage, `round-${size}`)
      await page.goto(`${s.baseUrl}/clients/${clients.dental}`)
      await page.locator('[data-test=plan-visit]').click()
      await page.locator('.v-overlay--active .v-card').last().waitFor()
      await page.waitForTimeout(400)
      await checkPage(page, `${size}-plan-visit-dialog`, found)
      await shot(page, `plan-visit-${size}`)
      await keeper.close()
      await context.close()
    }
    expect(found).toEqual([])
    expect([...visited].sort()).toEqual([...AUDITED_ROUTES['visits.test.ts']!].sort())
  })

  it("the client's person sees their tanks and visit reports, nothing of the site's other tanks", async () => {
    const invite = await post('/users/invitations', { email: 'lindqvist@harbour.example', name: 'Dr Lindqvist', role: 'viewer', clientId: clients.dental })
    const token = new URL(invite.link, 'http://x').searchParams.get('token')!
    const accepted = await fetch(`${s.baseUrl}/api/v1/invitations/accept`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ token, password: 'a-long-enough-password' }),
    })
    expect(accepted.status).toBe(201)
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await signIn(page, s.baseUrl, 'lindqvist@harbour.example', 'a-long-enough-password')
    await page.goto(`${s.baseUrl}/tanks`)
    await page.locator('[data-test=tank-row]').first().waitFor({ timeout: FIRST_LOAD_MS })
    const text = await page.locator('main').innerText()
    expect(text).toContain('Waiting room reef')
    expect(text).not.toContain('Shop window tank')
    await page.goto(`${s.baseUrl}/visits`)
    await page.locator('[data-test=visit-row]').nth(1).waitFor({ timeout: FIRST_LOAD_MS })
    expect(await page.locator('[data-test=visit-row]').count()).toBe(2)
    await shot(page, 'visit-reports-client-phone')
    await page.locator('[data-test=visit-row]').first().click()
    await page.locator('[data-test=visit-report]').waitFor()
    await shot(page, 'visit-report-client-phone')
  })
})
