import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { PublicWallCredential } from '@shared/schemas/wall'

vi.mock('@/api/wall', () => ({ getWall: vi.fn(), listWallCredentials: vi.fn(), createWallCredential: vi.fn(), revokeWallCredential: vi.fn() }))

import { createWallCredential, listWallCredentials, revokeWallCredential } from '@/api/wall'
import WallDisplaysPanel from '@/components/sites/WallDisplaysPanel.vue'
import { mountView } from './mount'

const site = { id: 3, name: 'Back fish room', timeZone: 'Europe/Berlin', address: '', notes: '', archivedAt: null, tankCount: 4 }
const tv: PublicWallCredential = { id: 5, name: 'Fish room TV', siteId: 3, createdAt: '2026-03-01T09:00:00.000Z', lastUsedAt: null, revokedAt: null }

beforeEach(() => {
  vi.mocked(listWallCredentials).mockResolvedValue([tv])
  vi.mocked(createWallCredential).mockReset()
})

describe('WallDisplaysPanel', () => {
  it('creates a display link, shows it once as an absolute address, and lists the display', async () => {
    vi.mocked(createWallCredential).mockResolvedValue({
      credential: { ...tv, id: 6, name: 'Tablet by the sink' },
      link: '/wall/3?key=tww_6_secretsecretsecret',
    })
    const { wrapper } = await mountView(WallDisplaysPanel, { props: { sites: [site] } })
    await flushPromises()
    expect(listWallCredentials).toHaveBeenCalledWith(3)
    expect(wrapper.text()).toContain('Fish room TV')

    await wrapper.find('input[name="wallDisplayName"]').setValue('Tablet by the sink')
    await wrapper.find('[data-test="wall-displays"] form').trigger('submit')
    await flushPromises()
    expect(createWallCredential).toHaveBeenCalledWith(3, 'Tablet by the sink')
    const link = wrapper.find('[data-test="wall-link"] input').element as HTMLInputElement
    expect(link.value).toBe(`${window.location.origin}/wall/3?key=tww_6_secretsecretsecret`)
    expect(wrapper.find('[data-test="wall-credentials"]').text()).toContain('Tablet by the sink')
  })

  it('refuses an empty name before asking the server', async () => {
    const { wrapper } = await mountView(WallDisplaysPanel, { props: { sites: [site] } })
    await flushPromises()
    await wrapper.find('[data-test="wall-displays"] form').trigger('submit')
    await flushPromises()
    expect(createWallCredential).not.toHaveBeenCalled()
    expect(wrapper.text()).toContain('required')
  })

  it('revokes a display', async () => {
    vi.mocked(revokeWallCredential).mockResolvedValue({ ...tv, revokedAt: '2026-03-03T12:00:00.000Z' })
    const { wrapper } = await mountView(WallDisplaysPanel, { props: { sites: [site] } })
    await flushPromises()
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Revoke')!
      .trigger('click')
    await flushPromises()
    expect(revokeWallCredential).toHaveBeenCalledWith(5)
    expect(wrapper.find('[data-test="wall-credentials"]').exists()).toBe(false)
    expect(wrapper.text()).toContain('Revoked: Fish room TV')
  })
})
