import { ref } from 'vue'
import { defineStore } from 'pinia'
import type { AuditChainStatus, AuditEvent, UserSummary } from '@shared/types/api'
import type { Invitation, InvitationInput, UserPatch } from '@shared/types/accounts'
import type { CaughtMail, UndeliveredMail } from '@shared/types/mail'
import {
  createInvitation,
  listAuditEvents,
  checkAuditChain,
  listCaughtMail,
  listInvitations,
  listUndeliveredMail,
  listUsers,
  patchUser,
  resendMail,
  revokeInvitation,
} from '@/api/administration'
import { ApiError } from '@/api/http'

const messageOf = (caught: unknown) => (caught instanceof Error ? caught.message : String(caught))

export const useAdministrationStore = defineStore('administration', () => {
  const users = ref<UserSummary[]>([])
  const invitations = ref<Invitation[]>([])
  const undelivered = ref<UndeliveredMail[]>([])
  const undeliveredTotal = ref(0)
  const caughtMail = ref<CaughtMail[]>([])
  const caughtTotal = ref(0)
  /** False when the server runs without the local mail catcher (GET /api/mail is 404). */
  const mailCatcherOn = ref(true)
  const auditEvents = ref<AuditEvent[]>([])
  const auditChain = ref<AuditChainStatus | null>(null)
  const checkingChain = ref(false)
  const auditTotal = ref(0)
  const loading = ref(false)
  const error = ref<string | null>(null)

  async function guarded(work: () => Promise<void>): Promise<void> {
    try {
      await work()
    } catch (caught) {
      error.value = messageOf(caught)
    }
  }

  const loadUsers = () =>
    guarded(async () => {
      users.value = await listUsers()
    })

  const loadInvitations = () =>
    guarded(async () => {
      invitations.value = await listInvitations()
    })

  const loadUndelivered = () =>
    guarded(async () => {
      const page = await listUndeliveredMail()
      undelivered.value = page.items
      undeliveredTotal.value = page.total
    })

  async function loadCaughtMail(): Promise<void> {
    try {
      const page = await listCaughtMail(0, 100)
      caughtMail.value = page.items
      caughtTotal.value = page.total
      mailCatcherOn.value = true
    } catch (caught) {
      if (caught instanceof ApiError && caught.status === 404) mailCatcherOn.value = false
      else error.value = messageOf(caught)
    }
  }

  async function loadAudit(offset: number, limit: number): Promise<void> {
    loading.value = true
    await guarded(async () => {
      const page = await listAuditEvents(offset, limit)
      auditEvents.value = page.items
      auditTotal.value = page.total
    })
    loading.value = false
  }

  async function verifyAuditChain(): Promise<void> {
    checkingChain.value = true
    await guarded(async () => {
      auditChain.value = await checkAuditChain()
    })
    checkingChain.value = false
  }

  /** Throws the server's refusal (e.g. the last administrator) for the caller to show. */
  async function updateUser(id: number, patch: UserPatch): Promise<void> {
    const updated = await patchUser(id, patch)
    users.value = users.value.map((user) => (user.id === id ? updated : user))
  }

  async function invite(input: InvitationInput): Promise<Invitation> {
    const created = await createInvitation(input)
    await loadInvitations()
    return created
  }

  async function withdraw(id: number): Promise<void> {
    await revokeInvitation(id)
    invitations.value = invitations.value.filter((invitation) => invitation.id !== id)
  }

  async function sendAgain(id: number): Promise<void> {
    await resendMail(id)
    await loadUndelivered()
  }

  return {
    users,
    invitations,
    undelivered,
    undeliveredTotal,
    caughtMail,
    caughtTotal,
    mailCatcherOn,
    auditEvents,
    auditTotal,
    auditChain,
    checkingChain,
    verifyAuditChain,
    loading,
    error,
    loadUsers,
    loadInvitations,
    loadUndelivered,
    loadCaughtMail,
    loadAudit,
    updateUser,
    invite,
    withdraw,
    sendAgain,
  }
})
