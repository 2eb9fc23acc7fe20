import type { CompareCandidateVisit, SuggestedPair } from '../types/compare'
import { STATIC_LATERAL_VIEWS } from './comparison-kind'

/** The film of a visit that stands for it across visits: its neutral lateral, else a long one. */
function staticFilmOf(visit: CompareCandidateVisit): number | null {
  for (const view of STATIC_LATERAL_VIEWS) {
    const film = visit.films.find((candidate) => candidate.view === view)
    if (film) return film.imageId
  }
  return null
}

/**
 * The pairs a spine team usually compares (common practice), from a patient's visits in time
 * order: the last pre-op film against the first post-op film and against the latest follow-up;
 * the first post-op film against the latest follow-up; the last two follow-ups; and each visit's
 * flexion against its extension film. Across visits the neutral lateral film stands for its
 * visit (a long standing lateral when there is none). After surgery, the frontal (AP) films are
 * paired too, for the disc replacements' centring: the first post-op AP against the latest
 * follow-up AP, and the last two follow-up APs. No pair is offered twice.
 */
export function suggestComparePairs(visits: readonly CompareCandidateVisit[]): SuggestedPair[] {
  const withFilm = visits
    .map((visit) => ({ visit, imageId: staticFilmOf(visit) }))
    .filter(
      (entry): entry is { visit: CompareCandidateVisit; imageId: number } => entry.imageId !== null,
    )
  const ofKind = (kind: CompareCandidateVisit['visitKind']) =>
    withFilm.filter((entry) => entry.visit.visitKind === kind)
  const lastPreOp = ofKind('pre-op').at(-1)
  const firstPostOp = ofKind('post-op')[0]
  const followUps = ofKind('follow-up')
  const latestFollowUp = followUps.at(-1)
  const pairs: SuggestedPair[] = []
  const seen = new Set<string>()
  const offer = (
    kind: SuggestedPair['kind'],
    label: string,
    before: { imageId: number } | undefined,
    after: { imageId: number } | undefined,
  ) => {
    if (!before || !after || before.imageId === after.imageId) return
    const key = `${before.imageId}:${after.imageId}`
    if (seen.has(key)) return
    seen.add(key)
    pairs.push({ kind, label, beforeImageId: before.imageId, afterImageId: after.imageId })
  }
  offer('pre-op-post-op', 'Pre-op against post-op', lastPreOp, firstPostOp)
  offer('pre-op-post-op', 'Pre-op against latest follow-up', lastPreOp, latestFollowUp)
  offer('follow-ups', 'Post-op against latest follow-up', firstPostOp, latestFollowUp)
  if (followUps.length >= 2)
    offer('follow-ups', 'Last two follow-ups', followUps.at(-2), latestFollowUp)
  const frontal = visits
    .filter((visit) => visit.visitKind !== 'pre-op')
    .map((visit) => ({ visit, film: visit.films.find((film) => film.view === 'ap') }))
    .filter((entry) => entry.film !== undefined)
  const firstPostOpAp = frontal.find((entry) => entry.visit.visitKind === 'post-op')?.film
  const followUpAps = frontal.filter((entry) => entry.visit.visitKind === 'follow-up')
  offer(
    'follow-ups',
    'Post-op AP against latest follow-up AP',
    firstPostOpAp,
    followUpAps.at(-1)?.film,
  )
  if (followUpAps.length >= 2)
    offer(
      'follow-ups',
      'Last two follow-up APs',
      followUpAps.at(-2)?.film,
      followUpAps.at(-1)?.film,
    )
  for (const visit of visits) {
    const flexion = visit.films.find((film) => film.view === 'lateral-flexion')
    const extension = visit.films.find((film) => film.view === 'lateral-extension')
    offer('flexion-extension', 'Flexion against extension', flexion, extension)
  }
  return pairs
}
