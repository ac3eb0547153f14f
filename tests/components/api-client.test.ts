import { AxiosError, type AxiosAdapter, type AxiosResponse, type InternalAxiosRequestConfig } from 'axios'
import { afterEach, describe, expect, it, vi } from 'vitest'
import { http } from '@/api/client'
import { ApiError } from '@/api/errors'
import { onUnauthorized, provideToken } from '@/api/session'

const originalAdapter = http.defaults.adapter

function answer(status: number, data: unknown, headers: Record<string, string> = {}): AxiosAdapter {
  return async (config: InternalAxiosRequestConfig) => {
    const response = { data, status, statusText: '', headers, config, request: {} } as AxiosResponse
    if (status < 400) return response
    throw new AxiosError('failed', 'ERR_BAD_RESPONSE', config, {}, response)
  }
}

afterEach(() => {
  http.defaults.adapter = originalAdapter
  onUnauthorized(() => undefined)
  provideToken(() => localStorage.getItem('tw.token'))
})

describe('api client', () => {
  it('sends the token as a bearer header', async () => {
    provideToken(() => 'abc.def.ghi')
    let seen: unknown
    http.defaults.adapter = async (config) => {
      seen = config.headers.Authorization
      return { data: {}, status: 200, statusText: 'OK', headers: {}, config, request: {} }
    }
    await http.get('/health')
    expect(seen).toBe('Bearer abc.def.ghi')
  })

  it('maps the server error shape to an ApiError', async () => {
    http.defaults.adapter = answer(400, {
      error: { code: 'invalid_input', message: 'Check the fields', fields: { name: 'required' } },
    })
    const error = await http.post('/tanks', {}).catch((e: unknown) => e)
    expect(error).toBeInstanceOf(ApiError)
    expect(error).toMatchObject({ status: 400, code: 'invalid_input', message: 'Check the fields', fields: { name: 'required' } })
  })

  it('takes the wait from the Retry-After header when the body has none', async () => {
    http.defaults.adapter = answer(429, { error: { code: 'rate_limited', message: 'Slow down' } }, { 'retry-after': '120' })
    const error = (await http.post('/auth/sign-in', {}).catch((e: unknown) => e)) as ApiError
    expect(error.retryAfterSeconds).toBe(120)
  })

  it('ends the session on a 401 from an ordinary request, but not from sign-in', async () => {
    const ended = vi.fn()
    onUnauthorized(ended)
    http.defaults.adapter = answer(401, { error: { code: 'unauthenticated', message: 'Sign in again' } })

    await http.post('/auth/sign-in', {}).catch(() => undefined)
    expect(ended).not.toHaveBeenCalled()

    await http.get('/tanks').catch(() => undefined)
    expect(ended).toHaveBeenCalledTimes(1)
  })
})
