import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { PublicSnooze } from '@shared/schemas/rules'

vi.mock('@/api/rules')

import { ApiError } from '@/api/errors'
import { cancelSnooze, createSnooze, listSnoozes } from '@/api/rules'
import SnoozeDialog from '@/components/rules/SnoozeDialog.vue'
import SnoozesPanel from '@/components/rules/SnoozesPanel.vue'
import { mountView } from './mount'
import { typeMoment } from './type-moment'

// A panel written with useEditableList, end to end: list, dialog, the server's field message,
// the message going when the field is edited, and the list fetched again after the save.
const inDocument = (selector: string) => new DOMWrapper(document.querySelector(selector)!)
const messageUnder = (input: string) =>
  (document.querySelector(`input[name="${input}"]`)?.closest('.v-input')?.querySelector('.v-messages')?.textContent ?? '').trim()

const snooze: PublicSnooze = {
  id: 31,
  tankId: 12,
  reason: 'Moving the tank to the new stand',
  startsAt: '2026-01-10T09:00:00.000Z',
  endsAt: '2026-01-10T17:00:00.000Z',
  weekly: false,
  repeatUntil: null,
  includeHeaterLine: false,
  createdBy: 7,
  cancelledAt: null,
  suppresses: ['Temperature alerts'],
}

beforeEach(() => {
  vi.mocked(listSnoozes).mockReset()
  vi.mocked(createSnooze).mockReset()
  vi.mocked(cancelSnooze).mockReset()
})

async function openPanelAndDialog() {
  const { wrapper } = await mountView(SnoozesPanel, { role: 'keeper', props: { tankId: 12, tankName: 'Reef display', timeZone: 'UTC' } })
  await flushPromises()
  await wrapper.find('[data-test="add-snooze"]').trigger('click')
  await flushPromises()
  await inDocument('input[name="snoozeReason"]').setValue('Moving the tank to the new stand')
  await typeMoment('snoozeStarts', '2026-01-10T09:00')
  await typeMoment('snoozeEnds', '2026-01-10T17:00')
  return wrapper
}

// Several mounts and dialog round trips: slow on a loaded machine, so a generous limit.
describe('snoozes panel', { timeout: 30_000 }, () => {
  it('shows the server’s message under its field, drops it once the field is edited, then saves and lists again', async () => {
    vi.mocked(listSnoozes).mockResolvedValueOnce([]).mockResolvedValueOnce([snooze])
    vi.mocked(createSnooze)
      .mockRejectedValueOnce(
        new ApiError({ status: 400, code: 'invalid_input', message: 'endsAt: overlaps', fields: { endsAt: 'overlaps the snooze already set' } }),
      )
      .mockResolvedValueOnce(snooze)
    const wrapper = await openPanelAndDialog()
    expect(wrapper.text()).toContain('No snoozes: every alert is sent.')

    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(messageUnder('snoozeEnds')).toBe('overlaps the snooze already set')
    expect(listSnoozes).toHaveBeenCalledTimes(1)

    await inDocument('input[name="snoozeReason"]').setValue('Moving the tank to the new stand, second go')
    await flushPromises()
    expect(messageUnder('snoozeEnds')).toBe('overlaps the snooze already set')
    await typeMoment('snoozeEnds', '2026-01-10T16:00')
    await flushPromises()
    // The field's own hint comes back in place of the message.
    expect(messageUnder('snoozeEnds')).toBe('At most 7 days at a time')

    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(createSnooze).toHaveBeenCalledTimes(2)
    expect(wrapper.findComponent(SnoozeDialog).props('modelValue')).toBe(false)
    expect(listSnoozes).toHaveBeenCalledTimes(2)
    expect(wrapper.find('[data-test="snooze-31"]').text()).toContain('Moving the tank to the new stand')
    expect(wrapper.find('[data-test="snooze-suppresses"]').text()).toContain('Temperature alerts')
  })

  it('closes the dialog and says why above the list when the save fails for another reason', async () => {
    vi.mocked(listSnoozes).mockResolvedValue([])
    vi.mocked(createSnooze).mockRejectedValue(new ApiError({ status: 403, code: 'forbidden', message: 'You may not change this tank.' }))
    const wrapper = await openPanelAndDialog()
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(wrapper.find('[data-test="snoozes-panel"] .v-alert').text()).toContain('You may not change this tank.')
    expect(wrapper.findComponent(SnoozeDialog).props('modelValue')).toBe(false)
  })
})
