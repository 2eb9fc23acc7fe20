import { describe, expect, it } from 'vitest'
import { readingRows } from '../../../../server/exports/export-rows'
import {
  exportColumns,
  type Cell,
  type ExportReading,
  type ExportRowContext,
} from '../../../../server/exports/export-columns'
import { escapeSpreadsheetText } from '../../../../server/exports/formula-escape'
import { phantomGroundTruth } from '../../../../server/phantom/generate-phantom'
import {
  computeMeasurements,
  computeMotionPair,
  computeSubsidence,
} from '../../../../shared/measurement/index'
import type { LandmarkDocument } from '../../../../shared/types/landmarks'
import { MOTION_SEGMENTS } from '../../../../shared/types/domain'

/** Every column computed for every row, the plain way: what an export held before rows shared cells. */
function everyCellComputed(reading: ExportReading, segment: ExportRowContext['segment']): Cell[] {
  return exportColumns(true).map((column) => {
    const value = column.value({ reading, segment })
    return typeof value === 'string' ? escapeSpreadsheetText(value) : value
  })
}

// Phantom films with known, different values per segment (the project's synthetic ground truth),
// so a column that reads the segment but were computed once per reading would show.
const flexion = phantomGroundTruth({
  segments: { 'L4-L5': { segmentalAngleDeg: 6, slipPercent: 18 } },
}).landmarks as LandmarkDocument
const extension = phantomGroundTruth({
  segments: { 'L4-L5': { segmentalAngleDeg: 17, slipPercent: 9 } },
}).landmarks as LandmarkDocument

function reading(results: ExportReading['results']): ExportReading {
  return {
    readingId: 7,
    imageId: 3,
    template: 'motion-pair',
    status: 'submitted',
    engineVersion: 'test',
    calibration: { mmPerPixel: [0.139, 0.139], source: 'dicom-pixel-spacing' },
    results,
    raterId: 2,
    raterName: '=Rater',
    visitKind: 'follow-up',
    visitDate: '2026-05-04',
    studyCode: 'EP-T0001',
    sex: 'female',
    birthDate: '1961-02-03',
    recordNumber: '+REC-1',
    familyName: 'Invented',
    givenName: 'Person',
    firstPostOpDate: '2026-01-12',
  }
}

describe('rows of one reading', () => {
  it('equal every column computed for every row, segment columns included', () => {
    const measurements = computeMeasurements(flexion)
    const subsidence = computeSubsidence(flexion, extension)
    const withEverything = reading({
      measurements,
      motion: computeMotionPair(flexion, extension),
      subsidence: {
        'L4-L5': {
          thresholdMm: subsidence.thresholdMm,
          source: subsidence.source,
          segments: { 'L4-L5': subsidence.segments['L4-L5']! },
          baselineReadingId: 1,
        },
      },
    })
    // Rows go cranial to caudal, as the engine lists the segments it measured.
    const segments = MOTION_SEGMENTS.filter((segment) => measurements.segments[segment])
    expect(segments.length).toBeGreaterThan(1)
    const rows = readingRows(exportColumns(true), withEverything)
    expect(rows).toHaveLength(segments.length)
    rows.forEach((row, index) => {
      expect(row).toEqual(everyCellComputed(withEverything, segments[index]!))
    })
  })

  it('is one row without a segment for a reading that measured none', () => {
    const none = reading({
      measurements: { ...computeMeasurements(flexion), segments: {} },
      motion: null,
      subsidence: null,
    })
    expect(readingRows(exportColumns(false), none)).toEqual([
      exportColumns(false).map((column) => {
        const value = column.value({ reading: none, segment: null })
        return typeof value === 'string' ? escapeSpreadsheetText(value) : value
      }),
    ])
  })
})
