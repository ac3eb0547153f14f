/** The file name a `Content-Disposition` header gives, or the fallback. */
export function fileNameOf(disposition: unknown, fallback: string): string {
  return /filename="([^"]+)"/.exec(String(disposition ?? ''))?.[1] ?? fallback
}

/** Hands a downloaded file to the browser as a save. */
export function saveFile(blob: Blob, fileName: string) {
  const url = URL.createObjectURL(blob)
  const link = document.createElement('a')
  link.href = url
  link.download = fileName
  document.body.append(link)
  link.click()
  link.remove()
  // Revoked later, not at once: some browsers start reading the blob after click() returns.
  setTimeout(() => URL.revokeObjectURL(url), 10_000)
}
