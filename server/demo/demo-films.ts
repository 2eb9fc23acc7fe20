/**
 * Which synthetic phantom film goes on which demo visit. Films are rendered by the project's own
 * phantom generator with the demo patient's invented header data, so every demo film has an
 * exact ground truth.
 */
export interface DemoFilm {
  patientKey: string
  /** Index of the visit in the demo patient's visit list. */
  visitIndex: number
  preset: string
  seed: number
}

export const DEMO_FILMS: DemoFilm[] = [
  { patientKey: 'grade-1', visitIndex: 0, preset: 'meyerding-1', seed: 11 },
  { patientKey: 'grade-2', visitIndex: 0, preset: 'meyerding-2', seed: 12 },
  { patientKey: 'grade-3', visitIndex: 0, preset: 'meyerding-3', seed: 13 },
  { patientKey: 'grade-4', visitIndex: 0, preset: 'meyerding-4', seed: 14 },
  { patientKey: 'grade-5', visitIndex: 0, preset: 'meyerding-5', seed: 15 },
  { patientKey: 'retrolisthesis', visitIndex: 0, preset: 'retrolisthesis-l2-l3', seed: 16 },
  { patientKey: 'hybrid', visitIndex: 0, preset: 'hybrid-pre-op', seed: 21 },
  { patientKey: 'hybrid', visitIndex: 1, preset: 'hybrid-post-op', seed: 22 },
  { patientKey: 'hybrid', visitIndex: 2, preset: 'hybrid-one-year', seed: 23 },
  { patientKey: 'dynamic', visitIndex: 0, preset: 'motion-flexion', seed: 31 },
  { patientKey: 'dynamic', visitIndex: 0, preset: 'motion-extension', seed: 32 },
  { patientKey: 'normal-1', visitIndex: 0, preset: 'normal', seed: 41 },
]
