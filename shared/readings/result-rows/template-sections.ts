import type { ReadingTemplate } from '../../types/domain'
import type {
  FrontalImageRightSide,
  InstabilityCriterionId,
  MotionSegmentResult,
  SegmentName,
  SubsidenceResult,
} from '../../types/measurement'
import type { TemplateOptions } from '../templates'
import { sourceWords } from '../source-words'
import { alignmentSection } from './alignment'
import { centringSection, frontalSidesSection } from './frontal-centring'
import { motionSection } from './motion'
import { segmentSection } from './segment'
import { segmentsSummary } from './segments-summary'
import { subsidenceSection } from './subsidence'
import type { FilmResults, ResultSection } from './types'

export interface WorkspaceResultsInput {
  template: ReadingTemplate
  options: TemplateOptions
  primary: FilmResults
  paired: FilmResults | null
  motion: Partial<Record<SegmentName, MotionSegmentResult>> | null
  /** The instability criterion of the site settings, shown first on a motion pair. */
  instabilityCriterion?: InstabilityCriterionId
  /** Implant centring: which patient side the image's right edge shows (default unknown). */
  imageRightSide?: FrontalImageRightSide
  /** Implant centring: the site's off-centre threshold (mm; default the published 3 mm). */
  centringThresholdMm?: number
  /** Construct check: the server's subsidence results of the last saved draft. */
  subsidence?: {
    results: Record<string, SubsidenceResult> | null
    baselineReadingId: number | null
  }
}

/**
 * The sections the results panel (and a report) shows for a template, in reading order, every
 * source already in words: no screen or report can show an evidence tag by forgetting to.
 */
export function workspaceResultSections(input: WorkspaceResultsInput): ResultSection[] {
  return templateSections(input).map((section) => ({
    ...section,
    rows: section.rows.map((row) => ({ ...row, source: sourceWords(row.source) })),
    flags: section.flags.map((flag) =>
      flag.source === undefined ? flag : { ...flag, source: sourceWords(flag.source) },
    ),
  }))
}

function templateSections(input: WorkspaceResultsInput): ResultSection[] {
  const segment = input.options.segment ?? 'L5-S1'
  switch (input.template) {
    case 'slip-grade':
      return [segmentSection(segment, input.primary)]
    case 'lumbar-alignment':
      return [alignmentSection(input.primary), segmentsSummary(input.primary)]
    case 'construct-check':
      return [
        ...(input.options.construct ?? []).map(({ segment: treated, implant }) =>
          segmentSection(
            treated,
            input.primary,
            `${treated} · ${implant === 'cage' ? 'interbody cage' : 'disc replacement'}`,
            { implant },
          ),
        ),
        subsidenceSection(
          input.subsidence?.results ?? {},
          input.subsidence?.baselineReadingId ?? null,
        ),
      ]
    case 'motion-pair':
      return [
        motionSection(
          segment,
          input.motion?.[segment],
          input.primary.spacingSource,
          input.instabilityCriterion,
        ),
        segmentSection(segment, input.primary, `Flexion film ${segment}`, { discs: false }),
        ...(input.paired
          ? [segmentSection(segment, input.paired, `Extension film ${segment}`, { discs: false })]
          : []),
      ]
    case 'implant-centring':
      return [
        ...(input.options.discReplacements ?? []).map((treated) =>
          centringSection(
            treated,
            input.primary,
            input.imageRightSide ?? 'unknown',
            input.centringThresholdMm,
          ),
        ),
        frontalSidesSection(input.imageRightSide ?? 'unknown'),
      ]
  }
}
