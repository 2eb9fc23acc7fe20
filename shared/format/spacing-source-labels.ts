import type { SpacingSource } from '../types/domain'

/**
 * Where a film's mm scale comes from, in words a reader can weigh: the one set of labels for
 * the workspace, the films, plans, trends, Compare and the reports.
 */
export const SPACING_SOURCE_LABELS: Record<SpacingSource, string> = {
  'dicom-pixel-spacing': 'DICOM pixel spacing, calibrated in the patient',
  manual: 'manual calibration',
  'dicom-imager-spacing-magnification': 'imager spacing ÷ magnification (estimated)',
  'dicom-imager-spacing': 'imager spacing at the detector (magnified, typically 10–25 %)',
  none: 'no calibration',
}

/** The same, short enough to sit under each mm value or on a film's chip. */
export const SPACING_SOURCE_SHORT: Record<SpacingSource, string> = {
  'dicom-pixel-spacing': 'DICOM spacing (in patient)',
  manual: 'manual calibration',
  'dicom-imager-spacing-magnification': 'estimated spacing',
  'dicom-imager-spacing': 'detector spacing, magnified',
  none: 'uncalibrated',
}
