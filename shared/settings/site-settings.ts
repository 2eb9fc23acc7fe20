/**
 * Site settings: one typed list with each setting's default, bounds and label. The server
 * validates and stores them; the client builds the settings form and the live results from the
 * same list. A new setting is one more entry here (its key is what the site_settings table stores).
 */
import { DEFAULT_SIGMA_MM } from '../measurement/uncertainty'
import { DEFAULT_SUBSIDENCE_THRESHOLD_MM } from '../measurement/subsidence'
import { INSTABILITY_CRITERIA } from '../measurement/motion-pair'
import { DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM } from '../measurement/implant-centring'
import type { InstabilityCriterionId } from '../types/measurement'

export interface NumberSettingSpec {
  kind: 'number'
  label: string
  /** One line on what the setting changes. */
  help: string
  unit: string
  min: number
  max: number
  step: number
  integer: boolean
  default: number
  /** Where the default comes from, in plain words, when it is a published value. */
  source?: string
}

export interface ChoiceSettingSpec<T extends string = string> {
  kind: 'choice'
  label: string
  help: string
  choices: ReadonlyArray<{ value: T; label: string; source: string }>
  default: T
}

export type SiteSettingSpec = NumberSettingSpec | ChoiceSettingSpec

/** Plain words for the evidence tags of the engine's citations: a reader sees no code letters. */
export function plainCitation(source: string): string {
  return source
    .replace(/\s*\[V for the paper; M for the thresholds\]/g, ' (thresholds from memory, verify)')
    .replace(/\s*\[V-sec\]/g, ' (through a secondary source)')
    .replace(/\s*\[M\]/g, ' (from memory, verify)')
    .replace(/\s*\[D\]/g, ' (derived)')
    .replace(/\s*\[V\]/g, '')
}

const CRITERION_LABELS: Record<InstabilityCriterionId, string> = {
  'white-panjabi-1990':
    'White & Panjabi: translation > 4.5 mm or > 15 %, or rotation > 15° (L1-L4), 20° (L4-L5), 25° (L5-S1)',
  'dupuis-1985': 'Dupuis: translation > 4 mm or rotation > 10°',
  'ide-translation-5mm': 'Disc replacement trial exclusion: translation > 5 mm',
}

export const SITE_SETTINGS = {
  landmarkSigmaMm: {
    kind: 'number',
    label: 'Landmark placement uncertainty (σ)',
    help: 'Standard deviation of each landmark coordinate on a calibrated film; sets every ± interval and the chance of the neighbouring grade.',
    unit: 'mm',
    min: 0.1,
    max: 5,
    step: 0.1,
    integer: false,
    default: DEFAULT_SIGMA_MM,
  },
  subsidenceThresholdMm: {
    kind: 'number',
    label: 'Subsidence threshold',
    help: 'Loss of disc height since the first post-op reading from which a construct check flags subsidence.',
    unit: 'mm',
    min: 0.5,
    max: 10,
    step: 0.5,
    integer: false,
    default: DEFAULT_SUBSIDENCE_THRESHOLD_MM,
  },
  instabilityCriterion: {
    kind: 'choice',
    label: 'Instability criterion on flexion and extension films',
    help: 'The published criterion a motion pair is judged by first; the others are still shown beside it.',
    choices: INSTABILITY_CRITERIA.map((criterion) => ({
      value: criterion.id,
      label: CRITERION_LABELS[criterion.id],
      source: plainCitation(criterion.source),
    })),
    default: 'white-panjabi-1990',
  } satisfies ChoiceSettingSpec<InstabilityCriterionId>,
  implantCentringThresholdMm: {
    kind: 'number',
    label: 'Disc replacement off-centre threshold (frontal film)',
    help: "Lateral offset of a disc replacement from the body midline above which the frontal film's centring check flags it.",
    unit: 'mm',
    min: 0.5,
    max: 10,
    step: 0.5,
    integer: false,
    default: DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM,
    // The reference's default (measurement-reference §11), a value cited from memory there.
    source: plainCitation(
      'McAfee et al. 2005, Spine 30:1576: ideal placement within 3 mm of the midline [M]',
    ),
  },
  invitationLifetimeHours: {
    kind: 'number',
    label: 'Invitation lifetime',
    help: 'How long the link in an invitation mail can be used to set a password.',
    unit: 'h',
    min: 1,
    max: 720,
    step: 1,
    integer: true,
    default: 72,
  },
} as const satisfies Record<string, SiteSettingSpec>

export type SiteSettingKey = keyof typeof SITE_SETTINGS

export const SITE_SETTING_KEYS = Object.keys(SITE_SETTINGS) as SiteSettingKey[]

type ValueOf<S> = S extends { kind: 'number' }
  ? number
  : S extends ChoiceSettingSpec<infer T>
    ? T
    : never

/** The value of every setting. */
export type SiteSettingValues = { [K in SiteSettingKey]: ValueOf<(typeof SITE_SETTINGS)[K]> }

export function defaultSiteSettings(): SiteSettingValues {
  const values: Record<string, unknown> = {}
  for (const key of SITE_SETTING_KEYS) values[key] = SITE_SETTINGS[key].default
  return values as SiteSettingValues
}

/** Null when `value` is allowed for the setting; otherwise what is wrong, naming the bounds. */
export function siteSettingProblem(key: SiteSettingKey, value: unknown): string | null {
  const spec: SiteSettingSpec = SITE_SETTINGS[key]
  if (spec.kind === 'number') {
    if (typeof value !== 'number' || !Number.isFinite(value))
      return `must be a number of ${spec.unit}`
    if (spec.integer && !Number.isInteger(value)) return `must be a whole number of ${spec.unit}`
    if (value < spec.min || value > spec.max)
      return `must be between ${spec.min} and ${spec.max} ${spec.unit}`
    return null
  }
  const allowed = spec.choices.map((choice) => choice.value)
  return typeof value === 'string' && allowed.includes(value)
    ? null
    : `must be one of ${allowed.join(', ')}`
}

/** Stored values over the defaults; a stored value that is no longer allowed falls back. */
export function resolveSiteSettings(stored: Record<string, unknown>): SiteSettingValues {
  const values = defaultSiteSettings() as Record<string, unknown>
  for (const key of SITE_SETTING_KEYS) {
    if (key in stored && siteSettingProblem(key, stored[key]) === null) values[key] = stored[key]
  }
  return values as SiteSettingValues
}

/** What GET /api/settings answers. */
export interface SiteSettings {
  values: SiteSettingValues
  /** Grows with every saved change; a PUT based on an older one answers 409. */
  version: number
  updatedAt: string | null
  updatedByName: string | null
}

export interface SiteSettingsUpdate {
  values: Partial<SiteSettingValues>
  version: number
}
