export interface Screen {
  route: string
  path: string | undefined
  signedIn?: boolean
  stub?: Record<string, unknown>
}
export function screensOf(records: {
  tank?: { id: number }
  site?: { id: number; timeZone: string }
  incident?: object & { id: number }
  client?: { id: number }
  visit?: { id: number }
}): Screen[]
export function routeNamesIn(source: string): string[]
