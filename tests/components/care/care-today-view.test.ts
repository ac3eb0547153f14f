import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'

vi.mock('@/api/care')
vi.mock('@/api/sites', () => ({ listSites: vi.fn(), createSite: vi.fn(), updateSite: vi.fn(), archiveSite: vi.fn(), unarchiveSite: vi.fn() }))

import { getCareToday, markCareTasksDone } from '@/api/care'
import { listSites } from '@/api/sites'
import CareTodayView from '@/views/CareTodayView.vue'
import { mountView } from '../mount'
import { careTask, todayTask } from './fixtures'

const today = '2026-03-03'
// Deliberately not in urgency order, as a list merged from several sites could arrive.
const tasks = [
  todayTask(1, 'Show tank 1', { dueOn: today, status: 'due_today', daysUntilDue: 0, snoozed: false, today }),
  todayTask(2, 'Show tank 2', { dueOn: '2026-03-02', status: 'overdue', daysUntilDue: -1, snoozed: false, today }),
  todayTask(3, 'Breeding rack B', { dueOn: '2026-02-28', status: 'overdue', daysUntilDue: -3, snoozed: false, today }),
]

beforeEach(() => {
  vi.mocked(getCareToday).mockReset()
  vi.mocked(getCareToday).mockResolvedValue({ siteIds: [3], onDuty: true, tasks, watch: [], stock: [] })
  vi.mocked(markCareTasksDone).mockReset()
  vi.mocked(listSites).mockResolvedValue([
    { id: 3, name: 'Front shop', timeZone: 'Europe/Berlin', address: '', notes: '', workdayEnd: null, archivedAt: null, tankCount: 4 },
  ])
})

async function mountToday() {
  const { wrapper } = await mountView(CareTodayView, { role: 'keeper' })
  await flushPromises()
  return wrapper
}

describe('CareTodayView', () => {
  it('lists my tasks overdue first, longest overdue at the top', async () => {
    const wrapper = await mountToday()
    expect(getCareToday).toHaveBeenCalledWith({ mine: true })
    const places = wrapper.findAll('[data-test="care-task-place"]').map((p) => p.text())
    expect(places).toEqual(['Front shop · Breeding rack B', 'Front shop · Show tank 2', 'Front shop · Show tank 1'])
    expect(wrapper.findAll('[data-test="care-status"]').map((c) => c.text())).toEqual(['Overdue', 'Overdue', 'Due today'])
    expect(wrapper.text()).toContain('3 tasks, 2 overdue')
    expect(wrapper.text()).toContain('On duty at Front shop.')
  })

  it('marks a task done with one tap and takes it off the list', async () => {
    vi.mocked(markCareTasksDone).mockResolvedValue([
      { id: 2, outcome: 'done', doneAt: '2026-03-03T09:00:00.000Z', doneBy: { id: 7, name: 'Pat' }, task: careTask(2) },
    ])
    const wrapper = await mountToday()
    await wrapper.find('[data-test="care-task-2"] [data-test="care-task-done"]').trigger('click')
    await flushPromises()
    expect(markCareTasksDone).toHaveBeenCalledWith([{ id: 2, seenLastDoneAt: '2026-03-01T09:00:00.000Z' }], '')
    expect(wrapper.find('[data-test="care-task-2"]').exists()).toBe(false)
    expect(wrapper.findAll('[data-test="care-task-place"]')).toHaveLength(2)
    expect(wrapper.find('[data-test="care-today-notice"]').text()).toBe('Task 2 on Show tank 2: done.')
  })

  it('says who had ticked a task meanwhile instead of logging it twice', async () => {
    // 08:12 UTC is 09:12 in Berlin in March (CET, UTC+1).
    vi.mocked(markCareTasksDone).mockResolvedValue([
      { id: 2, outcome: 'already_done', doneAt: '2026-03-03T08:12:00.000Z', doneBy: { id: 8, name: 'Sam' }, task: careTask(2) },
    ])
    const wrapper = await mountToday()
    await wrapper.find('[data-test="care-task-2"] [data-test="care-task-done"]').trigger('click')
    await flushPromises()
    expect(wrapper.find('[data-test="care-task-2"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="care-today-notice"]').text()).toBe('Task 2 on Show tank 2 was already done by Sam at 3 Mar, 09:12 CET.')
  })

  it('shows one site when that was the last choice, and every site’s tasks when I am on duty nowhere', async () => {
    localStorage.setItem('tw.careTodayScope', '3')
    await mountToday()
    expect(getCareToday).toHaveBeenCalledWith({ siteId: 3 })

    localStorage.clear()
    vi.mocked(getCareToday).mockResolvedValue({ siteIds: [3], onDuty: false, tasks, watch: [], stock: [] })
    const wrapper = await mountToday()
    expect(wrapper.find('[data-test="care-today-off-duty"]').text()).toContain('every site you can see is listed')
    expect(wrapper.find('[data-test="care-today-empty"]').exists()).toBe(false)
    expect(wrapper.findAll('[data-test="care-task-place"]')).toHaveLength(3)
    expect(wrapper.text()).not.toContain('On duty at')
  })

  it('marks several selected tasks done in one request and names one someone else had done', async () => {
    vi.mocked(markCareTasksDone).mockResolvedValue([
      { id: 1, outcome: 'done', doneAt: '2026-03-03T09:00:00.000Z', doneBy: { id: 7, name: 'Pat' }, task: careTask(1) },
      // 08:12 UTC is 09:12 in Berlin in March (CET, UTC+1).
      { id: 3, outcome: 'already_done', doneAt: '2026-03-03T08:12:00.000Z', doneBy: { id: 8, name: 'Sam' }, task: careTask(3) },
    ])
    const wrapper = await mountToday()
    const doneButton = wrapper.find('[data-test="care-today-done-selected"]')
    expect(doneButton.attributes('disabled')).toBeDefined()
    await wrapper.find('[data-test="care-task-1"] [data-test="care-task-select"] input').setValue(true)
    await wrapper.find('[data-test="care-task-3"] [data-test="care-task-select"] input').setValue(true)
    expect(doneButton.text()).toBe('Mark 2 done')
    await doneButton.trigger('click')
    await flushPromises()
    // In list order, each with the "last done" the list showed.
    const seen = '2026-03-01T09:00:00.000Z'
    expect(markCareTasksDone).toHaveBeenCalledWith(
      [
        { id: 3, seenLastDoneAt: seen },
        { id: 1, seenLastDoneAt: seen },
      ],
      '',
    )
    expect(wrapper.findAll('[data-test="care-task-place"]').map((p) => p.text())).toEqual(['Front shop · Show tank 2'])
    expect(wrapper.find('[data-test="care-today-notice"]').text()).toBe('1 task done. Task 3 on Breeding rack B was already done by Sam at 3 Mar, 09:12 CET.')
  })

  it('lists tanks in quarantine and under an arrival watch, with the quarantine day and days remaining', async () => {
    vi.mocked(getCareToday).mockResolvedValue({
      siteIds: [3],
      onDuty: true,
      tasks: [],
      stock: [],
      watch: [
        {
          tank: { id: 21, name: 'Quarantine Q1' },
          site: { id: 3, name: 'Front shop', timeZone: 'Europe/Berlin' },
          watchUntil: null,
          quarantine: { startedAt: '2026-02-24T09:00:00.000Z', endsAt: '2026-03-24T09:00:00.000Z', daysIn: 7, daysRemaining: 21, days: 28 },
        },
        {
          tank: { id: 22, name: 'Show tank 1' },
          site: { id: 3, name: 'Front shop', timeZone: 'Europe/Berlin' },
          quarantine: null,
          watchUntil: '2026-03-05T09:00:00.000Z',
        },
      ],
    })
    const wrapper = await mountToday()
    expect(wrapper.find('[data-test="care-watch-21"]').text()).toContain('Quarantine day 8 of 28: 21 days remaining')
    // 09:00 UTC is 10:00 in Berlin in March.
    expect(wrapper.find('[data-test="care-watch-22"]').text()).toContain('New arrivals: watch closely until 5 Mar, 10:00')
  })

  it('lists supplies running low or past their date', async () => {
    const base = { siteId: 3, site: { id: 3, name: 'Front shop' }, notes: '' }
    vi.mocked(getCareToday).mockResolvedValue({
      siteIds: [3],
      onDuty: true,
      tasks: [],
      watch: [],
      stock: [
        { ...base, id: 5, kind: 'reagent', name: 'Nitrite reagent', unit: 'ml', quantity: 30, lowAt: 5, expiresOn: '2026-02-28', low: false, expired: true },
        { ...base, id: 6, kind: 'salt', name: 'Reef salt', unit: 'kg', quantity: 1.5, lowAt: 2, expiresOn: null, low: true, expired: false },
      ],
    })
    const wrapper = await mountToday()
    expect(wrapper.find('[data-test="stock-alert-5"]').text()).toContain('Test-kit reagent: expired 28 Feb 2026: replace before the next test')
    expect(wrapper.find('[data-test="stock-alert-6"]').text()).toContain('Salt: 1.5 kg left (low at 2)')
  })
})
