import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'

vi.mock('@/api/care')

import { createCareTask, listCareTasks, markCareTaskDone, snoozeCareTask } from '@/api/care'
import CareTasksPanel from '@/components/care/CareTasksPanel.vue'
import { dueDetail, recurrenceText } from '@/components/care/care-words'
import { mountView } from '../mount'
import { careTask } from './fixtures'

const inDocument = (selector: string) => new DOMWrapper(document.querySelector(selector)!)

// Today is Tue 3 Mar 2026 on the site's calendar in every fixture.
const tasks = [
  careTask(1, { title: 'Clean the glass', due: { dueOn: '2026-03-08', status: 'later', daysUntilDue: 5, snoozed: false, today: '2026-03-03' } }),
  careTask(2, { title: 'Rinse the filter sponge', due: { dueOn: '2026-03-01', status: 'overdue', daysUntilDue: -2, snoozed: false, today: '2026-03-03' } }),
  careTask(3, { title: 'Test-kit check', due: { dueOn: '2026-03-04', status: 'due_soon', daysUntilDue: 1, snoozed: false, today: '2026-03-03' } }),
  careTask(4, { title: 'Partial water change', due: { dueOn: '2026-03-03', status: 'due_today', daysUntilDue: 0, snoozed: false, today: '2026-03-03' } }),
  careTask(5, { title: 'Clean the substrate', active: false, due: null }),
]

beforeEach(() => {
  vi.mocked(listCareTasks).mockReset()
  vi.mocked(listCareTasks).mockResolvedValue(tasks)
  vi.mocked(markCareTaskDone).mockReset()
  vi.mocked(snoozeCareTask).mockReset()
  vi.mocked(createCareTask).mockReset()
})

async function mountPanel(role: 'owner' | 'keeper' | 'viewer') {
  const canWrite = role !== 'viewer'
  const { wrapper } = await mountView(CareTasksPanel, { role, props: { tankId: 12, canWrite, canManage: role === 'owner', timeZone: 'UTC' } })
  await flushPromises()
  return wrapper
}

describe('care task status words', () => {
  it('says each status in words with its own icon, overdue first and switched-off last', async () => {
    const wrapper = await mountPanel('viewer')
    const chips = wrapper.findAll('[data-test="care-status"]')
    expect(chips.map((c) => c.text())).toEqual(['Overdue', 'Due today', 'Due soon', 'Later', 'Switched off'])
    expect(chips.map((c) => c.attributes('data-status'))).toEqual(['overdue', 'due_today', 'due_soon', 'later', 'switched_off'])
    expect(chips[0]!.find('.mdi-alert-circle').exists()).toBe(true)
    expect(chips[1]!.find('.mdi-calendar-today').exists()).toBe(true)
    expect(wrapper.findAll('[data-test="care-task-title"]').map((t) => t.text())).toEqual([
      'Rinse the filter sponge',
      'Partial water change',
      'Test-kit check',
      'Clean the glass',
      'Clean the substrate',
    ])
    // A viewer gets no buttons.
    expect(wrapper.find('[data-test="care-task-done"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="care-task-add"]').exists()).toBe(false)
  })

  it('gives the days in words against the site calendar', () => {
    // 1 Mar 2026 is a Sunday, 4 Mar a Wednesday, 8 Mar a Sunday (Gregorian calendar).
    expect(dueDetail(tasks[1]!.due!)).toBe('overdue by 2 days (was due Sun 1 Mar)')
    expect(dueDetail(tasks[3]!.due!)).toBe('due today')
    expect(dueDetail(tasks[2]!.due!)).toBe('due tomorrow (Wed 4 Mar)')
    expect(dueDetail(tasks[0]!.due!)).toBe('due in 5 days (Sun 8 Mar)')
    expect(recurrenceText({ kind: 'interval', everyDays: 14 })).toBe('Every 14 days')
    expect(recurrenceText({ kind: 'weekdays', weekdays: [0, 3] })).toBe('Every Mon, Thu')
  })
})

describe('CareTasksPanel actions', () => {
  it('marks a task done with one tap and shows it done', async () => {
    const done = careTask(2, {
      title: 'Rinse the filter sponge',
      lastDoneAt: '2026-03-03T10:00:00.000Z',
      due: { dueOn: '2026-03-17', status: 'later', daysUntilDue: 14, snoozed: false, today: '2026-03-03' },
    })
    vi.mocked(markCareTaskDone).mockResolvedValue({
      task: done,
      logEntry: {
        id: 9,
        tankId: 12,
        kind: 'task_done',
        at: '2026-03-03T10:00:00.000Z',
        by: { id: 7, name: 'Pat' },
        text: 'Rinse the filter sponge',
        values: {},
        careTaskId: 2,
        waterChangeId: null,
      },
    })
    const wrapper = await mountPanel('keeper')
    await wrapper.find('[data-test="care-task-2"] [data-test="care-task-done"]').trigger('click')
    await flushPromises()
    expect(vi.mocked(markCareTaskDone).mock.calls[0]?.slice(0, 2)).toEqual([expect.objectContaining({ id: 2, tankId: 12 }), {}])
    expect(wrapper.find('[data-test="care-task-2"] [data-test="care-status"]').text()).toBe('Later')
    expect(wrapper.find('[data-test="care-task-notice"]').text()).toContain('Rinse the filter sponge: done')
    expect(wrapper.findComponent(CareTasksPanel).emitted('logged')).toHaveLength(1)
    // Adding tasks is for owners.
    expect(wrapper.find('[data-test="care-task-add"]').exists()).toBe(false)
  })

  it('asks for a reason before snoozing', async () => {
    vi.mocked(snoozeCareTask).mockResolvedValue({ ...tasks[1]!, snoozedUntil: '2026-03-04T10:00:00.000Z', snoozeReason: 'no sponge in stock' })
    const wrapper = await mountPanel('keeper')
    await wrapper.find('[data-test="care-task-2"] [data-test="care-task-snooze"]').trigger('click')
    await flushPromises()
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(snoozeCareTask).not.toHaveBeenCalled()
    expect(document.querySelector('.v-dialog')!.textContent).toContain('say why')
    await inDocument('input[name="reason"]').setValue('no sponge in stock')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(snoozeCareTask).toHaveBeenCalledWith(2, { until: expect.stringMatching(/Z$/), reason: 'no sponge in stock' })
    expect(wrapper.find('[data-test="care-task-snoozed"]').text()).toContain('no sponge in stock')
  })

  it('lets the owner add a task that repeats on weekdays', async () => {
    vi.mocked(createCareTask).mockResolvedValue(
      careTask(6, { kind: 'test_kit_check', title: 'Test-kit check', recurrence: { kind: 'weekdays', weekdays: [0, 3] } }),
    )
    const wrapper = await mountPanel('owner')
    await wrapper.find('[data-test="care-task-add"]').trigger('click')
    await flushPromises()
    await inDocument('[data-test="repeat-weekdays"] input').setValue(true)
    await flushPromises()
    const chips = document.querySelectorAll('[data-test="weekday-picker"] .v-chip')
    ;(chips[0] as HTMLElement).click()
    await flushPromises()
    ;(chips[3] as HTMLElement).click()
    await flushPromises()
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(createCareTask).toHaveBeenCalledWith(12, { kind: 'water_change', recurrence: { kind: 'weekdays', weekdays: [0, 3] } })
    expect(wrapper.find('[data-test="care-task-6"]').exists()).toBe(true)
  })
})
