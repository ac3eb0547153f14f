import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeContext, createContext } from '../../server/bootstrap'
import { testConfig } from '../../server/config'
import type { AppContext } from '../../server/context'
import { createTestDatabase } from '../helpers/db'
import { createOrgIn, createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { appProcess } from './helpers/faults-app-process'
import { mqttPublisher, storedTimes } from './helpers/faults-load'
import { sleep } from '../helpers/wait'
import { deafLiveClient, hugePacketBeforeConnect, oversizeMessage, percentile, prober, repeat, rssMb } from './helpers/hostile-clients'

// Hostile load: for a minute, outsiders pin memory every way the broker, the live socket and the
// photo decoder allow (oversize MQTT packets before and after sign-in, live clients that never read
// and ask for huge catch-ups, decompression-bomb photos and large real ones), while one honest
// device keeps publishing. Each attack alone, with exact limits, is in tests/mqtt/hostile-packets,
// tests/api/live-hostile and tests/api/photos-decode-limits.

const ATTACK_MS = 60_000
const RSS_LIMIT_MB = 400
const P99_LIMIT_MS = 500
// What the app may still hold a minute after the attack, above its working baseline: the allocator
// keeps freed arenas for reuse (about 90 MB measured on this machine's kind, from a baseline of
// 130 MB); a leak grows past it, and RSS_LIMIT_MB caps the peak.
const SETTLED_ABOVE_BASELINE_MB = 110

describe('hostile load against the compiled app', () => {
  let db: Awaited<ReturnType<typeof createTestDatabase>>
  let ctx: AppContext
  let app: Awaited<ReturnType<typeof appProcess>>
  let org: TestOrg
  beforeAll(async () => {
    db = await createTestDatabase()
    ctx = createContext(testConfig({ databaseUrl: db.url }))
    org = await createOrgIn(ctx, 'Marrowfen Aquatics under siege')
    app = await appProcess(db.url, { JWT_SECRET: ctx.config.jwtSecret, PHOTO_MAX_MB: '20' })
    await app.start()
  }, 180_000)
  afterAll(async () => {
    await app?.stop()
    app?.cleanup()
    if (ctx) await closeContext(ctx)
    await db?.drop()
  })

  it('stays responsive and within its memory, and stores every reading of the honest device', { timeout: 300_000 }, async () => {
    const honest = await createTankWithDevice(ctx, org, 'Honest tank')
    const intruder = await createTankWithDevice(ctx, org, 'Intruder tank')
    // A day of readings on the honest tank's site, so every catch-up asked for is as big as allowed.
    await ctx.sequelize.query(
      `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
       SELECT 'd:' || $2::text, 'ph', now() - make_interval(secs => i * 4), $1::int, 7, 'device' FROM generate_series(1, 20000) i`,
      { bind: [honest.tankId, honest.deviceId] },
    )
    const bomb = await sharp({ create: { width: 8900, height: 8900, channels: 3, background: '#2a6f5b' } })
      .png({ compressionLevel: 9 })
      .toBuffer()
    const bigPhoto = await sharp({ create: { width: 6000, height: 4000, channels: 3, background: '#000', noise: { type: 'gaussian', mean: 128, sigma: 30 } } })
      .jpeg()
      .toBuffer()
    const uploadUrl = `${app.baseUrl}/api/v1/tanks/${honest.tankId}/photos`
    const upload = async (bytes: Buffer) => {
      const form = new FormData()
      form.append('photo', new Blob([bytes], { type: 'image/jpeg' }), 'tank.jpg')
      const res = await fetch(uploadUrl, { method: 'POST', headers: { authorization: `Bearer ${org.users.keeper.token}` }, body: form })
      await res.arrayBuffer()
      return res.status
    }
    const pid = app.pid!
    const device = mqttPublisher(app.mqttUrl, honest, { metric: 'temperature', firstAt: Date.now() - 2 * 3600_000, everyMs: 100 })
    const probe = prober(`${app.baseUrl}/api/v1/tanks`, org.users.viewer.token, 200)
    // The baseline is the app at work before the attack: the device and a reader busy, the photo library loaded.
    expect([await upload(bigPhoto), await upload(bomb)]).toEqual([201, 413])
    await sleep(10_000)
    const baseline = rssMb(pid)
    const photoStatuses = new Map<number, number>()
    const count = (status: number) => photoStatuses.set(status, (photoStatuses.get(status) ?? 0) + 1)
    const attacks = {
      'MQTT 80 MiB before CONNECT': repeat(3, () => hugePacketBeforeConnect(app.mqttPort)),
      'MQTT 20 MB message': repeat(2, () => oversizeMessage(app.mqttPort, intruder, `intruder-${Math.random()}`)),
      'live client never reading': repeat(3, () => deafLiveClient(app.baseUrl, org.users.viewer.token, org.siteIds[0])),
      '79-megapixel PNG': repeat(4, async () => count(await upload(bomb))),
      '24-megapixel JPEG': repeat(1, async () => count(await upload(bigPhoto))),
    }
    let peak = baseline
    for (const end = Date.now() + ATTACK_MS; Date.now() < end; await sleep(500)) peak = Math.max(peak, rssMb(pid))
    await Promise.all(Object.values(attacks).map((a) => a.stop()))
    const { unacked } = await device.stop(30_000)
    await device.close()
    await probe.stop()

    // Memory falls back near the baseline once the attack ends.
    let after = rssMb(pid)
    const settleStarted = Date.now()
    while (after > baseline + SETTLED_ABOVE_BASELINE_MB && Date.now() - settleStarted < 60_000) {
      await sleep(1000)
      after = rssMb(pid)
    }
    const latencies = probe.samples.map((s) => s.ms)
    const stored = await storedTimes(ctx.sequelize, honest.deviceId, 'temperature')
    console.log(
      `[hostile] ${ATTACK_MS / 1000} s: ${Object.entries(attacks)
        .map(([name, a]) => `${name} ×${a.rounds} (${a.errors} failed)`)
        .join(', ')}; ` +
        `photos ${JSON.stringify(Object.fromEntries(photoStatuses))}; RSS ${baseline.toFixed(0)} → peak ${peak.toFixed(0)} → ${after.toFixed(0)} MB ` +
        `${((Date.now() - settleStarted) / 1000).toFixed(0)} s after; GET /tanks ×${latencies.length} p50 ${percentile(latencies, 50).toFixed(0)} ms, ` +
        `p99 ${percentile(latencies, 99).toFixed(0)} ms; device ${device.published.size} published, ${device.acked.size} acknowledged, ${stored.size} stored`,
    )

    expect(probe.samples.every((s) => s.status === 200)).toBe(true)
    expect(percentile(latencies, 99)).toBeLessThan(P99_LIMIT_MS)
    expect(peak).toBeLessThan(RSS_LIMIT_MB)
    expect(after).toBeLessThanOrEqual(baseline + SETTLED_ABOVE_BASELINE_MB)
    expect(unacked).toBe(0)
    expect([...device.published].filter((at) => !stored.has(at))).toEqual([])
    expect(photoStatuses.get(413)).toBeGreaterThan(0)
    expect(photoStatuses.get(201)).toBeGreaterThan(0)
    for (const attack of Object.values(attacks)) expect(attack.rounds).toBeGreaterThan(0)
  })
})
