import axios, { AxiosError, AxiosHeaders, type AxiosResponse } from 'axios'
import { ApiError, isApiErrorBody } from './errors'
import { installSavedReads } from '@/offline/saved-reads'
import { currentToken, notifyUnauthorized } from './session'

export { ApiError } from './errors'

export const http = axios.create({ baseURL: '/api/v1', timeout: 30_000 })

http.interceptors.request.use((config) => {
  const token = currentToken()
  if (token) {
    config.headers = AxiosHeaders.from(config.headers)
    config.headers.set('Authorization', `Bearer ${token}`)
  }
  return config
})

// A wrong password answers 401 too; that must not throw the user out of a sign-in form.
const CREDENTIAL_ENDPOINTS = ['/auth/sign-in', '/invitations/accept']

function retryAfterHeader(response: AxiosResponse | undefined): number | undefined {
  const raw = response?.headers?.['retry-after']
  const seconds = Number(raw)
  return raw != null && Number.isFinite(seconds) ? seconds : undefined
}

export function toApiError(error: unknown): ApiError {
  if (error instanceof ApiError) return error
  if (!(error instanceof AxiosError)) {
    return new ApiError({ status: 0, code: 'client', message: error instanceof Error ? error.message : String(error) })
  }
  const response = error.response
  if (!response) {
    return new ApiError({ status: 0, code: 'network', message: 'The server could not be reached. Check the connection and try again.' })
  }
  if (isApiErrorBody(response.data)) {
    const body = response.data.error
    return new ApiError({
      status: response.status,
      code: body.code,
      message: body.message,
      fields: body.fields,
      retryAfterSeconds: body.retryAfterSeconds ?? retryAfterHeader(response),
      details: body.details,
    })
  }
  return new ApiError({
    status: response.status,
    code: 'http_' + response.status,
    message: `The server answered ${response.status} ${response.statusText}`.trim(),
    retryAfterSeconds: retryAfterHeader(response),
  })
}

// Before the error mapping below: a read the server could not be asked is answered from this device's storage.
installSavedReads(http)

http.interceptors.response.use(
  (response) => response,
  (error: unknown) => {
    const apiError = toApiError(error)
    const url = error instanceof AxiosError ? (error.config?.url ?? '') : ''
    if (apiError.status === 401 && !CREDENTIAL_ENDPOINTS.some((path) => url.startsWith(path))) {
      notifyUnauthorized()
    }
    return Promise.reject(apiError)
  },
)
