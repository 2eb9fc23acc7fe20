import { describe, expect, it } from 'vitest'
import {
  defaultSiteSettings,
  plainCitation,
  resolveSiteSettings,
  SITE_SETTINGS,
  siteSettingProblem,
} from '../../../shared/settings/site-settings'
import { DEFAULT_SIGMA_MM, INSTABILITY_CRITERIA } from '../../../shared/measurement'

describe('site settings', () => {
  it("defaults to the engine's own values", () => {
    expect(defaultSiteSettings()).toEqual({
      landmarkSigmaMm: DEFAULT_SIGMA_MM,
      subsidenceThresholdMm: 2,
      instabilityCriterion: 'white-panjabi-1990',
      // measurement-reference §11: 3 mm (McAfee et al. 2005, Spine 30:1576, from memory).
      implantCentringThresholdMm: 3,
      invitationLifetimeHours: 72,
    })
  })

  it('names the published source of the off-centre threshold in plain words', () => {
    const source = SITE_SETTINGS.implantCentringThresholdMm.source
    expect(source).toContain('McAfee et al. 2005, Spine 30:1576')
    expect(source).toContain('(from memory, verify)')
    expect(source).not.toMatch(/\[(V|M|D|V-sec)\]/)
  })

  it('offers every instability criterion the engine knows, each with its source in plain words', () => {
    const choices = SITE_SETTINGS.instabilityCriterion.choices
    expect(choices.map((choice) => choice.value)).toEqual(INSTABILITY_CRITERIA.map((c) => c.id))
    for (const choice of choices) {
      expect(choice.source.length).toBeGreaterThan(10)
      expect(choice.source).not.toMatch(/\[(V|M|D|V-sec)\]/)
    }
  })

  it('checks each value against its bounds, saying which', () => {
    expect(siteSettingProblem('landmarkSigmaMm', 1.5)).toBeNull()
    expect(siteSettingProblem('landmarkSigmaMm', 0)).toBe('must be between 0.1 and 5 mm')
    expect(siteSettingProblem('landmarkSigmaMm', Number.NaN)).toBe('must be a number of mm')
    expect(siteSettingProblem('invitationLifetimeHours', 2.5)).toBe('must be a whole number of h')
    expect(siteSettingProblem('instabilityCriterion', 'dupuis-1985')).toBeNull()
    expect(siteSettingProblem('instabilityCriterion', 'other')).toMatch(/^must be one of /)
  })

  it('takes stored values over the defaults, and falls back where a stored value is not allowed', () => {
    expect(
      resolveSiteSettings({ landmarkSigmaMm: 2, subsidenceThresholdMm: 99, obsolete: true }),
    ).toEqual({ ...defaultSiteSettings(), landmarkSigmaMm: 2 })
  })

  it('turns evidence tags into words', () => {
    expect(plainCitation('Smith 2001 [M]; Jones 2002 [V]; angle [D]')).toBe(
      'Smith 2001 (from memory, verify); Jones 2002; angle (derived)',
    )
  })
})
