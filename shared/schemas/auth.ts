import { z } from 'zod'

export const ROLES = ['owner', 'keeper', 'viewer'] as const
export type Role = (typeof ROLES)[number]
export const roleSchema = z.enum(ROLES)

export const emailSchema = z.string().trim().toLowerCase().email('not an e-mail address').max(254)
export const passwordSchema = z.string().min(10, 'at least 10 characters').max(200)

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'required').max(200),
})
export type SignInInput = z.infer<typeof signInSchema>

export const changePasswordSchema = z.object({
  currentPassword: z.string().min(1, 'required').max(200),
  newPassword: passwordSchema,
})

export const inviteSchema = z.object({
  email: emailSchema,
  name: z.string().trim().min(1, 'required').max(120),
  role: roleSchema,
  /** For viewers: the sites they may see; empty or absent means every site. */
  siteIds: z.array(z.number().int().positive()).max(500).optional(),
  /** For a client's person: a viewer of exactly that client's tanks (then no sites). */
  clientId: z.number().int().positive().nullable().optional(),
})
export type InviteInput = z.infer<typeof inviteSchema>

export const acceptInviteSchema = z.object({
  token: z.string().min(20).max(200),
  password: passwordSchema,
  name: z.string().trim().min(1).max(120).optional(),
})

export const updateUserSchema = z
  .object({
    role: roleSchema.optional(),
    active: z.boolean().optional(),
    name: z.string().trim().min(1).max(120).optional(),
    siteIds: z.array(z.number().int().positive()).max(500).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, 'nothing to change')
export type UserChanges = z.input<typeof updateUserSchema>

export interface PublicUser {
  id: number
  email: string
  name: string
  role: Role
  active: boolean
  siteIds: number[]
  /** A client's person: sees exactly that client's tanks. */
  clientId: number | null
  organizationId: number
  createdAt: string
}

export interface SessionInfo {
  token: string
  expiresAt: string
  user: PublicUser
  organization: Organization
}

export const passwordResetRequestSchema = z.object({ email: emailSchema })
export const passwordResetConfirmSchema = z.object({ token: z.string().min(20).max(200), password: passwordSchema })

/** How clock times read on the organisation's screens: "14:05" or "2:05 pm". */
export const CLOCK_STYLES = ['24h', '12h'] as const
export type ClockStyle = (typeof CLOCK_STYLES)[number]

export interface Organization {
  id: number
  name: string
  clockStyle: ClockStyle
}

export const organizationSettingsSchema = z.object({ clockStyle: z.enum(CLOCK_STYLES) })
export type OrganizationSettingsBody = z.input<typeof organizationSettingsSchema>

export interface Me {
  user: PublicUser
  organization: Organization
}

export interface InvitationPreview {
  email: string
  name: string
  role: Role
  organizationName: string
  expiresAt: string
}

export interface Invitation {
  id: number
  email: string
  name: string
  role: Role
  siteIds: number[]
  clientId: number | null
  expiresAt: string
  createdAt: string
}

export interface CreatedInvitation {
  invitation: Invitation
  /** Relative, e.g. `/accept-invite?token=…`; the client makes it absolute for copying. */
  link: string
}
