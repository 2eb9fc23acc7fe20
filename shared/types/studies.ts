/** Studies: named research cohorts, their patients and their researcher members. */

/** A study as every list shows it. Counts cover the study's patients only. */
export interface StudySummary {
  id: number
  name: string
  /** One line on what the cohort is for. */
  description: string | null
  /** Working note for the study team (never about an individual patient). */
  note: string | null
  patientCount: number
  /** Films filed on the study patients' visits (for researchers, those they are served). */
  filmCount: number
  /**
   * Films held back from researchers until a clinician confirms their pixels show no identity
   * (their DICOM header does not say NO burned-in annotation).
   */
  heldBackFilmCount: number
  /** Readings of those films outside re-reading rounds. */
  readingCount: number
  memberCount: number
  version: number
  createdAt: string
  updatedAt: string
}

/** A researcher who belongs to a study. */
export interface StudyMember {
  id: number
  displayName: string
  email: string
  active: boolean
}

/** One study with its members and the ids of its patients (their details are a paged list). */
export interface Study extends StudySummary {
  members: StudyMember[]
  patientIds: number[]
}

export interface StudyInput {
  name: string
  description?: string | null
  note?: string | null
}

export type StudyPatch = Partial<StudyInput> & { version: number }

/** Replaces the study's patients with exactly these. */
export interface StudyPatientsInput {
  patientIds: number[]
  version: number
}

/** Replaces the study's researcher members with exactly these. */
export interface StudyMembersInput {
  userIds: number[]
  version: number
}

export interface StudyQuery {
  q?: string
  offset?: number
  limit?: number
}

/** Paging and an optional search of the study's own patients. */
export interface StudyPatientQuery {
  q?: string
  offset?: number
  limit?: number
}
