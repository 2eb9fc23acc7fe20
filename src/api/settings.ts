import type { SiteSettings, SiteSettingsUpdate } from '@shared/settings/site-settings'
import { http } from './http'

export const getSiteSettings = () => http.get<SiteSettings>('/settings')
/** A stale `version` answers 409: someone else saved since. */
export const saveSiteSettings = (update: SiteSettingsUpdate) =>
  http.put<SiteSettings>('/settings', update)
