/** Enumerations shared by the database, the API and the client. */

export const ROLES = ['admin', 'surgeon', 'fellow', 'researcher'] as const
export type Role = (typeof ROLES)[number]

export const SEXES = ['female', 'male', 'other', 'unknown'] as const
export type Sex = (typeof SEXES)[number]

export const VISIT_KINDS = ['pre-op', 'post-op', 'follow-up'] as const
export type VisitKind = (typeof VISIT_KINDS)[number]

/** Motion segments of the lumbar spine, cranial to caudal. */
export const MOTION_SEGMENTS = ['L1-L2', 'L2-L3', 'L3-L4', 'L4-L5', 'L5-S1'] as const
export type MotionSegment = (typeof MOTION_SEGMENTS)[number]

export const PLANNED_TREATMENTS = [
  'none',
  'decompression',
  'disc-replacement',
  'interbody-fusion',
  'posterior-fusion',
] as const
export type PlannedTreatment = (typeof PLANNED_TREATMENTS)[number]

export const IMAGE_VIEWS = [
  'lateral-neutral',
  'lateral-flexion',
  'lateral-extension',
  'lateral-standing-long',
  'ap',
] as const
export type ImageView = (typeof IMAGE_VIEWS)[number]

export const SPACING_SOURCES = [
  'dicom-pixel-spacing',
  'manual',
  'dicom-imager-spacing-magnification',
  'dicom-imager-spacing',
  'none',
] as const
export type SpacingSource = (typeof SPACING_SOURCES)[number]

export const READING_TEMPLATES = [
  'slip-grade',
  'lumbar-alignment',
  'construct-check',
  'motion-pair',
  'implant-centring',
] as const
export type ReadingTemplate = (typeof READING_TEMPLATES)[number]

export const READING_STATUSES = ['draft', 'submitted', 'signed'] as const
export type ReadingStatus = (typeof READING_STATUSES)[number]
