// The livestock batches API: moves between tanks, losses, where the animals went, stock counts.
import { z } from 'zod'
import type { QuarantineStatus } from '../care/livestock'
import type { MoveWarning } from '../livestock/move-check'
import { idSchema } from './common'

/** A row id as PostgreSQL's integer holds it: larger ones are refused here, not by the database. */
const rowId = z.number().int().positive().max(2_147_483_647, 'no such id')
const queryId = idSchema.max(2_147_483_647, 'no such id')
import { instantSchema } from './time'

export const BATCH_EVENT_KINDS = ['arrived', 'moved', 'lost', 'sold', 'to_client', 'removed'] as const
export type BatchEventKind = (typeof BATCH_EVENT_KINDS)[number]

export const batchMoveSchema = z.object({
  toTankId: rowId,
  /** Absent: the whole batch moves. */
  count: z.number().int().min(1, 'at least one').max(100000).optional(),
  at: instantSchema.optional(),
  confirm: z.boolean().default(false),
})
export type BatchMove = z.infer<typeof batchMoveSchema>
export type BatchMoveBody = z.input<typeof batchMoveSchema>

export const batchLossSchema = z.object({
  count: z.number().int().min(1, 'at least one').max(100000),
  cause: z.string().trim().min(1, 'say what happened, or "unknown"').max(200),
  at: instantSchema.optional(),
})
export type BatchLoss = z.infer<typeof batchLossSchema>
export type BatchLossBody = z.input<typeof batchLossSchema>

export const BATCH_OUTCOMES = ['sold', 'to_client'] as const
export const batchOutSchema = z
  .object({
    outcome: z.enum(BATCH_OUTCOMES),
    /** Absent: every animal still in the batch. */
    count: z.number().int().min(1, 'at least one').max(100000).optional(),
    /** A buyer, or the client and tank the animals went to; free text. */
    destination: z.string().trim().max(200).default(''),
    at: instantSchema.optional(),
  })
  .refine((o) => o.outcome !== 'to_client' || o.destination.length > 0, { message: "name the client's tank", path: ['destination'] })
export type BatchOut = z.infer<typeof batchOutSchema>
export type BatchOutBody = z.input<typeof batchOutSchema>

export const batchListQuerySchema = z.object({
  siteId: queryId.optional(),
  tankId: queryId.optional(),
  /** `all` includes batches that have left (sold, gone, lost). */
  status: z.enum(['current', 'all']).default('current'),
})
export type BatchListQuery = z.infer<typeof batchListQuerySchema>

export const STOCK_GROUPS = ['tank', 'site', 'species'] as const
export const stockQuerySchema = z.object({
  siteId: queryId.optional(),
  by: z.enum(STOCK_GROUPS).default('tank'),
})
export type StockQuery = z.infer<typeof stockQuerySchema>

type Named = { id: number; name: string }

export interface PublicBatch {
  id: number
  parentId: number | null
  name: string
  speciesKey: string | null
  category: 'fish' | 'invertebrate' | 'plant'
  tank: Named & { stage: string }
  site: Named & { timeZone: string }
  /** Where the animals came from (free text) and when. */
  supplier: string
  arrivedAt: string
  /** Animals this batch started with, lost, and that left it alive; alive is what is in the tank now. */
  count: number
  losses: number
  movedOut: number
  alive: number
  closedAt: string | null
  /** Whole days since arrival (day 0 is the arrival day). */
  daysSinceArrival: number
  /** Quarantine counted from the batch's arrival, while it is in a quarantine tank. */
  quarantine: QuarantineStatus | null
}

export interface PublicBatchEvent {
  id: number
  batchId: number
  kind: BatchEventKind
  at: string
  count: number
  fromTank: Named | null
  toTank: Named | null
  cause: string
  destination: string
  by: Named | null
}

export interface BatchDetail extends PublicBatch {
  /** Every step since arrival, the batch it was split from included, oldest first. */
  history: PublicBatchEvent[]
  /** Every tank the animals lived in, in order. */
  tanks: Named[]
}

export interface BatchMoveResult {
  /** The batch now in the target tank: the same one, or the part split off. */
  moved: PublicBatch
  /** The batch the animals left. */
  from: PublicBatch
  warnings: MoveWarning[]
}

export interface StockRow {
  key: string
  label: string
  site: Named | null
  tank: Named | null
  speciesKey: string | null
  batches: number
  alive: number
}
