const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' }

/** Everything a user or a device can name goes through here before it reaches HTML. */
export function escapeHtml(value: unknown): string {
  return String(value).replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]!)
}

/** Links in mail are the product's own pages: only http(s), anything else is a programming error. */
export function safeUrl(url: string): string {
  const parsed = new URL(url)
  if (parsed.protocol !== 'https:' && parsed.protocol !== 'http:') throw new TypeError(`Mail links must be http(s): ${url}`)
  return parsed.toString()
}

/** One line for a subject header: names with line breaks or runs of spaces are flattened. */
export const oneLine = (text: string) => text.replace(/\s+/g, ' ').trim()

export function button(label: string, url: string, color = '#0b6e99'): string {
  return (
    `<a href="${escapeHtml(safeUrl(url))}" style="display:inline-block;padding:10px 18px;margin:4px 8px 4px 0;` +
    `background:${color};color:#ffffff;text-decoration:none;border-radius:4px;font-weight:bold">${escapeHtml(label)}</a>`
  )
}

/** A caution box; the text is escaped. */
export function cautionBox(text: string): string {
  return (
    `<div style="margin:16px 0;padding:12px 14px;border-left:4px solid #b7791f;background:#fffaf0;color:#5f370e">` +
    `<strong>Safety:</strong> ${escapeHtml(text)}</div>`
  )
}

/** Rows of label → value, both escaped. */
export function factsTable(rows: Array<[string, string]>): string {
  const cells = rows
    .map(
      ([label, value]) =>
        `<tr><td style="padding:4px 12px 4px 0;color:#52606d;vertical-align:top">${escapeHtml(label)}</td>` +
        `<td style="padding:4px 0;color:#1f2933">${escapeHtml(value)}</td></tr>`,
    )
    .join('')
  return `<table role="presentation" style="border-collapse:collapse;margin:12px 0">${cells}</table>`
}

/** The frame every mail shares: a coloured heading, the body (already HTML), a footer line. */
export function layout(options: { heading: string; accent: string; body: string; footer: string }): string {
  return [
    '<!doctype html><html><head><meta charset="utf-8"><meta name="viewport" content="width=device-width">',
    `<title>${escapeHtml(options.heading)}</title></head>`,
    '<body style="margin:0;padding:0;background:#f5f7fa;font-family:Arial,Helvetica,sans-serif;font-size:14px;line-height:1.45">',
    '<div style="max-width:640px;margin:0 auto;padding:16px">',
    `<div style="background:${options.accent};color:#ffffff;padding:12px 16px;border-radius:4px 4px 0 0;font-size:18px;font-weight:bold">${escapeHtml(options.heading)}</div>`,
    `<div style="background:#ffffff;padding:16px;border-radius:0 0 4px 4px">${options.body}</div>`,
    `<p style="color:#7b8794;font-size:12px;margin:12px 4px">${escapeHtml(options.footer)}</p>`,
    '</div></body></html>',
  ].join('')
}
