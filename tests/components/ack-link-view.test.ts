import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { AckLinkInfo } from '@shared/schemas/incidents'

vi.mock('@/api/incidents', () => ({ describeAckLink: vi.fn(), redeemAckLink: vi.fn() }))

import { ApiError } from '@/api/errors'
import { describeAckLink, redeemAckLink } from '@/api/incidents'
import AckLinkView from '@/views/AckLinkView.vue'
import { mountView } from './mount'

const TOKEN = 'ack_abcdefghijklmnopqrstuvwxyz0123'
const fresh: AckLinkInfo = {
  incident: {
    id: 55,
    title: 'Temperature above 28 °C for 10 min',
    severity: 'alarm',
    state: 'open',
    tankName: 'Reef display',
    siteName: 'Front shop',
    timeZone: 'Europe/Berlin',
    clockStyle: '24h',
    openedAt: '2026-03-03T02:10:00.000Z',
    acknowledgedAt: null,
    acknowledgedBy: null,
    resolvedAt: null,
    resolvedBy: null,
  },
  usedAt: null,
  expiresAt: '2026-03-05T02:10:00.000Z',
  expired: false,
}

beforeEach(() => {
  vi.mocked(describeAckLink).mockReset()
  vi.mocked(redeemAckLink).mockReset()
})

async function openLink(info: AckLinkInfo = fresh) {
  vi.mocked(describeAckLink).mockResolvedValue(info)
  // No role: whoever opens the mail may have no session on this device.
  const { wrapper } = await mountView(AckLinkView, { path: `/ack?token=${TOKEN}` })
  await flushPromises()
  return wrapper
}

describe('acknowledge link page', () => {
  it('describes the incident on opening but does not acknowledge it', async () => {
    const wrapper = await openLink()
    expect(describeAckLink).toHaveBeenCalledWith(TOKEN)
    expect(redeemAckLink).not.toHaveBeenCalled()
    const about = wrapper.find('[data-test="ack-incident"]').text()
    expect(about).toContain('Temperature above 28 °C for 10 min')
    expect(about).toContain('Reef display')
    expect(about).toContain('Alarm')
    // 02:10 UTC is 03:10 in Berlin in March (CET, UTC+1), and the page says whose clock it is.
    expect(wrapper.find('[data-test="ack-opened"]').text()).toBe('Reef display · opened 3 Mar, 03:10 CET')
    expect(about).toContain("Times are Front shop's local time (Europe/Berlin).")
    expect(wrapper.find('[data-test="ack-button"]').exists()).toBe(true)
  })

  it("shows the times on the organisation's 12-hour clock when it chose one, without a session", async () => {
    const wrapper = await openLink({ ...fresh, incident: { ...fresh.incident, clockStyle: '12h' } })
    expect(wrapper.find('[data-test="ack-opened"]').text()).toBe('Reef display · opened 3 Mar, 3:10 am CET')
  })

  it('acknowledges on the button, with the note', async () => {
    vi.mocked(redeemAckLink).mockResolvedValue({
      state: 'acknowledged',
      alreadyHandled: false,
      incident: { ...fresh.incident, state: 'acknowledged', acknowledgedAt: '2026-03-03T02:12:00.000Z', acknowledgedBy: { name: 'Robin Keeper' } },
    })
    const wrapper = await openLink()
    await wrapper.find('textarea[name="ackNote"]').setValue('  Driving in now ')
    await wrapper.find('form').trigger('submit')
    await flushPromises()
    expect(redeemAckLink).toHaveBeenCalledTimes(1)
    expect(redeemAckLink).toHaveBeenCalledWith(TOKEN, 'Driving in now')
    expect(wrapper.find('[data-test="ack-outcome"]').text()).toContain('Acknowledged — escalation stopped')
    expect(wrapper.find('[data-test="ack-handled"]').text()).toBe('Acknowledged by Robin Keeper on 3 Mar, 03:12 CET')
    expect(wrapper.find('[data-test="ack-incident"]').text()).toContain('Acknowledged')
    expect(wrapper.find('[data-test="ack-button"]').exists()).toBe(false)
  })

  it('says the link was already used when the server answers 409', async () => {
    vi.mocked(redeemAckLink).mockRejectedValue(
      new ApiError({ status: 409, code: 'link_used', message: 'This link was already used on 2026-03-03T02:20:00.000Z' }),
    )
    const wrapper = await openLink()
    await wrapper.find('form').trigger('submit')
    await flushPromises()
    expect(redeemAckLink).toHaveBeenCalledTimes(1)
    expect(wrapper.find('[data-test="ack-outcome"]').text()).toContain('This link has already been used')
  })

  it('says so at once on a second visit, offering no button', async () => {
    const wrapper = await openLink({ ...fresh, usedAt: '2026-03-03T02:20:00.000Z' })
    expect(wrapper.find('[data-test="ack-outcome"]').text()).toBe('This link was already used on 3 Mar, 03:20 CET. Nothing more to do here.')
    expect(wrapper.find('[data-test="ack-button"]').exists()).toBe(false)
    expect(redeemAckLink).not.toHaveBeenCalled()
  })

  it('says an expired link has expired', async () => {
    const wrapper = await openLink({ ...fresh, expired: true })
    expect(wrapper.find('[data-test="ack-outcome"]').text()).toContain('This link has expired')
    expect(wrapper.find('[data-test="ack-button"]').exists()).toBe(false)
  })

  it('reports a 410 from the button in the server’s words', async () => {
    vi.mocked(redeemAckLink).mockRejectedValue(new ApiError({ status: 410, code: 'link_expired', message: 'This link has expired; acknowledge in the app' }))
    const wrapper = await openLink()
    await wrapper.find('form').trigger('submit')
    await flushPromises()
    expect(wrapper.find('[data-test="ack-outcome"]').text()).toBe('This link has expired; acknowledge in the app')
  })
})
