import { describe, expect, it } from 'vitest'
import { isDatabaseUnavailable } from '../../../server/platform/http/errors'

describe('an outage of the database is a 503, not a 500', () => {
  it.each([
    ['a refused connection', { name: 'SequelizeConnectionRefusedError' }],
    ['an unreachable host', { name: 'SequelizeHostNotReachableError' }],
    ['a server shutting down (SQLSTATE 57P01)', { name: 'SequelizeDatabaseError', original: { code: '57P01' } }],
    ['a connection dropped mid-query, with no SQLSTATE', { name: 'SequelizeDatabaseError', original: { message: 'Connection terminated unexpectedly' } }],
    ['a socket reset', { code: 'ECONNRESET' }],
  ])('%s', (_label, error) => {
    expect(isDatabaseUnavailable(error)).toBe(true)
  })
  it.each([
    ['a unique violation', { name: 'SequelizeUniqueConstraintError', original: { code: '23505' } }],
    ['a programming error', new TypeError('x is undefined')],
    ['nothing', null],
  ])('but %s is not', (_label, error) => {
    expect(isDatabaseUnavailable(error)).toBe(false)
  })
})
