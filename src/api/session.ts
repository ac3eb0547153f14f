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

/**
 * A wall display signs in once with a display credential from its link and keeps it for weeks.
 * The site is remembered beside the key so the router can send the display back to its wall.
 */
export const WALL_KEY = 'tw.wallKey'
export const WALL_SITE_KEY = 'tw.wallSiteId'

export interface WallSession {
  key: string
  siteId: number
}

export function storedWallSession(): WallSession | null {
  try {
    const key = localStorage.getItem(WALL_KEY)
    const siteId = Number(localStorage.getItem(WALL_SITE_KEY))
    return key && Number.isInteger(siteId) && siteId > 0 ? { key, siteId } : null
  } catch {
    return null
  }
}

export function storeWallSession(session: WallSession | null) {
  try {
    if (session) {
      localStorage.setItem(WALL_KEY, session.key)
      localStorage.setItem(WALL_SITE_KEY, String(session.siteId))
    } else {
      localStorage.removeItem(WALL_KEY)
      localStorage.removeItem(WALL_SITE_KEY)
    }
  } catch {
    // Without storage the display stays signed in until the tab closes.
  }
}

/** A person's token wins; a display without one uses its wall key. */
export function liveCredential(): string | null {
  return currentToken() ?? storedWallSession()?.key ?? null
}
