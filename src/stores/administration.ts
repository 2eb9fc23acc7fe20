import { ref } from 'vue'
import { defineStore } from 'pinia'
import type { AuditEvent, UserSummary } from '@shared/types/api'
import { listAuditEvents, listUsers } from '@/api/administration'

export const useAdministrationStore = defineStore('administration', () => {
  const users = ref<UserSummary[]>([])
  const auditEvents = ref<AuditEvent[]>([])
  const auditTotal = ref(0)
  const loading = ref(false)
  const error = ref<string | null>(null)

  async function loadUsers(): Promise<void> {
    try {
      users.value = await listUsers()
    } catch (caught) {
      error.value = caught instanceof Error ? caught.message : String(caught)
    }
  }

  async function loadAudit(offset: number, limit: number): Promise<void> {
    loading.value = true
    try {
      const page = await listAuditEvents(offset, limit)
      auditEvents.value = page.items
      auditTotal.value = page.total
    } catch (caught) {
      error.value = caught instanceof Error ? caught.message : String(caught)
    } finally {
      loading.value = false
    }
  }

  return { users, auditEvents, auditTotal, loading, error, loadUsers, loadAudit }
})
