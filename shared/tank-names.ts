/**
 * Names for `count` copies of a tank: its name with the next free numbers ("Rack A 3" →
 * "Rack A 4", "Rack A 5"; "Display" → "Display 2", …). A name already taken is skipped.
 */
export function numberedNames(name: string, count: number, taken: Iterable<string>): string[] {
  const match = /^(.*\S)\s+(\d{1,6})$/.exec(name.trim())
  const base = match ? match[1] : name.trim()
  let next = match ? Number(match[2]) + 1 : 2
  const used = new Set([...taken].map((n) => n.trim().toLowerCase()))
  const names: string[] = []
  while (names.length < count) {
    const candidate = `${base} ${next++}`
    if (used.has(candidate.toLowerCase())) continue
    used.add(candidate.toLowerCase())
    names.push(candidate)
  }
  return names
}
