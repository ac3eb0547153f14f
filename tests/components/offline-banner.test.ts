import { flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it } from 'vitest'
import OfflineBanner from '@/components/offline/OfflineBanner.vue'
import type { OutboxItem } from '@/offline/db'
import { outboxItems, outboxNotices } from '@/offline/outbox'
import { shownSavedAt } from '@/offline/saved-reads'
import { useOfflineStore } from '@/offline/store'
import { mountView } from './mount'

const item = (over: Partial<OutboxItem>): OutboxItem => ({
  clientId: '7d3c2f7e-1b5a-4c9e-8f00-1a2b3c4d5e6f',
  seq: 1,
  userId: 1,
  kind: 'test-kit',
  tankId: 12,
  url: '/tanks/12/test-kit-entries',
  body: {},
  label: 'Test-kit entry · Reef 1: pH 7.4',
  madeAt: '2026-03-03T10:00:00.000Z',
  state: 'waiting',
  ...over,
})

afterEach(() => {
  outboxItems.value = []
  outboxNotices.value = []
  shownSavedAt.value = null
})

describe('OfflineBanner', () => {
  it('stays away while online with nothing kept', async () => {
    const { wrapper } = await mountView(OfflineBanner, { role: 'keeper' })
    expect(wrapper.find('[data-test="offline-banner"]').exists()).toBe(false)
  })

  it('says the device is offline, how old the shown data is, and lists what waits and what was refused', async () => {
    const { wrapper } = await mountView(OfflineBanner, { role: 'keeper' })
    useOfflineStore().online = false
    shownSavedAt.value = Date.now() - 2 * 3600_000
    outboxItems.value = [
      item({}),
      item({ clientId: 'a2', seq: 2, kind: 'task-done', label: 'Done · Reef 1: Clean the glass', state: 'refused', reason: 'id: this task is switched off' }),
    ]
    await flushPromises()
    expect(wrapper.find('[data-test="offline-state"]').text()).toContain('No connection.')
    expect(wrapper.find('[data-test="offline-saved-age"]').text()).toBe('Showing what this device saved 2 h ago.')
    const count = wrapper.find('[data-test="offline-count"]')
    expect(count.text()).toBe('1 waiting to send, 1 refused')
    await count.trigger('click')
    const rows = wrapper.findAll('[data-test="offline-item"]')
    expect(rows.map((r) => r.find('.v-list-item-title').text())).toEqual(['Test-kit entry · Reef 1: pH 7.4', 'Done · Reef 1: Clean the glass'])
    expect(rows[0]!.text()).toContain('waiting to send')
    expect(rows[1]!.find('[data-test="offline-refused"]').text()).toBe('refused: id: this task is switched off')
    // Only a test-kit entry has a form to be fixed in; any refused entry may be discarded.
    expect(rows[1]!.text()).not.toContain('Fix')
    expect(rows[1]!.find('[data-test="offline-discard"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="offline-send-now"]').exists()).toBe(false)
  })

  it('offers Send now while online with entries waiting, and shows a notice of a tick someone else made', async () => {
    const { wrapper } = await mountView(OfflineBanner, { role: 'keeper' })
    useOfflineStore().online = true
    outboxItems.value = [item({})]
    outboxNotices.value = ['Done · Reef 1: Clean the glass: Already done by Sam since you looked']
    await flushPromises()
    await wrapper.find('[data-test="offline-count"]').trigger('click')
    expect(wrapper.find('[data-test="offline-send-now"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="offline-notice"]').text()).toContain('Already done by Sam since you looked')
  })
})
