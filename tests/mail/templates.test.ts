import { describe, expect, it } from 'vitest'
import {
  deviceBack,
  ELECTRICAL_SAFETY_CAUTION,
  escapeHtml,
  incidentEscalated,
  incidentOpened,
  incidentRepeat,
  incidentResolved,
  invitation,
  passwordReset,
  TREND_CID,
  type IncidentMailInput,
} from '../../server/mail/templates'

const HOSTILE = '<script>alert("x")</script> & \'Co\''
const ESCAPED = '&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;Co&#39;'

function input(overrides: Partial<IncidentMailInput> = {}): IncidentMailInput {
  return {
    organizationName: 'Coral & Co',
    siteName: 'Shop floor',
    tankName: 'Reef 2',
    ruleName: 'Temperature too high',
    severity: 'alarm',
    metricLabel: 'Temperature',
    value: 31.456,
    unitLabel: '°C',
    since: '2026-07-15T12:00:00Z',
    siteTimeZone: 'Europe/Berlin',
    whatToCheck: ['Is the heater stuck on?', 'Is the room unusually warm?'],
    incidentUrl: 'https://tw.example/incidents/12',
    acknowledgeUrl: 'https://tw.example/incidents/12/acknowledge?token=a&b=1',
    ...overrides,
  }
}

const ALL = { incidentOpened, incidentEscalated, incidentRepeat, incidentResolved, deviceBack }

describe('HTML escaping', () => {
  it('escapes the five HTML-significant characters', () => {
    expect(escapeHtml(HOSTILE)).toBe(ESCAPED)
  })

  for (const [name, template] of Object.entries(ALL)) {
    it(`${name}: names with markup appear escaped, never as markup`, () => {
      const mail = template(
        input({
          organizationName: HOSTILE,
          siteName: HOSTILE,
          tankName: HOSTILE,
          ruleName: HOSTILE,
          metricLabel: HOSTILE,
          whatToCheck: [HOSTILE],
          safetyCaution: HOSTILE,
        }),
      )
      expect(mail.html).not.toContain('<script>')
      expect(mail.html).toContain(ESCAPED)
      // The plain text part is not HTML: it keeps the names as they are.
      expect(mail.text).toContain(HOSTILE)
      expect(mail.subject).toContain('<script>alert("x")</script>')
    })
  }

  it('escapes the links it puts in href attributes and refuses non-http links', () => {
    const mail = incidentOpened(input())
    expect(mail.html).toContain('href="https://tw.example/incidents/12/acknowledge?token=a&amp;b=1"')
    expect(mail.text).toContain('Acknowledge: https://tw.example/incidents/12/acknowledge?token=a&b=1')
    expect(() => incidentOpened(input({ incidentUrl: 'javascript:alert(1)' }))).toThrow(TypeError)
    expect(() => invitation({ organizationName: 'A', inviterName: 'B', link: 'data:text/html,hi' })).toThrow(TypeError)
  })

  it('invitation and password reset escape names and carry their link', () => {
    const invite = invitation({ organizationName: HOSTILE, inviterName: 'Ana <ana@x>', link: 'https://tw.example/invitations/abc?x=1&y=2', validHours: 72 })
    expect(invite.html).toContain(ESCAPED)
    expect(invite.html).toContain('Ana &lt;ana@x&gt;')
    expect(invite.html).toContain('href="https://tw.example/invitations/abc?x=1&amp;y=2"')
    expect(invite.text).toContain('Accept the invitation: https://tw.example/invitations/abc?x=1&y=2')
    expect(invite.text).toContain('72 hours')
    const reset = passwordReset({ link: 'https://tw.example/reset/t0k3n', validMinutes: 30 })
    expect(reset.subject).toBe('Reset your Tankwarden password')
    expect(reset.html).toContain('href="https://tw.example/reset/t0k3n"')
    expect(reset.text).toContain('https://tw.example/reset/t0k3n')
    expect(reset.text).toContain('30 minutes')
  })
})

describe('incident mail content', () => {
  it('the standard electrical caution is the agreed text', () => {
    expect(ELECTRICAL_SAFETY_CAUTION).toBe(
      'Unplug heaters, pumps and lights before hands go in the water. A heater that was out of water must be switched off and left to cool before it is put back. Follow your local electrical codes; call a licensed electrician for wiring faults.',
    )
  })

  it('an opened heater alarm carries the caution, what to check, both links and the reading', () => {
    const mail = incidentOpened(input({ safetyCaution: ELECTRICAL_SAFETY_CAUTION }))
    expect(mail.subject).toBe('Alarm: Temperature 31.46 °C on Reef 2 · Shop floor')
    expect(mail.text).toContain(`SAFETY: ${ELECTRICAL_SAFETY_CAUTION}`)
    expect(mail.html).toContain(escapeHtml(ELECTRICAL_SAFETY_CAUTION))
    expect(mail.text).toContain('- Is the heater stuck on?')
    expect(mail.html).toContain('<li>Is the room unusually warm?</li>')
    expect(mail.html).toContain('href="https://tw.example/incidents/12"')
    expect(mail.text).toContain('Open the incident: https://tw.example/incidents/12')
    expect(mail.attachments).toBeUndefined()
  })

  it('no caution when none is passed (e.g. a pH warning)', () => {
    const mail = incidentOpened(input({ severity: 'warning', metricLabel: 'pH', value: '6.1', unitLabel: '' }))
    expect(mail.subject).toBe('Warning: pH 6.1 on Reef 2 · Shop floor')
    expect(mail.text).not.toContain('SAFETY:')
    expect(mail.html).not.toContain('Safety:')
  })

  it('a resolved or device-back mail has nothing to acknowledge and no checklist', () => {
    for (const template of [incidentResolved, deviceBack]) {
      const mail = template(input({ safetyCaution: ELECTRICAL_SAFETY_CAUTION, at: '2026-07-15T14:05:00Z' }))
      expect(mail.text).not.toContain('Acknowledge')
      expect(mail.text).not.toContain('What to check')
      expect(mail.text).toContain('Open the incident: https://tw.example/incidents/12')
      expect(mail.text).toContain('2 h 05 min')
    }
    expect(incidentResolved(input()).subject).toBe('Resolved: Temperature on Reef 2 · Shop floor is back in range')
    expect(deviceBack(input()).subject).toBe('Reporting again: Reef 2 · Shop floor')
  })

  it('escalation and repeat say how long nobody has acted', () => {
    const at = '2026-07-15T12:20:00Z'
    expect(incidentEscalated(input({ at })).text).toContain('Nobody has acknowledged this incident yet (20 min)')
    expect(incidentRepeat(input({ at })).subject).toBe('Still open — alarm: Temperature 31.46 °C on Reef 2 · Shop floor')
  })

  it('embeds the trend chart inline by content id', () => {
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])
    const mail = incidentOpened(input({ trendPng: png }))
    expect(mail.attachments).toEqual([{ filename: 'trend.png', cid: TREND_CID, contentType: 'image/png', base64: png.toString('base64') }])
    expect(mail.html).toContain(`src="cid:${TREND_CID}"`)
  })

  it('a subject stays one line even when a name contains line breaks', () => {
    expect(incidentOpened(input({ tankName: 'Reef\r\n2' })).subject).toBe('Alarm: Temperature 31.46 °C on Reef 2 · Shop floor')
  })
})

describe('times in the site’s zone', () => {
  it('an incident mail shows "since" in the site zone, not the server zone', () => {
    const mail = incidentOpened(input({ since: '2026-07-15T12:00:00Z', siteTimeZone: 'America/New_York' }))
    expect(mail.text).toContain('Opened: Wed, 15 Jul 2026, 08:00 GMT-4')
  })
})
