import { QueryTypes } from 'sequelize'
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, tankWithProbe, postTemperatures, waitForRuleLeader, type App } from './keeper-setup'
import { waitFor } from '../helpers/wait'

// Links that arrive by mail, followed in Chromium: a password reset and an alert's acknowledge
// link, both through the local fake SMTP server and its test mailbox.
const MIN = 60_000
let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Mail Links Org')
  // One shop whose two sites share a zone: the mailbox shows its times on that clock. (With sites in
  // different zones it shows the viewer's own, named.)
  await s.ctx.models.Site.update({ timeZone: 'Europe/Berlin' }, { where: { id: org.siteIds[1] } })
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

/** The test app's public address is fixed before it picks a free port: a mailed link's path and query, at the app. */
const atApp = (link: string) => {
  const url = new URL(link)
  return `${s.baseUrl}${url.pathname}${url.search}`
}

type Mail = { id: number; subject: string; envelope_to: string[]; text_body: string }
async function waitForMailTo(address: string, subject: RegExp): Promise<Mail> {
  const found = await waitFor(
    async () => {
      await s.mail.sender.runOnce()
      const mails = await s.ctx.sequelize.query<Mail>('SELECT id, subject, envelope_to, text_body FROM fake_mailbox ORDER BY id', { type: QueryTypes.SELECT })
      return mails.find((m) => m.envelope_to.includes(address) && subject.test(m.subject))
    },
    (mail) => mail !== undefined,
    15_000,
    100,
  )
  return found!
}

describe('a forgotten password, from the sign-in page to signing in with the new one', () => {
  it('asks by mail, gives the same answer for an unknown address, sets the password from the mailed link, and refuses the link twice', async () => {
    const keeper = org.users.keeper.email
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await page.goto(`${s.baseUrl}/sign-in`, { timeout: FIRST_LOAD_MS })
    await page.getByLabel('E-mail').fill('nobody@nowhere.example', { timeout: FIRST_LOAD_MS })
    await shot(page, 'sign-in-forgot-link-phone')
    await page.locator('[data-test=forgot-password]').click()
    await page.waitForURL(/\/forgot-password/)
    // The address typed on the sign-in page comes along.
    expect(await page.getByLabel('E-mail').inputValue()).toBe('nobody@nowhere.example')
    await page.locator('[data-test=reset-request]').click()
    const unknownAnswer = (await page.locator('[data-test=reset-requested]').innerText()).replace('nobody@nowhere.example', '<address>')
    await shot(page, 'forgot-password-phone')

    await page.goto(`${s.baseUrl}/forgot-password`)
    await page.getByLabel('E-mail').fill(keeper)
    await page.locator('[data-test=reset-request]').click()
    const knownAnswer = (await page.locator('[data-test=reset-requested]').innerText()).replace(keeper, '<address>')
    expect(knownAnswer).toBe(unknownAnswer)

    // The owner reads it in the test mailbox, where its time is on the shop's clock and says so.
    const mail = await waitForMailTo(keeper, /Reset your Tankwarden password/)
    const owner = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(owner, s.baseUrl, org.users.owner.email)
    await owner.goto(`${s.baseUrl}/dev/mail`)
    const row = owner.locator('[data-test=mail-list] tr', { hasText: 'Reset your Tankwarden password' })
    await row.waitFor({ timeout: FIRST_LOAD_MS })
    expect(await owner.locator('[data-test=mail-list] th').first().textContent()).toBe('Received (Europe/Berlin)')
    expect(await row.locator('td').first().innerText()).toMatch(/^\d{1,2} \w{3}, \d{2}:\d{2} CES?T$/)
    await row.getByRole('link').click()
    await owner.getByRole('button', { name: 'Text' }).click()
    const text = await owner.locator('[data-test=mail-text]').innerText()
    await shot(owner, 'dev-mail-reset-desktop')
    const mailed = /(http:\/\/\S+\/reset-password\?token=[\w-]+)/.exec(text)![1]!
    expect(mail.text_body).toContain(mailed)
    const link = atApp(mailed)

    await page.goto(link)
    await page.getByLabel('New password', { exact: true }).fill('short')
    await page.getByLabel('Repeat the new password').fill('short')
    await page.locator('[data-test=reset-submit]').click()
    expect(await page.getByText('at least 10 characters').first().isVisible()).toBe(true)
    await page.getByLabel('New password', { exact: true }).fill('a-fresh-keeper-password')
    await page.getByLabel('Repeat the new password').fill('a-fresh-keeper-passwort')
    await page.locator('[data-test=reset-submit]').click()
    expect(await page.getByText('the passwords differ').isVisible()).toBe(true)
    await page.getByLabel('Repeat the new password').fill('a-fresh-keeper-password')
    await shot(page, 'reset-password-phone')
    await page.locator('[data-test=reset-submit]').click()
    await page.locator('[data-test=reset-done]').waitFor()
    await page.locator('[data-test=reset-sign-in]').click()
    await page.waitForURL(/\/sign-in/)
    await signIn(page, s.baseUrl, keeper, 'a-fresh-keeper-password')
    // A keeper's home is the overview.
    expect(new URL(page.url()).pathname).toBe('/')

    // The same link a second time: refused by name, with the way to a new one.
    const again = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await again.goto(link)
    await again.getByLabel('New password', { exact: true }).fill('yet-another-password')
    await again.getByLabel('Repeat the new password').fill('yet-another-password')
    await again.locator('[data-test=reset-submit]').click()
    expect(await again.locator('[data-test=reset-dead-link]').innerText()).toContain('already been used')
    expect(await again.getByRole('link', { name: 'Ask for a new link' }).isVisible()).toBe(true)
    await shot(again, 'reset-password-used-phone')
    await Promise.all([page.close(), owner.close(), again.close()])
  })
})

describe('the acknowledge link of an alert mail', () => {
  it('acknowledges from the mail and then shows the incident as acknowledged, by whom and when, on the site’s clock', async () => {
    await waitForRuleLeader(s)
    const site = org.siteIds[0] as number
    for (let weekday = 0; weekday < 7; weekday++) {
      const shift = await api(s, `/sites/${site}/roster/shifts`, org.users.owner.token, {
        method: 'POST',
        body: JSON.stringify({ userId: org.users.keeper.id, weekday, start: '00:00', end: '00:00' }),
      })
      expect(shift.status).toBe(201)
    }
    const probe = await tankWithProbe(s, org.users.owner.token, site, 'Reef display')
    const t0 = Date.now() - 20 * MIN
    expect(
      await postTemperatures(
        s,
        probe.token,
        Array.from({ length: 13 }, (_, i) => [t0 + i * MIN, 28.4 + i * 0.1]),
      ),
    ).toBe(13)
    await s.rules.engine.settle()
    const mail = await waitForMailTo(org.users.keeper.email, /^Alarm: temperature/)
    const link = atApp(/(http:\/\/\S+\/ack\?token=[\w-]+)/.exec(mail.text_body)![1]!)

    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await page.goto(link, { timeout: FIRST_LOAD_MS })
    const about = page.locator('[data-test=ack-incident]')
    await about.waitFor({ timeout: FIRST_LOAD_MS })
    // Berlin is CET in winter and CEST in summer; the page names the one in force.
    expect(await page.locator('[data-test=ack-opened]').innerText()).toMatch(/^Reef display · opened \d{1,2} \w{3}, \d{2}:\d{2} CES?T$/)
    expect(await about.innerText()).toContain('local time (Europe/Berlin)')
    await shot(page, 'ack-before-phone')
    await page.locator('textarea[name=ackNote]').fill('On my way')
    await page.locator('[data-test=ack-button]').click()
    expect(await page.locator('[data-test=ack-outcome]').innerText()).toContain('Acknowledged')
    const handled = await page.locator('[data-test=ack-handled]').innerText()
    expect(handled).toMatch(/^Acknowledged by keeper of Mail Links Org on \d{1,2} \w{3}, \d{2}:\d{2} CES?T$/)
    expect(await about.innerText()).toMatch(/Acknowledged/)
    await shot(page, 'ack-done-phone')

    // Opened again later (or by a mail scanner): still shown as acknowledged, the link spent.
    await page.reload()
    await page.locator('[data-test=ack-handled]').waitFor()
    expect(await page.locator('[data-test=ack-handled]').innerText()).toBe(handled)
    expect(await page.locator('[data-test=ack-outcome]').innerText()).toContain('already used')
    const desktop = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await desktop.goto(link)
    await desktop.locator('[data-test=ack-handled]').waitFor({ timeout: FIRST_LOAD_MS })
    await shot(desktop, 'ack-done-desktop')
    await Promise.all([page.close(), desktop.close()])
  })
})
