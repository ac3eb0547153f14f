import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { exportName, iconPath, usedIconNames } from '../../tooling/vite-mdi-icons'

const src = resolve(__dirname, '../../src')

// The client ships only the icons its sources name (virtual:mdi-icons). A name Material Design
// Icons does not have would draw as an empty box; this is where it is caught.
describe('the icons the client names', () => {
  it('each has an SVG path in @mdi/js', () => {
    const names = usedIconNames(src)
    expect(names.length).toBeGreaterThan(50)
    expect(names.filter((name) => !iconPath(name))).toEqual([])
  })

  it('include the four tank-state icons of the wall and the tanks list', () => {
    expect(usedIconNames(src)).toEqual(expect.arrayContaining(['mdi-check-circle', 'mdi-eye', 'mdi-alert-octagon', 'mdi-access-point-network-off']))
  })

  it('are found in templates and scripts but not in other words that contain "mdi-"', () => {
    const names = usedIconNames(src)
    expect(names).not.toContain('mdi-icons')
    expect(names.every((name) => /^mdi-[a-z0-9]+(-[a-z0-9]+)*$/.test(name))).toBe(true)
  })

  it('map to the export names of @mdi/js, digits included', () => {
    expect(exportName('mdi-access-point-network-off')).toBe('mdiAccessPointNetworkOff')
    expect(exportName('mdi-numeric-1-circle')).toBe('mdiNumeric1Circle')
    expect(iconPath('mdi-numeric-1-circle')).toMatch(/^M/)
    expect(iconPath('mdi-no-such-icon-here')).toBeUndefined()
  })
})
