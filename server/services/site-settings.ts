import type { Db } from '../db/knex'
import { readSiteSettings, saveSiteSetting } from '../db/site-settings'
import { HttpError } from '../errors'
import {
  resolveSiteSettings,
  SITE_SETTINGS,
  SITE_SETTING_KEYS,
  type SiteSettingKey,
  type SiteSettings,
  type SiteSettingsUpdate,
  type SiteSettingValues,
} from '../../shared/settings/site-settings'
import { audit, type Actor } from './audit'

/** The values in force: what the site saved over the defaults. */
export async function loadSiteSettings(db: Db): Promise<SiteSettingValues> {
  return resolveSiteSettings((await readSiteSettings(db)).values)
}

export async function getSiteSettings(db: Db): Promise<SiteSettings> {
  const stored = await readSiteSettings(db)
  return {
    values: resolveSiteSettings(stored.values),
    version: stored.version,
    updatedAt: stored.updatedAt?.toISOString() ?? null,
    updatedByName: stored.updatedByName,
  }
}

/** A 409 that carries the settings as they now stand. */
export class SettingsConflictError extends HttpError {
  constructor(readonly current: SiteSettings) {
    super(
      409,
      'conflict',
      'The settings were changed by someone else since you opened them. Nothing was saved: look at the current values and save again.',
      { version: [`version: current version is ${current.version}`] },
    )
  }
}

function describe(key: SiteSettingKey, value: unknown): string {
  const spec = SITE_SETTINGS[key]
  return spec.kind === 'number' ? `${value} ${spec.unit}` : String(value)
}

/** Saves the changed values, audited one by one; refused (409) when based on older settings. */
export async function updateSiteSettings(
  db: Db,
  actor: Actor,
  update: SiteSettingsUpdate,
): Promise<SiteSettings> {
  const outcome = await db.transaction(async (trx) => {
    const stored = await readSiteSettings(trx, true)
    if (stored.version !== update.version) return 'stale' as const
    const before = resolveSiteSettings(stored.values)
    const changes: string[] = []
    for (const key of SITE_SETTING_KEYS) {
      const value = update.values[key]
      if (value === undefined || value === before[key]) continue
      await saveSiteSetting(trx, key, value, actor.user.id, key in stored.values)
      changes.push(`${key} ${describe(key, before[key])} → ${describe(key, value)}`)
    }
    if (changes.length > 0)
      await audit(trx, actor, 'update', 'site-settings', null, `Changed ${changes.join('; ')}`)
    return 'saved' as const
  })
  const current = await getSiteSettings(db)
  if (outcome === 'stale') throw new SettingsConflictError(current)
  return current
}
