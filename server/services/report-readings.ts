import type { Db } from '../db/knex'
import type { ImageRow } from '../db/images'
import type { PatientRecord } from '../db/patients'
import { findUserById } from '../db/users'
import type { VisitRecord } from '../db/visits'
import {
  DEFAULT_SIGMA_PX,
  computeMeasurements,
  computeUncertainty,
} from '../../shared/measurement/index'
import { readingOverlayShapes } from '../../shared/overlays/reading-overlays'
import { SPACING_SOURCE_LABELS, workspaceResultSections } from '../../shared/readings/result-rows'
import { TEMPLATE_LABELS } from '../../shared/readings/templates'
import { unsignedStamp } from '../../shared/reports/cautions'
import { reportFilmCrop } from '../../shared/reports/film-crop'
import { planCheckTable, resultTables } from '../../shared/reports/report-tables'
import { IMAGE_VIEW_WORDS, dateText, visitText } from '../../shared/reports/visit-text'
import type { Visit } from '../../shared/types/api'
import { MOTION_SEGMENTS } from '../../shared/types/domain'
import type { PixelPoint } from '../../shared/types/landmarks'
import type {
  MeasurementResult,
  SegmentName,
  UncertaintyResult,
} from '../../shared/types/measurement'
import type { PatientPlan } from '../../shared/types/plans'
import type { Reading, ReadingCalibration } from '../../shared/types/readings'
import type { ReportFilm, ReportReading } from '../../shared/types/reports'
import { toImageRecord } from './image-dto'
import { toDeidentifiedVisit, toIdentifiedVisit } from './visits'

const STATUS_WORDS: Record<string, string> = {
  draft: 'Draft',
  submitted: 'Submitted, awaiting sign-off',
  signed: 'Signed',
}

/** "3 Dec 2026, 14:05 UTC": report times are written in UTC so they read the same everywhere. */
export function dateTimeText(iso: string): string {
  return `${dateText(iso)}, ${iso.slice(11, 16)} UTC`
}

/** A visit as the actor may see it (dates for clinical roles only). */
export function visitFor(
  identified: boolean,
  visit: VisitRecord,
  patient: PatientRecord,
  visits: readonly VisitRecord[],
): Visit {
  return identified
    ? toIdentifiedVisit(visit, patient)
    : toDeidentifiedVisit(visit, patient, visits.findIndex((v) => v.id === visit.id) + 1)
}

/** The segments a reading speaks about: its own segment, its construct, or all five. */
export function readingSegments(reading: Reading): SegmentName[] {
  if (reading.template === 'construct-check')
    return (reading.options.construct ?? []).map((item) => item.segment)
  if (reading.template === 'implant-centring') return [...(reading.options.discReplacements ?? [])]
  if (reading.template === 'lumbar-alignment') return [...MOTION_SEGMENTS]
  return [reading.options.segment ?? 'L5-S1']
}

function calibrationWords(calibration: ReadingCalibration | null): string {
  const mm = calibration?.mmPerPixel
  const spacing = mm ? `${mm[1].toFixed(4)} mm/px` : 'no mm scale: angles and percentages only'
  return `Scale: ${spacing} · ${SPACING_SOURCE_LABELS[calibration?.source ?? 'none']}`
}

export interface ReportReadingInput {
  reading: Reading
  image: ImageRow
  pairedImage: ImageRow | null
  visit: Visit
  plan: PatientPlan
  identified: boolean
  sigmaMm: number
}

interface FilmPart {
  image: ImageRow
  points: Record<string, PixelPoint>
  measurements: MeasurementResult
  uncertainty: UncertaintyResult | null
  calibration: ReadingCalibration | null
  label: string
}

function reportFilm(
  part: FilmPart,
  reading: Reading,
  visit: Visit,
  identified: boolean,
): ReportFilm {
  const shapes = readingOverlayShapes(reading.template, part.points, part.measurements, {
    imageRightSide: reading.results.centring?.imageRightSide,
  })
  return {
    imageId: part.image.id,
    imageUrl: toImageRecord(part.image, identified).urls.preview,
    widthPx: part.image.width,
    heightPx: part.image.height,
    caption: `${part.label}${visitText(visit)} · ${IMAGE_VIEW_WORDS[part.image.view]}`,
    calibration: calibrationWords(part.calibration),
    shapes,
    points: part.points,
    crop: reportFilmCrop(shapes, part.points, part.image.width, part.image.height),
  }
}

/**
 * One reading as report content: its film or films with their overlays, the results tables (the
 * same rows as the workspace's results), the plan and its checks at the reading's segments, and
 * the rater and sign-off. Names the signer from the users table.
 */
export async function reportReading(db: Db, input: ReportReadingInput): Promise<ReportReading> {
  const { reading, identified } = input
  const primary: FilmPart = {
    image: input.image,
    points: reading.landmarks.points,
    measurements: reading.results.measurements,
    uncertainty: reading.results.uncertainty,
    calibration: reading.calibration,
    label: reading.template === 'motion-pair' ? 'Flexion · ' : '',
  }
  let paired: FilmPart | null = null
  if (input.pairedImage && reading.pairedLandmarks) {
    paired = {
      image: input.pairedImage,
      points: reading.pairedLandmarks.points,
      measurements: computeMeasurements(reading.pairedLandmarks),
      uncertainty: computeUncertainty(reading.pairedLandmarks, {
        sigmaMm: input.sigmaMm,
        sigmaPx: DEFAULT_SIGMA_PX,
      }),
      calibration: reading.pairedCalibration,
      label: 'Extension · ',
    }
  }
  const sections = workspaceResultSections({
    template: reading.template,
    options: reading.options,
    primary: {
      measurements: primary.measurements,
      uncertainty: primary.uncertainty,
      spacingSource: reading.calibration.source,
    },
    paired: paired
      ? {
          measurements: paired.measurements,
          uncertainty: paired.uncertainty,
          spacingSource: reading.pairedCalibration?.source ?? 'none',
        }
      : null,
    motion: reading.results.motion?.segments ?? null,
    instabilityCriterion: reading.results.computedWith?.instabilityCriterion,
    imageRightSide: reading.results.centring?.imageRightSide,
    centringThresholdMm: reading.results.centring?.thresholdMm,
    subsidence: {
      results: reading.results.subsidence,
      baselineReadingId: reading.results.subsidenceBaselineReadingId,
    },
  })
  const plan = planCheckTable(
    input.plan,
    readingSegments(reading),
    reading.template === 'lumbar-alignment',
  )
  const signer = reading.signedBy !== null ? await findUserById(db, reading.signedBy) : undefined
  const segment = reading.options.segment ? ` ${reading.options.segment}` : ''
  const construct = (
    reading.options.construct?.map((item) => item.segment) ?? reading.options.discReplacements
  )?.join(', ')
  return {
    readingId: reading.id,
    title: `${TEMPLATE_LABELS[reading.template]}${segment}${construct ? ` ${construct}` : ''} · reading ${reading.id}`,
    films: [primary, ...(paired ? [paired] : [])].map((part) =>
      reportFilm(part, reading, input.visit, identified),
    ),
    tables: [...resultTables(sections), ...(plan ? [plan] : [])],
    signOff: {
      rater: reading.raterName,
      status: STATUS_WORDS[reading.status] ?? reading.status,
      submittedAt: identified && reading.submittedAt ? dateTimeText(reading.submittedAt) : null,
      signer: signer?.displayName ?? null,
      signedAt: identified && reading.signedAt ? dateTimeText(reading.signedAt) : null,
    },
    stamp: unsignedStamp(reading.status),
  }
}
