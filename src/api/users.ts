import { http } from './http'

/** Active surgeons, from whom a patient's responsible surgeon is chosen. */
export const listSurgeons = () =>
  http.get<Array<{ id: number; displayName: string }>>('/users/surgeons')
