import { computed, ref } from 'vue'
import { defineStore } from 'pinia'
import type { LoginInput, SessionUser } from '@shared/types/api'
import { mayManageFilm, roleCan, type Permission } from '@shared/types/permissions'
import { getCurrentUser, signIn, signOut } from '@/api/auth'
import { ApiError } from '@/api/http'

export const useSessionStore = defineStore('session', () => {
  const user = ref<SessionUser | null>(null)
  /** True once the first /auth/me has answered, so guards know whether "no user" is final. */
  const checked = ref(false)

  const isSignedIn = computed(() => user.value !== null)
  function can(permission: Permission): boolean {
    return user.value !== null && roleCan(user.value.role, permission)
  }

  /** Delete or recalibrate: the film's uploader or a surgeon (the server checks it too). */
  function canManageFilm(film: { uploadedBy: number | null }): boolean {
    return user.value !== null && mayManageFilm(user.value, film)
  }

  async function restore(): Promise<void> {
    if (checked.value) return
    try {
      user.value = await getCurrentUser()
    } catch (error) {
      if (!(error instanceof ApiError) || error.status !== 401) throw error
      user.value = null
    } finally {
      checked.value = true
    }
  }

  async function login(input: LoginInput): Promise<SessionUser> {
    user.value = await signIn(input)
    checked.value = true
    return user.value
  }

  /** A sign-in that happened elsewhere (accepting an invitation signs the new account in). */
  function adopt(signedIn: SessionUser): void {
    user.value = signedIn
    checked.value = true
  }

  async function logout(): Promise<void> {
    try {
      await signOut()
    } finally {
      user.value = null
    }
  }

  /** Called when any request finds the session expired. */
  function forget(): void {
    user.value = null
  }

  return { user, checked, isSignedIn, can, canManageFilm, restore, login, adopt, logout, forget }
})
