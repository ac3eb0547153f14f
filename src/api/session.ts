/**
 * The seam between the HTTP client and the auth store. The client must not import the store
 * (the store imports the API modules), so the store registers itself here.
 */
export const TOKEN_KEY = 'tw.token'

let tokenSource: (() => string | null) | null = null
let unauthorizedHandler: (() => void) | null = null

export function storedToken(): string | null {
  try {
    return localStorage.getItem(TOKEN_KEY)
  } catch {
    return null
  }
}

export function storeToken(token: string | null) {
  try {
    if (token) localStorage.setItem(TOKEN_KEY, token)
    else localStorage.removeItem(TOKEN_KEY)
  } catch {
    // Storage may be unavailable (private mode); the session then lasts for this tab only.
  }
}

export function provideToken(source: () => string | null) {
  tokenSource = source
}

export function currentToken(): string | null {
  return tokenSource ? tokenSource() : storedToken()
}

export function onUnauthorized(handler: () => void) {
  unauthorizedHandler = handler
}

export function notifyUnauthorized() {
  unauthorizedHandler?.()
}
