import { computed, ref } from 'vue'
import { defineStore } from 'pinia'
import {
  defaultSiteSettings,
  type SiteSettings,
  type SiteSettingValues,
} from '@shared/settings/site-settings'
import { getSiteSettings, saveSiteSettings } from '@/api/settings'

/** The site settings: the live results compute with the same values as the server. */
export const useSettingsStore = defineStore('settings', () => {
  const settings = ref<SiteSettings | null>(null)
  const error = ref<string | null>(null)
  /** The defaults until the server has answered. */
  const values = computed<SiteSettingValues>(() => settings.value?.values ?? defaultSiteSettings())
  let pending: Promise<void> | null = null

  /** Loads once per page; `fresh` asks again (the settings screen). */
  function load(fresh = false): Promise<void> {
    if (settings.value && !fresh) return Promise.resolve()
    pending ??= getSiteSettings()
      .then((loaded) => {
        settings.value = loaded
        error.value = null
      })
      .catch((caught: unknown) => {
        error.value = caught instanceof Error ? caught.message : String(caught)
      })
      .finally(() => {
        pending = null
      })
    return pending
  }

  /** Saves changed values from the version last read; a 409 is thrown after reloading. */
  async function save(changes: Partial<SiteSettingValues>): Promise<void> {
    try {
      settings.value = await saveSiteSettings({
        values: changes,
        version: settings.value?.version ?? 0,
      })
    } catch (caught) {
      await load(true)
      throw caught
    }
  }

  return { settings, values, error, load, save }
})
