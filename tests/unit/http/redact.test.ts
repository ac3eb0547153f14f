import { describe, expect, it } from 'vitest'
import { redactUrl } from '../../../server/platform/http/redact'

describe('redactUrl', () => {
  it.each([
    ['/wall/3?key=tww_3_abcdefghijklmnopqrstuvwxyz', '/wall/3?key=[redacted]'],
    ['/ack?token=abc&note=x', '/ack?token=[redacted]&note=x'],
    ['/api/v1/x?ACCESS_TOKEN=eyJa.b.c', '/api/v1/x?ACCESS_TOKEN=[redacted]'],
    ['/api/v1/x?q=twd_12_abcdefghijklmnopqrstuvwxyz', '/api/v1/x?q=[redacted]'],
    ['/api/v1/ack-links/abcdef0123456789abcdef', '/api/v1/ack-links/[redacted]'],
    ['/api/v1/ack-links/use', '/api/v1/ack-links/use'],
    ['/api/v1/invitations/secret123', '/api/v1/invitations/[redacted]'],
    ['/api/v1/invitations/accept', '/api/v1/invitations/accept'],
    ['/api/v1/tanks/eyJhbGciOiJIUzI1NiJ9.eyJzdWIiOjF9.sig', '/api/v1/tanks/[redacted]'],
    ['/api/v1/tanks/3/series?metric=ph&from=2026-01-01T00:00:00Z', '/api/v1/tanks/3/series?metric=ph&from=2026-01-01T00:00:00Z'],
    ['/x?%6Bey=abc', '/x?%6Bey=[redacted]'],
    ['/x?key', '/x?key'],
    ['/x/%E0%A4%A?bad=%ZZ', '/x/%E0%A4%A?bad=%ZZ'],
  ])('%s', (url, logged) => expect(redactUrl(url)).toBe(logged))
})
