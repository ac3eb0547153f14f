/** Only same-app paths: an open redirect to another origin would help phishing. */
export function safeRedirect(value: unknown): string | null {
  const path = Array.isArray(value) ? value[0] : value
  if (typeof path !== 'string' || !path.startsWith('/') || path.startsWith('//')) return null
  return path
}
