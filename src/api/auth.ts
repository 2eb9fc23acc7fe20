import type { LoginInput, MeAnswer, SessionUser } from '@shared/types/api'
import { http } from './http'

export const signIn = (input: LoginInput) => http.post<SessionUser>('/auth/login', input)
export const signOut = () => http.post<void>('/auth/logout')
export const getCurrentSession = () => http.get<MeAnswer>('/auth/me')
