import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { Role } from '@shared/schemas/auth'
import type { IncidentDetail } from '@shared/schemas/incidents'

vi.mock('@/api/incidents', () => ({ getIncident: vi.fn(), acknowledgeIncident: vi.fn(), resolveIncident: vi.fn() }))
vi.mock('@/api/roster', () => ({
  listShifts: vi.fn(async () => [{ id: 1, siteId: 3, userId: 21, userName: 'Sam Keeper', weekday: 0, start: '22:00', end: '06:00' }]),
}))
vi.mock('@/api/users', () => ({ listUsers: vi.fn(async () => []), listInvitations: vi.fn(async () => []) }))
vi.mock('@/api/sites', () => ({
  listSites: vi.fn(async () => [{ id: 3, name: 'Back fish room', timeZone: 'Europe/Berlin', address: '', notes: '', archivedAt: null, tankCount: 1 }]),
}))
vi.mock('@/composables/useIncidentRefresh', () => ({ useIncidentRefresh: vi.fn() }))

import { acknowledgeIncident, getIncident, resolveIncident } from '@/api/incidents'
import IncidentView from '@/views/IncidentView.vue'
import { mountView } from './mount'

// Berlin is UTC+1 in early March (before the last Sunday of March, Directive 2000/84/EC), so 02:10 UTC reads 03:10.
const incident: IncidentDetail = {
  id: 55,
  siteId: 3,
  tankId: 12,
  tankName: 'Reef display',
  siteName: 'Back fish room',
  ruleId: 9,
  ruleKind: 'above',
  metric: 'temperature',
  severity: 'alarm',
  title: 'Temperature above 28 °C for 10 min',
  state: 'open',
  conditionSince: '2026-03-03T02:00:00.000Z',
  openedAt: '2026-03-03T02:10:00.000Z',
  firstValue: 28.3,
  peakValue: 29.1,
  latestValue: 28.8,
  latestAt: '2026-03-03T02:40:00.000Z',
  snoozed: false,
  acknowledgedAt: null,
  acknowledgedBy: null,
  acknowledgeNote: null,
  resolvedAt: null,
  resolvedBy: null,
  resolveNote: null,
  escalationLevel: 1,
  nextEscalationAt: null,
  nextRepeatAt: '2026-03-03T03:10:00.000Z',
  topSeverity: 'alarm',
  flapCount: 0,
  lastFlapAt: null,
  settleUntil: null,
  maintenance: false,
  siteIncidentId: null,
  conditionHolds: true,
  heater: { name: 'Display heater', installedOn: '2024-09-01', text: 'Heater installed 2 years 3 months ago' },
  timeline: [
    { at: '2026-03-03T02:10:00.000Z', kind: 'opened', userId: null, detail: { value: 28.3, since: '2026-03-03T02:00:00.000Z', snoozed: false } },
    { at: '2026-03-03T02:10:00.000Z', kind: 'mail_queued', userId: null, detail: { kind: 'opened', recipients: ['sam@example.test'] } },
    { at: '2026-03-03T02:40:00.000Z', kind: 'escalated', userId: null, detail: { level: 1 } },
    {
      at: '2026-03-03T02:40:00.000Z',
      kind: 'mail_queued',
      userId: null,
      detail: { kind: 'escalated', recipients: ['sam@example.test', 'owner@example.test'] },
    },
    { at: '2026-03-03T03:10:00.000Z', kind: 'repeated', userId: null, detail: {} },
    { at: '2026-03-03T03:12:00.000Z', kind: 'acknowledged', userId: 21, detail: { note: 'Heater unplugged, fan on', via: 'link' } },
    { at: '2026-03-03T04:30:00.000Z', kind: 'resolved', userId: null, detail: { automatic: true, reason: 'The rule cleared', value: 26.9 } },
  ],
}

beforeEach(() => {
  vi.mocked(getIncident).mockResolvedValue(incident)
  vi.mocked(acknowledgeIncident).mockReset()
  vi.mocked(resolveIncident).mockReset()
})

async function pageAs(role: Role) {
  const { wrapper } = await mountView(IncidentView, { role, props: { id: 55 } })
  await flushPromises()
  return wrapper
}

describe('incident detail', () => {
  it('shows the facts in the site’s zone', async () => {
    const wrapper = await pageAs('viewer')
    const facts = wrapper.find('[data-test="incident-facts"]').text()
    expect(facts).toContain('Reef display')
    expect(facts).toContain('Back fish room')
    expect(facts).toContain('3 Mar, 03:10')
    expect(facts).toContain('28.3 °C')
    expect(facts).toContain('29.1 °C')
    expect(facts).toContain('28.8 °C at 3 Mar, 03:40')
    expect(facts).toContain('1 (owners told)')
    expect(wrapper.find('[data-test="next-escalation"]').text()).toContain('none planned')
    expect(wrapper.find('[data-test="incident-severity"]').text()).toBe('Alarm')
    expect(wrapper.find('[data-test="incident-state"]').text()).toBe('Open')
  })

  it("shows the heater's age for a temperature incident", async () => {
    expect((await pageAs('viewer')).find('[data-test="incident-heater"]').text()).toBe('Heater installed 2 years 3 months ago (Display heater)')
  })

  it('lists every timeline entry in order, with who and the note', async () => {
    const entries = (await pageAs('viewer')).findAll('[data-test="timeline-entry"]').map((e) => e.text())
    expect(entries).toHaveLength(7)
    expect(entries[0]).toContain('3 Mar, 03:10')
    expect(entries[0]).toContain('Opened')
    expect(entries[0]).toContain('28.3 °C; the condition held from 3 Mar, 03:00.')
    expect(entries[1]).toContain('E-mail queued: alert')
    expect(entries[1]).toContain('To sam@example.test')
    expect(entries[2]).toContain('Escalated (level 1)')
    expect(entries[3]).toContain('To sam@example.test, owner@example.test')
    expect(entries[4]).toContain('Reminder')
    expect(entries[5]).toContain("Acknowledged by Sam Keeper from an alert's link")
    expect(entries[5]).toContain('Heater unplugged, fan on')
    expect(entries[6]).toContain('Resolved automatically')
    expect(entries[6]).toContain('The rule cleared at 26.9 °C.')
  })

  it('gives a viewer no acknowledge or resolve', async () => {
    const wrapper = await pageAs('viewer')
    expect(wrapper.find('[data-test="acknowledge"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="resolve"]').exists()).toBe(false)
  })

  it.each(['owner', 'keeper'] as const)('lets a %s acknowledge with a note and resolve', async (role) => {
    const wrapper = await pageAs(role)
    expect(wrapper.find('[data-test="acknowledge"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="resolve"]').exists()).toBe(true)

    vi.mocked(acknowledgeIncident).mockResolvedValue({ ...incident, state: 'acknowledged' })
    await wrapper.find('[data-test="acknowledge"]').trigger('click')
    await flushPromises()
    await new DOMWrapper(document.querySelector('textarea[name="incidentNote"]')!).setValue('On my way')
    await new DOMWrapper(document.querySelector('.v-dialog form')!).trigger('submit')
    await flushPromises()
    expect(acknowledgeIncident).toHaveBeenCalledWith(55, 'On my way')
  })

  it('will not resolve without saying what was done', async () => {
    const wrapper = await pageAs('keeper')
    await wrapper.find('[data-test="resolve"]').trigger('click')
    await flushPromises()
    await new DOMWrapper(document.querySelector('.v-dialog form')!).trigger('submit')
    await flushPromises()
    expect(document.querySelector('.v-dialog')!.textContent).toContain('say what was done')
    expect(resolveIncident).not.toHaveBeenCalled()
  })

  it('warns in the resolve dialog while the condition still holds', async () => {
    const wrapper = await pageAs('keeper')
    await wrapper.find('[data-test="resolve"]').trigger('click')
    await flushPromises()
    const warning = document.querySelector('[data-test="still-holds"]')!
    expect(warning.textContent).toContain('The condition still holds (latest 28.8 °C)')
    expect(warning.textContent).toContain('the incident reopens with a note and you are told by e-mail')
  })

  it('words flaps, a rise in severity and a reopening on the timeline', async () => {
    vi.mocked(getIncident).mockResolvedValue({
      ...incident,
      timeline: [
        {
          at: '2026-03-03T02:20:00.000Z',
          kind: 'severity_raised',
          userId: null,
          detail: { from: 'warning', to: 'alarm', value: 29.4, rule: 'Temperature above 29 °C' },
        },
        { at: '2026-03-03T02:30:00.000Z', kind: 'flapped', userId: null, detail: { value: 28.6, count: 2 } },
        {
          at: '2026-03-03T02:31:00.000Z',
          kind: 'reopened',
          userId: null,
          detail: { reason: 'still_holding', note: 'Reopened: the condition still held after it was resolved', resolvedBy: 21 },
        },
      ],
    })
    const entries = (await pageAs('viewer')).findAll('[data-test="timeline-entry"]').map((e) => e.text())
    expect(entries[0]).toContain('Rose to alarm')
    expect(entries[0]).toContain('Temperature above 29 °C: 29.4 °C.')
    expect(entries[1]).toContain('Flap 3: came back within the settle window')
    expect(entries[2]).toContain('Reopened: the condition still held after it was resolved (resolved by Sam Keeper, who was told).')
  })

  it('offers only resolve once acknowledged, and nothing once resolved', async () => {
    vi.mocked(getIncident).mockResolvedValue({ ...incident, state: 'acknowledged' })
    let wrapper = await pageAs('keeper')
    expect(wrapper.find('[data-test="acknowledge"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="resolve"]').exists()).toBe(true)
    wrapper.unmount()
    vi.mocked(getIncident).mockResolvedValue({ ...incident, state: 'resolved' })
    wrapper = await pageAs('owner')
    expect(wrapper.find('[data-test="acknowledge"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="resolve"]').exists()).toBe(false)
  })
})
