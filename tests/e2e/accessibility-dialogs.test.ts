import type { Page } from 'playwright-core'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { formatLocalDate } from '@shared/time/zoned'
import { bearer } from '../helpers/app'
import { closeOverlay, go } from './a11y-pages'
import { click, startDialogWorld, startSignedInAuditor, type DialogWorld } from './dialog-audit-setup'
import { api } from './keeper-setup'

// The less used dialogs of a tank page and the account menu, opened on top of their screens and audited with axe-core
// against WCAG 2.1 levels A and AA (Web Content Accessibility Guidelines 2.1, W3C, 2018) in both
// themes, at desktop and phone sizes, like the screens in accessibility.test.ts. The screens under
// them are audited there and in their own feature tests; the roster's, supplies', clients' and
// visits' dialogs are in accessibility-dialogs-more.test.ts.

let world: DialogWorld
const ids = { phProbe: 0, batch: 0, equipment: 0, photo: 0 }

beforeAll(async () => {
  world = await startDialogWorld()
  const { s, post, zone, today } = world
  const tank = world.ids.tank
  const probe = await post('/devices', { tankId: tank, name: 'pH and light probe', metrics: ['ph', 'temperature', 'light'], intervalSeconds: 600 })
  ids.phProbe = probe.device.id
  // Two days of light every half hour, on from 09:00 to 19:00 on the site's clock (invented demo figures).
  const readings = []
  for (let ms = Date.now() - 48 * 3_600_000; ms <= Date.now(); ms += 30 * 60_000) {
    const hour = Number(new Intl.DateTimeFormat('en-GB', { timeZone: zone, hour: 'numeric', hourCycle: 'h23' }).format(ms))
    readings.push({ metric: 'light', value: hour >= 9 && hour < 19 ? 800 : 0, time: new Date(ms).toISOString() })
  }
  const sent = await api(s, '/readings', probe.token, { method: 'POST', body: JSON.stringify({ v: 1, readings }) })
  expect(sent.body?.accepted, JSON.stringify(sent.body)).toBe(readings.length)
  ids.batch = (await post(`/tanks/${tank}/livestock`, { speciesKey: 'zebra_danio', count: 12, source: 'Test wholesaler' })).entry.id
  ids.equipment = (
    await post(`/tanks/${tank}/equipment`, { kind: 'heater', name: 'Main heater', model: 'Glass heater', watts: 200, installedOn: formatLocalDate(today) })
  ).id

  const image = await sharp({ create: { width: 800, height: 600, channels: 3, background: { r: 30, g: 110, b: 140 } } })
    .jpeg()
    .toBuffer()
  const form = new FormData()
  form.append('caption', 'Lobby reef after the rescape')
  form.append('photo', new Blob([image]), 'reef.jpg')
  const photo = await fetch(`${s.baseUrl}/api/v1/tanks/${tank}/photos`, { method: 'POST', body: form, headers: bearer(world.org.users.owner.token) })
  expect(photo.status).toBe(201)
  ids.photo = ((await photo.json()) as { id: number }).id
})
afterAll(() => world?.close())

describe('dialogs and menus meet WCAG 2.1 AA as axe-core checks them', () => {
  // One browser context, signed in once; each dialog is opened once per theme and checked at both
  // sizes (a11y-pages.ts).
  it('at desktop and phone size, in the light and the dark theme', async () => {
    const { context, auditor } = await startSignedInAuditor(world)

    await auditor.overlay('account-menu', click('[data-test=account-menu]'), { inside: '.v-list' })

    await auditor.each((page) => go(page, `/tanks/${world.ids.tank}`))
    // The light-cycle bars as a table, as someone who cannot see them asks for them.
    const lightCycle = (page: Page) => page.locator('[data-test=light-cycle]')
    await auditor.each(async (page) => {
      await lightCycle(page).locator('[data-test=light-table-toggle]').click()
      await lightCycle(page).locator('[data-test=light-table] caption').waitFor()
    })
    await auditor.checkEveryLook('light-cycle-table', (page) => lightCycle(page).locator('[data-test=light-table]'))
    await auditor.overlay('device-register-dialog', click('[data-test=register-device]'))
    await auditor.overlay('device-token-dialog', (page) =>
      page.locator('[data-test=devices-panel]').getByRole('button', { name: 'Rotate token' }).first().click(),
    )
    // The calibration history, and over it the form that records one.
    await auditor.overlay('calibration-dialog', click(`[data-test=calibration-${ids.phProbe}]`), { close: false })
    await auditor.overlay('calibration-form-dialog', click('[data-test=record-calibration]'))
    await auditor.each((page) => closeOverlay(page, page.locator('[data-test=calibration-dialog]')))
    await auditor.overlay('snooze-dialog', click('[data-test=add-snooze]'))
    await auditor.overlay('care-snooze-dialog', click('[data-test=care-task-snooze]'))
    await auditor.overlay('livestock-add-dialog', click('[data-test=livestock-add]'))
    await auditor.overlay('batch-move-dialog', click(`[data-test=livestock-move-${ids.batch}]`))
    await auditor.overlay('batch-out-dialog', click(`[data-test=livestock-sell-${ids.batch}]`))
    await auditor.overlay('livestock-loss-dialog', (page) =>
      page.locator(`[data-test=livestock-${ids.batch}]`).getByRole('button', { name: 'Record loss' }).click(),
    )
    await auditor.overlay('equipment-dialog', click('[data-test=equipment-add]'))
    await auditor.overlay('equipment-replace-dialog', click(`[data-test=equipment-replace-${ids.equipment}]`))
    await auditor.overlay('photo-upload-dialog', click('[data-test=photo-add]'))
    await auditor.overlay('photo-viewer', click(`[data-test=photo-${ids.photo}]`))

    await context.close()

    expect(auditor.found, auditor.found.join('\n\n')).toEqual([])
  }, 600_000)
})
