import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref } from 'vue'
import type { Invitation, InviteInput, PublicUser, UserChanges } from '@shared/schemas/auth'
import * as usersApi from '@/api/users'

export const useUsersStore = defineStore('users', () => {
  const users = ref<PublicUser[]>([])
  const invitations = ref<Invitation[]>([])
  const loading = ref(false)

  // An answer that arrives after a sign-out belongs to the last person: it is dropped.
  let request = 0
  async function load() {
    const call = ++request
    loading.value = true
    try {
      const [userList, invitationList] = await Promise.all([usersApi.listUsers(), usersApi.listInvitations()])
      if (call !== request) return
      users.value = userList
      invitations.value = invitationList
    } finally {
      if (call === request) loading.value = false
    }
  }

  async function update(id: number, changes: UserChanges) {
    const user = await usersApi.updateUser(id, changes)
    const index = users.value.findIndex((u) => u.id === id)
    if (index !== -1) users.value.splice(index, 1, user)
    return user
  }

  /** Returns the absolute link to hand to the invited person. */
  async function invite(input: InviteInput) {
    const created = await usersApi.createInvitation(input)
    invitations.value = [created.invitation, ...invitations.value]
    return new URL(created.link, window.location.origin).toString()
  }

  async function revoke(id: number) {
    await usersApi.revokeInvitation(id)
    invitations.value = invitations.value.filter((invitation) => invitation.id !== id)
  }

  function $reset() {
    request++
    users.value = []
    invitations.value = []
    loading.value = false
  }

  return { users, invitations, loading, load, update, invite, revoke, $reset }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useUsersStore, import.meta.hot))
