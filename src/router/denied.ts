import { shallowRef } from 'vue'
import type { Role } from '@shared/schemas/auth'
import { ROLE_LABELS } from '@/components/labels'

/**
 * Why the page shown is not the one asked for: set when the role check sends someone elsewhere,
 * shown on the page they land on, and gone with their next navigation.
 */
export const deniedNotice = shallowRef<string | null>(null)
let pending: string | null = null

/** "Users is open to owners only. As a viewer you cannot see it, so here is the tanks list." */
export function denyWithNotice(title: string | undefined, roles: readonly Role[], role: Role | null) {
  const who = roles.map((r) => `${ROLE_LABELS[r].toLowerCase()}s`).join(' and ')
  const page = title ?? 'That page'
  const mine = role ? `As ${role === 'owner' ? 'an' : 'a'} ${ROLE_LABELS[role].toLowerCase()} you cannot open it` : 'You cannot open it'
  pending = `${page} is open to ${who} only. ${mine}, so here is the tanks list. Ask an owner if you need it.`
}

/** Called after every navigation: a denial's notice shows once, on the page it led to. */
export function settleNotice() {
  deniedNotice.value = pending
  pending = null
}
