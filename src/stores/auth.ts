import { acceptHMRUpdate, defineStore } from 'pinia'
import { computed, ref, watch } from 'vue'
import type { ClockStyle, Organization, PublicUser, SessionInfo } from '@shared/schemas/auth'
import { setClockStyle } from '@shared/time'
import * as authApi from '@/api/auth'
import { provideToken, storeToken, storedToken } from '@/api/session'
import { provideOfflineOwner } from '@/offline/db'
import { forgetSavedReads } from '@/offline/saved-reads'

export const useAuthStore = defineStore('auth', () => {
  const token = ref<string | null>(storedToken())
  const expiresAt = ref<string | null>(null)
  const user = ref<PublicUser | null>(null)
  const organization = ref<Organization | null>(null)
  let restoring: Promise<void> | null = null

  provideToken(() => token.value)
  provideOfflineOwner(() => user.value?.id ?? null)
  // Every time on every screen follows the organisation's clock; signed out, the 24-hour default.
  watch(organization, (org) => setClockStyle(org?.clockStyle ?? '24h'), { immediate: true, flush: 'sync' })

  const role = computed(() => user.value?.role ?? null)
  const isSignedIn = computed(() => token.value != null && user.value != null)
  const isOwner = computed(() => role.value === 'owner')
  const canEdit = computed(() => role.value === 'owner' || role.value === 'keeper')
  /** A client's person: sees exactly the client's tanks and visit reports. */
  const clientId = computed(() => user.value?.clientId ?? null)

  function applySession(session: SessionInfo) {
    token.value = session.token
    expiresAt.value = session.expiresAt
    user.value = session.user
    organization.value = session.organization
    storeToken(session.token)
  }

  function clearSession() {
    token.value = null
    expiresAt.value = null
    user.value = null
    organization.value = null
    restoring = null
    storeToken(null)
  }

  async function signIn(email: string, password: string) {
    applySession(await authApi.signIn({ email, password }))
  }

  async function acceptInvitation(inviteToken: string, password: string, name?: string) {
    applySession(await authApi.acceptInvitation({ token: inviteToken, password, name }))
  }

  async function signOut() {
    // Entries still waiting stay for this person's next sign-in; what they looked at goes now.
    if (user.value) void forgetSavedReads(user.value.id).catch(() => undefined)
    try {
      if (token.value) await authApi.signOut()
    } catch {
      // The session ends locally whatever the server says; a dead token is harmless.
    } finally {
      clearSession()
    }
  }

  /** Loads the user behind a remembered token, once; a stale token is dropped. */
  function restore(): Promise<void> {
    if (!token.value || user.value) return Promise.resolve()
    restoring ??= authApi
      .fetchMe()
      .then((me) => {
        user.value = me.user
        organization.value = me.organization
      })
      .catch(() => clearSession())
      .finally(() => {
        restoring = null
      })
    return restoring
  }

  async function setOrganizationClock(clockStyle: ClockStyle) {
    organization.value = await authApi.updateOrganization({ clockStyle })
  }

  async function changePassword(currentPassword: string, newPassword: string) {
    await authApi.changePassword({ currentPassword, newPassword })
  }

  return {
    token,
    expiresAt,
    user,
    organization,
    role,
    isSignedIn,
    isOwner,
    canEdit,
    clientId,
    signIn,
    signOut,
    acceptInvitation,
    applySession,
    restore,
    clearSession,
    setOrganizationClock,
    changePassword,
    // Signing out resets every store (stores/session-reset.ts); for this one that is the session itself.
    $reset: clearSession,
  }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useAuthStore, import.meta.hot))
