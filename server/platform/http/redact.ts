/**
 * URLs carry secrets: wall display keys (`/wall/1?key=…`), acknowledge, invitation and reset
 * tokens, and whatever token a client puts in a query. Every URL is passed through here before it
 * reaches a log line.
 */
export const REDACTED = '[redacted]'

/** Query parameters whose value is a credential, whatever the path. */
const SECRET_PARAMS = new Set([
  'key',
  'token',
  'access_token',
  'accesstoken',
  'refresh_token',
  'code',
  'secret',
  'password',
  'signature',
  'sig',
  'auth',
  'authorization',
  'api_key',
  'apikey',
])

/** API paths whose last segment is a secret, with the few literal segments that are not. */
const SECRET_SEGMENT_AFTER: Record<string, Set<string>> = {
  'ack-links': new Set(['use']),
  invitations: new Set(['accept']),
  'password-reset': new Set(['confirm']),
}

/** Our own token shapes (wall `tww_`, device `twd_`) and JWTs, wherever they appear in a path. */
const TOKEN_SHAPE = /^(tw[a-z]_\d+_[A-Za-z0-9_-]+|eyJ[A-Za-z0-9_-]*\.[A-Za-z0-9_-]*\.[A-Za-z0-9_-]*)$/

function redactSegments(path: string): string {
  const segments = path.split('/')
  return segments
    .map((segment, i) => {
      if (!segment) return segment
      let decoded = segment
      try {
        decoded = decodeURIComponent(segment)
      } catch {
        // A malformed escape is logged as sent; it cannot be a token of ours either.
      }
      if (TOKEN_SHAPE.test(decoded)) return REDACTED
      const keep = SECRET_SEGMENT_AFTER[segments[i - 1] ?? '']
      return keep && !keep.has(decoded) ? REDACTED : segment
    })
    .join('/')
}

function redactQuery(query: string): string {
  return query
    .split('&')
    .map((pair) => {
      const eq = pair.indexOf('=')
      const rawName = eq < 0 ? pair : pair.slice(0, eq)
      let name = rawName
      try {
        name = decodeURIComponent(rawName.replace(/\+/g, ' '))
      } catch {
        // Keep the name as sent.
      }
      if (eq < 0) return pair
      const value = pair.slice(eq + 1)
      let decodedValue = value
      try {
        decodedValue = decodeURIComponent(value.replace(/\+/g, ' '))
      } catch {
        // Keep the value as sent.
      }
      return SECRET_PARAMS.has(name.trim().toLowerCase()) || TOKEN_SHAPE.test(decodedValue) ? `${rawName}=${REDACTED}` : pair
    })
    .join('&')
}

/** The URL (path and query, as Express sees it) with every secret replaced by `[redacted]`. */
export function redactUrl(url: string): string {
  const hash = url.indexOf('#')
  const withoutHash = hash < 0 ? url : url.slice(0, hash)
  const q = withoutHash.indexOf('?')
  if (q < 0) return redactSegments(withoutHash)
  return `${redactSegments(withoutHash.slice(0, q))}?${redactQuery(withoutHash.slice(q + 1))}`
}
