// Signs in as an owner and makes sure every non-empty tank has a "Simulated node" with a fresh token.
import type { MetricKey } from '@shared/metrics'
import type { Page } from '@shared/schemas/common'
import type { PublicSite } from '@shared/schemas/sites'
import type { PublicTank } from '@shared/schemas/tanks'
import { ApiError, withRetry, type ApiClient } from './api-client'
import { hasSaltProbe } from './model/salinity'
import type { SimTankSpec } from './model/spec'

export const SIMULATED_NODE_NAME = 'Simulated node'
export const SIMULATED_METRICS: MetricKey[] = ['temperature', 'ph', 'light', 'water_level']
/** A marine or brackish tank's node also has a conductivity probe that reports salinity. */
export const SALT_PROBE_METRICS: MetricKey[] = ['conductivity', 'salinity']
const metricsFor = (kind: PublicTank['kind']): MetricKey[] => (hasSaltProbe(kind) ? [...SIMULATED_METRICS, ...SALT_PROBE_METRICS] : SIMULATED_METRICS)

/** The fields of the API's PublicDevice the simulator reads. */
interface DeviceSummary {
  id: number
  tankId: number
  name: string
  revokedAt: string | null
}
interface DeviceWithToken {
  device: DeviceSummary
  token: string
}

export interface ProvisionedTank {
  tankId: number
  deviceId: number
  token: string
  spec: SimTankSpec
}

export interface ProvisionOptions {
  email: string
  password: string
  intervalSeconds: number
  /** Use only the first N tanks that are not empty. */
  tankLimit?: number
  log?: (line: string) => void
}

export async function signIn(api: ApiClient, email: string, password: string, log?: (line: string) => void) {
  const session = await withRetry('signing in', () => api.request<{ token: string }>('POST', '/api/v1/auth/sign-in', { body: { email, password } }), { log })
  return session.token
}

function specOf(tank: PublicTank, sites: Map<number, PublicSite>): SimTankSpec {
  return {
    name: tank.name,
    kind: tank.kind,
    dimensions: tank.dimensions,
    volumeLitres: tank.volumeLitres,
    heater: tank.heater,
    lightSchedule: tank.lightSchedule,
    timeZone: sites.get(tank.siteId)?.timeZone ?? 'UTC',
  }
}

async function deviceFor(api: ApiClient, token: string, tank: PublicTank, intervalSeconds: number) {
  const devices = await api.request<DeviceSummary[]>('GET', `/api/v1/devices?tankId=${tank.id}`, { token })
  const existing = devices.find((d) => d.name === SIMULATED_NODE_NAME && !d.revokedAt)
  if (existing) {
    return api.request<DeviceWithToken>('POST', `/api/v1/devices/${existing.id}/rotate`, { token })
  }
  return api.request<DeviceWithToken>('POST', '/api/v1/devices', {
    token,
    body: { tankId: tank.id, name: SIMULATED_NODE_NAME, metrics: metricsFor(tank.kind), intervalSeconds },
  })
}

async function midBuild(api: ApiClient, token: string, tankId: number): Promise<boolean> {
  try {
    const build = await api.request<{ filledOn: string | null; finishedAt: string | null }>('GET', `/api/v1/tanks/${tankId}/build`, { token })
    return Boolean(build.filledOn && !build.finishedAt)
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) return false
    throw error
  }
}

export async function provisionDevices(api: ApiClient, options: ProvisionOptions): Promise<ProvisionedTank[]> {
  const token = await signIn(api, options.email, options.password, options.log)
  const sites = await api.request<PublicSite[]>('GET', '/api/v1/sites', { token })
  const siteById = new Map(sites.map((s) => [s.id, s]))
  const page = await api.request<Page<PublicTank>>('GET', '/api/v1/tanks?pageSize=200', { token })
  const tanks = page.items.filter((t) => t.stage !== 'empty').slice(0, options.tankLimit ?? Infinity)
  const provisioned: ProvisionedTank[] = []
  for (const tank of tanks) {
    // A tank mid-build is followed by its keeper's tests; its sensors go on once it is established.
    if (await midBuild(api, token, tank.id)) continue
    const { device, token: deviceToken } = await withRetry(`device for '${tank.name}'`, () => deviceFor(api, token, tank, options.intervalSeconds), {
      log: options.log,
    })
    provisioned.push({ tankId: tank.id, deviceId: device.id, token: deviceToken, spec: specOf(tank, siteById) })
  }
  return provisioned
}
