import { z } from 'zod'
import {
  SITE_SETTING_KEYS,
  siteSettingProblem,
  type SiteSettingsUpdate,
} from '../../shared/settings/site-settings'

/** Each setting checked against its own bounds from the shared list. */
const values = z.strictObject(
  Object.fromEntries(
    SITE_SETTING_KEYS.map((key) => [
      key,
      z
        .unknown()
        .superRefine((value, ctx) => {
          const problem = siteSettingProblem(key, value)
          if (problem) ctx.addIssue({ code: 'custom', message: problem })
        })
        .optional(),
    ]),
  ),
  {
    error: (issue) =>
      issue.code === 'invalid_type' ? 'must be an object of setting → value' : undefined,
  },
)

export const siteSettingsUpdateBody = z
  .strictObject({
    values,
    version: z
      .number({ error: 'must be the settings version you last read' })
      .int()
      .min(0, 'must be the settings version you last read'),
  })
  .transform((body) => body as SiteSettingsUpdate)
