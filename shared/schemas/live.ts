import { z } from 'zod'
import { instantSchema } from './time'

/** The live socket at `/ws`: JSON text frames. The first client frame must be `auth`. */
export const liveClientMessageSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('auth'), token: z.string().min(10).max(4000) }),
  z.object({
    type: z.literal('subscribe'),
    tankIds: z.array(z.number().int().positive()).max(1000).optional(),
    siteId: z.number().int().positive().optional(),
    /** Catch up: readings stored after this time are sent first. */
    since: instantSchema.optional(),
  }),
  z.object({ type: z.literal('unsubscribe'), tankIds: z.array(z.number().int().positive()).max(1000) }),
  z.object({ type: z.literal('ping') }),
])
export type LiveClientMessage = z.infer<typeof liveClientMessageSchema>

export type LiveReading = { tankId: number; metric: string; time: string; value: number; source: 'device' | 'test_kit' | 'import' }

export type LiveServerMessage =
  | { type: 'ready'; role: string }
  | { type: 'subscribed'; tankIds: number[] }
  | { type: 'readings'; readings: LiveReading[]; catchUp?: boolean }
  | { type: 'pong' }
  | { type: 'incident'; incidentId: number; tankId: number; siteId: number; state: string }
  | { type: 'error'; code: string; message: string }

/** Close codes the client acts on: 4401 sign in again, 4403 not allowed. */
export const LIVE_CLOSE = { unauthenticated: 4401, forbidden: 4403, badMessage: 4400 } as const
