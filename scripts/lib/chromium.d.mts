export const CHROMIUM_FLAGS: string[]
export function ensureChromium(): string | null
export function ensureMosquittoClients(): boolean
export function ensureMosquittoBroker(): string | null
