import { computed, ref } from 'vue'
import { defineStore } from 'pinia'
import type { LoginInput, SessionInfo, SessionUser } from '@shared/types/api'
import { mayManageFilm, roleCan, type Permission } from '@shared/types/permissions'
import { getCurrentSession, signIn, signOut } from '@/api/auth'
import { ApiError } from '@/api/http'

export const useSessionStore = defineStore('session', () => {
  const user = ref<SessionUser | null>(null)
  /** When the sign-in ends and how long idleness may last; null while signed out. */
  const session = ref<SessionInfo | null>(null)
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

  /** Asks the server who is signed in; a signed-out visitor is answered 200 with no user. */
  async function refresh(): Promise<void> {
    try {
      const answer = await getCurrentSession()
      user.value = answer.user
      session.value = answer.session
    } catch (error) {
      // A cookie that no longer checks out (expired, signed out elsewhere) answers 401.
      if (!(error instanceof ApiError) || error.status !== 401) throw error
      forget()
    }
  }

  async function restore(): Promise<void> {
    if (checked.value) return
    try {
      await refresh()
    } finally {
      checked.value = true
    }
  }

  async function login(input: LoginInput): Promise<SessionUser> {
    const signedIn = await signIn(input)
    user.value = signedIn
    checked.value = true
    await refresh()
    return signedIn
  }

  /** A sign-in that happened elsewhere (accepting an invitation signs the new account in). */
  async function adopt(signedIn: SessionUser): Promise<void> {
    user.value = signedIn
    checked.value = true
    await refresh()
  }

  async function logout(): Promise<void> {
    try {
      await signOut()
    } finally {
      forget()
    }
  }

  /** Called when any request finds the session expired. */
  function forget(): void {
    user.value = null
    session.value = null
  }

  return {
    user,
    session,
    checked,
    isSignedIn,
    can,
    canManageFilm,
    refresh,
    restore,
    login,
    adopt,
    logout,
    forget,
  }
})
