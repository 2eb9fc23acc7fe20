import type { ImageView, VisitKind } from './domain'

/**
 * A film a new round may include: a lateral film of one of the study's patients
 * (`GET /api/studies/:id/round-film-candidates`). `visitSequence` counts the patient's visits in
 * time order from 1, so films can be told apart without a date.
 */
export interface RoundFilmCandidate {
  imageId: number
  studyCode: string
  visitKind: VisitKind
  visitSequence: number
  view: ImageView
}
