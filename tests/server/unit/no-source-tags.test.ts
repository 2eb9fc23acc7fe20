import { describe, expect, it } from 'vitest'
import { phantomGroundTruth } from '../../../server/phantom/generate-phantom'
import { phantomPreset } from '../../../server/phantom/presets'
import { computeReadingResults } from '../../../server/services/readings-results'
import { SOURCES } from '../../../shared/measurement/sources'
import {
  checkSegmentPlan,
  computeMeasurements,
  computeUncertainty,
  INSTABILITY_CRITERIA,
} from '../../../shared/measurement'
import { DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM } from '../../../shared/measurement/implant-centring'
import { sourceWords } from '../../../shared/readings/source-words'
import { workspaceResultSections } from '../../../shared/readings/result-rows'
import { defaultSiteSettings, SITE_SETTINGS } from '../../../shared/settings/site-settings'
import type { TemplateOptions } from '../../../shared/readings/templates'
import type { ReadingTemplate } from '../../../shared/types/domain'
import type { LandmarkDocument } from '../../../shared/types/landmarks'

/**
 * The evidence tags ([V], [V-sec], [M], [D] and the mixed "[V for …; M for …]") belong to the
 * code; a clinician reads the citation or plain words (the project's rule for every screen). A
 * report's numbered references "[1]" are not tags.
 */
const TAG = /\[(?:V|M|D|V-sec)(?:\]|\s+for\b)/

/** Every string under a key named "source" anywhere in `node`. */
function sourcesIn(node: unknown, found: string[] = []): string[] {
  if (Array.isArray(node)) for (const item of node) sourcesIn(item, found)
  else if (typeof node === 'object' && node !== null) {
    for (const [key, value] of Object.entries(node)) {
      if (key === 'source' && typeof value === 'string') found.push(value)
      else sourcesIn(value, found)
    }
  }
  return found
}

/** Every string anywhere in `node`: what a screen built from it could show. */
function stringsIn(node: unknown, found: string[] = []): string[] {
  if (typeof node === 'string') found.push(node)
  else if (Array.isArray(node)) for (const item of node) stringsIn(item, found)
  else if (typeof node === 'object' && node !== null)
    for (const value of Object.values(node)) stringsIn(value, found)
  return found
}

const settings = {
  landmarkSigmaMm: 1,
  subsidenceThresholdMm: 2,
  instabilityCriterion: 'white-panjabi-1990' as const,
  implantCentringThresholdMm: DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM,
}

/** Each template read on a phantom's exact landmarks (server/phantom draws them). */
const truth = (preset: string): LandmarkDocument =>
  phantomGroundTruth(phantomPreset(preset)).landmarks
const READINGS: Array<{
  template: ReadingTemplate
  options: TemplateOptions
  document: LandmarkDocument
  paired?: LandmarkDocument
  baseline?: LandmarkDocument
}> = [
  { template: 'slip-grade', options: { segment: 'L5-S1' }, document: truth('meyerding-2') },
  { template: 'lumbar-alignment', options: {}, document: truth('hybrid-pre-op') },
  {
    template: 'construct-check',
    options: {
      construct: [
        { segment: 'L5-S1', implant: 'cage' },
        { segment: 'L4-L5', implant: 'disc-replacement' },
      ],
    },
    document: truth('hybrid-one-year'),
    baseline: truth('hybrid-post-op'),
  },
  {
    template: 'motion-pair',
    options: { segment: 'L4-L5' },
    document: truth('motion-flexion'),
    paired: truth('motion-extension'),
  },
  {
    template: 'implant-centring',
    options: { discReplacements: ['L3-L4', 'L4-L5'] },
    document: truth('hybrid-post-op-ap'),
  },
]

function resultsOf(reading: (typeof READINGS)[number]) {
  return computeReadingResults({
    template: reading.template,
    options: reading.options,
    document: reading.document,
    pairedDocument: reading.paired ?? null,
    baselines: reading.baseline ? [{ readingId: 1, document: reading.baseline }] : [],
    settings,
    imageRightSide: 'patient-left',
  })
}

describe('no evidence tag reaches a clinician', () => {
  it('turns every engine source into words: the citation alone, derived, or from memory', () => {
    for (const source of Object.values(SOURCES)) expect(sourceWords(source)).not.toMatch(TAG)
    expect(sourceWords(SOURCES.lumbarLordosis)).toBe('Polly et al. 1996, Spine 21:1530')
    expect(sourceWords(SOURCES.cageLordosis)).toMatch(/ \(derived\)$/)
    expect(sourceWords(SOURCES.whitePanjabi)).toMatch(/ \(from memory, verify\)$/)
    expect(sourceWords(SOURCES.dupuis)).toBe(
      'Dupuis et al. 1985, Spine 10:262 (thresholds from memory, verify)',
    )
  })

  it('turns every source the engine emits for each template, each criterion and each plan check into words', () => {
    const emitted = [
      ...READINGS.flatMap((reading) => sourcesIn(resultsOf(reading))),
      ...INSTABILITY_CRITERIA.map((criterion) => criterion.source),
      ...sourcesIn(checkSegmentPlan({ treatment: 'disc replacement' })),
    ]
    // The walk finds tagged sources (so the check below is not of an empty list).
    expect(emitted.filter((source) => TAG.test(source)).length).toBeGreaterThan(5)
    for (const source of emitted) expect(sourceWords(source)).not.toMatch(TAG)
  })

  it('shows no tag in any row, flag or rule of the results of every template', () => {
    for (const reading of READINGS) {
      const results = resultsOf(reading)
      const paired = reading.paired
        ? {
            measurements: computeMeasurements(reading.paired),
            uncertainty: computeUncertainty(reading.paired),
          }
        : null
      const sections = workspaceResultSections({
        template: reading.template,
        options: reading.options,
        primary: { ...results, spacingSource: 'dicom-pixel-spacing' },
        paired: paired ? { ...paired, spacingSource: 'dicom-pixel-spacing' } : null,
        motion: results.motion?.segments ?? null,
        instabilityCriterion: 'dupuis-1985',
        imageRightSide: 'patient-left',
        subsidence: { results: results.subsidence, baselineReadingId: 1 },
      })
      const rows = sections.flatMap((section) => section.rows)
      expect(rows.length).toBeGreaterThan(2)
      for (const text of stringsIn(sections)) expect(text).not.toMatch(TAG)
    }
  })

  it('shows no tag in the site settings form', () => {
    expect(defaultSiteSettings().instabilityCriterion).toBe('white-panjabi-1990')
    for (const text of stringsIn(SITE_SETTINGS)) expect(text).not.toMatch(TAG)
  })
})
