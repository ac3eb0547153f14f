import { z } from 'zod'
import { emailSchema } from './auth'

export const CLIENT_KINDS = ['person', 'company'] as const
export type ClientKind = (typeof CLIENT_KINDS)[number]

export const clientInputSchema = z.object({
  kind: z.enum(CLIENT_KINDS),
  name: z.string().trim().min(1, 'required').max(160),
  contactName: z.string().trim().max(160).default(''),
  email: z.union([z.literal(''), emailSchema]).default(''),
  phone: z.string().trim().max(60).default(''),
  address: z.string().trim().max(300).default(''),
  notes: z.string().trim().max(4000).default(''),
})
export type ClientInput = z.infer<typeof clientInputSchema>
/** The body as a client sends it, before the defaults are filled in. */
export type ClientBody = z.input<typeof clientInputSchema>
export const clientUpdateSchema = clientInputSchema.partial()

export const clientListQuerySchema = z.object({
  includeArchived: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
})

export interface PublicClient {
  id: number
  kind: ClientKind
  name: string
  contactName: string
  email: string
  phone: string
  address: string
  notes: string
  archivedAt: string | null
  tankCount: number
  /** The sites where the client's tanks stand. */
  sites: Array<{ id: number; name: string }>
  createdAt: string
}

/** A client's page: the client, their tanks and the people who sign in for them. */
export interface ClientDetail extends PublicClient {
  tanks: Array<{ id: number; name: string; siteId: number; siteName: string; archived: boolean }>
  people: Array<{ id: number; name: string; email: string; active: boolean }>
}
