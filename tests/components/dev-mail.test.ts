import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { MailMessage } from '@shared/schemas/dev-mail'

vi.mock('@/api/dev-mail', () => ({ listMail: vi.fn(), getMail: vi.fn(), emptyMailbox: vi.fn() }))
vi.mock('@/api/sites', () => ({
  listSites: vi.fn(async () => [{ id: 3, name: 'Front shop', timeZone: 'Europe/Berlin', address: '', notes: '', archivedAt: null, tankCount: 1 }]),
}))

import { emptyMailbox, getMail, listMail } from '@/api/dev-mail'
import AppShell from '@/components/layout/AppShell.vue'
import DevMailView from '@/views/DevMailView.vue'
import { mountView } from './mount'

const message: MailMessage = {
  id: 4,
  receivedAt: '2026-03-03T02:10:05.000Z',
  organizationId: 1,
  envelopeFrom: 'alerts@tankwarden.test',
  envelopeTo: ['sam@example.test'],
  subject: '[Alarm] Reef display: temperature above 28 °C',
  attachments: [],
  rawSize: 2048,
  textBody: 'Temperature 28.6 °C since 03:00.',
  htmlBody: '<p>Temperature <b>28.6 °C</b></p><script>window.parent.hacked = true</script>',
  headers: {},
}

beforeEach(() => {
  vi.mocked(listMail).mockResolvedValue([message])
  vi.mocked(getMail).mockResolvedValue(message)
  vi.mocked(emptyMailbox).mockReset()
})

describe('test mailbox', () => {
  it('lists what arrived, clearly labelled as the local test mailbox', async () => {
    const { wrapper } = await mountView(DevMailView, { role: 'owner' })
    await flushPromises()
    expect(wrapper.find('h1').text()).toBe('Test mailbox')
    expect(wrapper.find('[data-test="test-mailbox-note"]').text()).toContain('This is the local test mailbox')
    const row = wrapper.find('[data-test="mail-list"] tbody tr').text()
    expect(row).toContain('sam@example.test')
    // 02:10 UTC is 03:10 in Berlin in March (CET), on the shop's clock and saying so.
    expect(row).toContain('3 Mar, 03:10 CET')
    expect(wrapper.find('[data-test="mail-list"] th').text()).toBe('Received (Europe/Berlin)')
    expect(row).toContain('[Alarm] Reef display: temperature above 28 °C')
  })

  it('shows the HTML in a sandbox that runs no scripts, and the text part', async () => {
    const { wrapper } = await mountView(DevMailView, { role: 'owner' })
    await flushPromises()
    await wrapper.find('[data-test="mail-list"] tbody tr').trigger('click')
    await flushPromises()
    const frame = wrapper.find('[data-test="mail-html"]')
    expect(frame.element.tagName).toBe('IFRAME')
    expect(frame.attributes('sandbox')).toBe('')
    expect((frame.element as HTMLIFrameElement).srcdoc).toBe(message.htmlBody)
    await wrapper.findAll('[data-test="mail-message"] .v-btn-toggle button')[1]!.trigger('click')
    expect(wrapper.find('[data-test="mail-text"]').text()).toBe('Temperature 28.6 °C since 03:00.')
  })

  it('shows the menu entry to an owner only when the server has the mailbox', async () => {
    let { wrapper } = await mountView(AppShell, { role: 'owner' })
    await flushPromises()
    expect(wrapper.text()).toContain('Test mailbox')
    expect(wrapper.text()).toContain('Incidents')
    wrapper.unmount()

    vi.mocked(listMail).mockResolvedValue(null)
    ;({ wrapper } = await mountView(AppShell, { role: 'owner' }))
    await flushPromises()
    expect(wrapper.text()).not.toContain('Test mailbox')
    wrapper.unmount()

    vi.mocked(listMail).mockClear()
    ;({ wrapper } = await mountView(AppShell, { role: 'keeper' }))
    await flushPromises()
    expect(listMail).not.toHaveBeenCalled()
    expect(wrapper.text()).not.toContain('Test mailbox')
    expect(wrapper.text()).toContain('Incidents')
  })
})
