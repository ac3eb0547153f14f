import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import SnoozeDialog from '@/components/rules/SnoozeDialog.vue'
import { parseSnoozeDraft } from '@/components/rules/snooze-draft'
import { mountView } from './mount'
import { typeMoment } from './type-moment'

const inDocument = (selector: string) => new DOMWrapper(document.querySelector(selector)!)
// Mid-January: no clock change in any zone the tests may run in falls between these dates.
const local = (text: string) => new Date(text).toISOString()

async function openDialog() {
  const { wrapper } = await mountView(SnoozeDialog, { role: 'keeper', props: { modelValue: true, tankName: 'Reef display' } })
  await flushPromises()
  return wrapper.findComponent(SnoozeDialog)
}

describe('snooze form', () => {
  it('says before saving that heater-line alarms are still sent, with the box and its warning', async () => {
    await openDialog()
    expect(inDocument('[data-test="heater-line-statement"]').text()).toBe(
      'Heater-line alarms are still sent unless you tick ‘Also silence heater-line alarms’.',
    )
    expect(document.querySelector('.v-dialog')!.textContent).toContain('Also silence heater-line alarms')
    const checkbox = document.querySelector('input[name="snoozeHeaterLine"]') as HTMLInputElement
    expect(checkbox.checked).toBe(false)
    // The test renderer wraps the alert in a transition stub that takes the attribute.
    const warning = inDocument('[data-test="heater-line-warning"] .v-alert')
    expect(warning.text()).toContain('Nobody will be told if the water falls to the heater top')
    expect(warning.classes()).toContain('text-alarm')
  })

  it('refuses more than 7 days and sends nothing', async () => {
    const dialog = await openDialog()
    await inDocument('input[name="snoozeReason"]').setValue('Moving the tank to the new stand')
    await typeMoment('snoozeStarts', '2026-01-10T09:00')
    await typeMoment('snoozeEnds', '2026-01-17T09:01')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(document.querySelector('.v-dialog')!.textContent).toContain('at most 7 days at a time')
    expect(dialog.emitted('save')).toBeUndefined()
  })

  it('sends exactly 7 days, heater line left alone unless ticked', async () => {
    const dialog = await openDialog()
    await inDocument('input[name="snoozeReason"]').setValue('Moving the tank to the new stand')
    await typeMoment('snoozeStarts', '2026-01-10T09:00')
    await typeMoment('snoozeEnds', '2026-01-17T09:00')
    await inDocument('.v-dialog form').trigger('submit')
    expect(dialog.emitted('save')![0]).toEqual([
      {
        reason: 'Moving the tank to the new stand',
        startsAt: local('2026-01-10T09:00'),
        endsAt: local('2026-01-17T09:00'),
        weekly: false,
        includeHeaterLine: false,
      },
    ])
  })

  it('repeats weekly only with an end date, which counts the whole day', () => {
    const base = { reason: 'Weekly glass clean', startsAt: '2026-01-12T10:00', endsAt: '2026-01-12T11:00', includeHeaterLine: false }
    expect(parseSnoozeDraft({ ...base, weekly: true, repeatUntil: '' })).toEqual({ ok: false, errors: { repeatUntil: 'a weekly snooze needs an end date' } })
    const result = parseSnoozeDraft({ ...base, weekly: true, repeatUntil: '2026-03-30' })
    expect(result.ok && result.input.repeatUntil).toBe(local('2026-03-30T23:59:59'))
  })
})
