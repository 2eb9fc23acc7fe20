import type { MotionSegment, Role, Sex, VisitKind } from './domain'

/** The one error body every API failure answers with. */
export interface ApiErrorBody {
  error: { code: string; message: string; details?: Record<string, string[]> }
}

export interface Page<T> {
  items: T[]
  total: number
}

export interface SessionUser {
  id: number
  email: string
  displayName: string
  role: Role
}

/** The sign-in as the browser sees it: when it began, when it must end, when idleness ends it. */
export interface SessionInfo {
  signedInAt: string
  /** Absolute end (sign-in plus the longest-session setting); no renewal goes past it. */
  endsAt: string
  idleSignOutMinutes: number
}

/** GET /api/auth/me: a signed-out visitor gets nulls (200), not an error. */
export type MeAnswer = { user: SessionUser; session: SessionInfo } | { user: null; session: null }

export interface LoginInput {
  email: string
  password: string
}

/** A patient as clinicians see it. */
export interface IdentifiedPatient {
  kind: 'identified'
  id: number
  recordNumber: string
  familyName: string
  givenName: string
  birthDate: string
  sex: Sex
  studyCode: string
  osteoporosis: boolean
  notes: string | null
  /** The surgeon who signs this patient's readings; null sends submissions to every surgeon. */
  responsibleSurgeonId: number | null
  responsibleSurgeonName: string | null
  visitCount: number
  lastVisitDate: string | null
  version: number
  createdAt: string
  updatedAt: string
}

/** A patient as researchers see it: a pseudonym and ages only. */
export interface DeidentifiedPatient {
  kind: 'deidentified'
  id: number
  studyCode: string
  sex: Sex
  /** 90 stands for 90 or older (ages above 89 are grouped). */
  ageAtFirstVisitYears: number | null
  visitCount: number
}

export type Patient = IdentifiedPatient | DeidentifiedPatient

export interface PatientInput {
  recordNumber: string
  familyName: string
  givenName: string
  birthDate: string
  sex: Sex
  osteoporosis?: boolean
  notes?: string | null
  responsibleSurgeonId?: number | null
}

export type PatientPatch = Partial<PatientInput> & { version: number }

export const PATIENT_SORT_FIELDS = [
  'familyName',
  'recordNumber',
  'birthDate',
  'studyCode',
  'updatedAt',
] as const
export type PatientSortField = (typeof PATIENT_SORT_FIELDS)[number]

export interface PatientQuery {
  q?: string
  sort?: PatientSortField
  order?: 'asc' | 'desc'
  offset?: number
  limit?: number
}

export interface IdentifiedVisit {
  kind: 'identified'
  id: number
  patientId: number
  visitDate: string
  visitKind: VisitKind
  monthsSinceSurgery: number | null
  indication: string | null
  ageAtVisitYears: number
  version: number
  createdAt: string
}

export interface DeidentifiedVisit {
  kind: 'deidentified'
  id: number
  patientId: number
  /** 1 for the first visit of the patient, in time order. */
  sequence: number
  visitKind: VisitKind
  monthsSinceSurgery: number | null
  /** 90 stands for 90 or older (ages above 89 are grouped). */
  ageAtVisitYears: number
  /**
   * On the patient's visit list only: films of the visit held back until a clinician confirms
   * they show no identity in the pixels (left out of the visit's film list).
   */
  heldBackFilmCount?: number
}

export type Visit = IdentifiedVisit | DeidentifiedVisit

export interface VisitInput {
  visitDate: string
  visitKind: VisitKind
  monthsSinceSurgery?: number | null
  indication?: string | null
}

export type VisitPatch = Partial<VisitInput> & { version: number }

/** What the public health probe says: up or not, and nothing that fingerprints the build. */
export interface HealthStatus {
  status: 'ok' | 'degraded'
  database: 'up' | 'down'
}

/** The health probe's details for a signed-in administrator. */
export interface HealthDetails extends HealthStatus {
  migrations: { applied: number; pending: number } | null
  version: string
}

export type { MotionSegment }

export interface UserSummary {
  id: number
  email: string
  displayName: string
  role: Role
  active: boolean
  lastLoginAt: string | null
  createdAt: string
}

export interface AuditEvent {
  id: number
  at: string
  userId: number | null
  userName: string | null
  action: string
  entity: string
  entityId: string | null
  summary: string
}

/** Whether the audit trail's hash chain still holds, and where it first breaks. */
export interface AuditChainStatus {
  intact: boolean
  /** Events that checked out, oldest first, before the break (all of them when intact). */
  checked: number
  firstBreak: {
    id: number
    reason: 'content-changed' | 'link-broken' | 'event-missing' | 'head-mismatch' | 'not-chained'
  } | null
}

/** A film as the API returns it. Identifying DICOM attributes are left out for researchers. */
export interface ImageRecord {
  id: number
  visitId: number
  view: import('./domain').ImageView
  fileKind: 'dicom' | 'png' | 'jpeg' | 'tiff'
  width: number
  height: number
  bitsStored: number
  /** Millimetres per pixel as [row, column], or null when the film has no usable spacing. */
  mmPerPixel: [row: number, column: number] | null
  spacingSource: import('./domain').SpacingSource
  spacingNote: string | null
  manualCalibration: ManualCalibration | null
  window: { center: number; width: number } | null
  acquiredAt: string | null
  dicom: DicomSummary | null
  /** SHA-256 of the original file; null for researchers (it would link back to the source file). */
  contentHash: string | null
  sizeBytes: number
  version: number
  /** The account that uploaded the film (it may delete and recalibrate it); null for researchers. */
  uploadedBy: number | null
  /** Null for researchers: upload times betray visit dates. */
  createdAt: string | null
  urls: { display: string; preview: string; thumbnail: string; fullDepth: string }
  /** Whether the pixels may show identity, and a clinician's review of them. */
  pixelReview: import('./pixel-review').PixelReview
}

export interface DicomSummary {
  modality: string | null
  transferSyntax: string
  photometricInterpretation: string | null
  bitsAllocated: number | null
  bitsStored: number | null
  studyDate: string | null
  acquisitionDate: string | null
  /**
   * Patient Orientation (0020,0020) as [row direction, column direction], e.g. ["L", "F"]: on
   * a frontal film the first says which patient side the image's right edge shows. Null when
   * the file has none.
   */
  patientOrientation: [row: string, column: string] | null
  /** Only for roles that may see identified data. */
  patient?: { name: string | null; id: string | null; birthDate: string | null; sex: string | null }
}

export interface ManualCalibration {
  line: [[number, number], [number, number]]
  lengthMm: number
  lengthPx: number
  /** Null for researchers, like every other timestamp. */
  calibratedAt: string | null
  calibratedBy: number | null
}

export interface CalibrationInput {
  line: [[number, number], [number, number]]
  lengthMm?: number
  version: number
}

/** A DICOM header that does not match the visit's patient: the upload waits for confirmation. */
export interface PatientMismatch {
  file: string
  differences: Array<{
    field: 'name' | 'id' | 'birthDate' | 'studyDate'
    inFile: string
    onRecord: string
  }>
}
