import { describe, expect, it } from 'vitest'
import { labelTarget } from '@/components/labels/scan-target'

describe('a scanned label', () => {
  const origin = 'https://care.example.org'
  it("opens the tank's test-kit entry on this installation", () => {
    expect(labelTarget('https://care.example.org/tanks/42/test-kit', origin)).toBe('/tanks/42/test-kit')
    expect(labelTarget('  https://care.example.org/tanks/7/test-kit\n', origin)).toBe('/tanks/7/test-kit')
  })
  it('ignores other codes: another site, another page, plain text', () => {
    expect(labelTarget('https://elsewhere.example.org/tanks/42/test-kit', origin)).toBeNull()
    expect(labelTarget('https://care.example.org/users', origin)).toBeNull()
    expect(labelTarget('https://care.example.org/tanks/42/test-kit/../../users', origin)).toBeNull()
    expect(labelTarget('hello', origin)).toBeNull()
  })
})
